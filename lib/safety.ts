/**
 * Safety wording shown in the portal and printed on every report. General cautions only: the
 * sterilizer's instructions, local codes, the standards and licensed practice come first.
 */
export const SAFETY_SHORT =
  "Sterilizers are pressure equipment working with live steam. Papin reads records; it does not replace the sterilizer's own controls, its instructions for use, local regulations or the judgement of a competent person.";

export const SAFETY_NOTES: Array<{ title: string; text: string }> = [
  {
    title: "Steam, hot surfaces and hot loads",
    text: "Live steam, hot condensate, chamber walls, doors, loads and trolleys cause burns and scalds. Wear heat-resistant gloves, long sleeves and eye or face protection when unloading or working near steam lines, drains and safety-valve discharges.",
  },
  {
    title: "Pressure equipment",
    text: "The chamber, jacket, steam generator and safety valves are pressure equipment. They need periodic thorough examination by a competent person under a written scheme of examination, as the national pressure-systems rules require. Never adjust, block or bypass a safety valve.",
  },
  {
    title: "Door interlocks",
    text: "The door must stay locked while the chamber is under pressure or vacuum and until the cycle is complete; for liquid loads, until the load has cooled to a safe temperature. Never defeat an interlock, including for testing.",
  },
  {
    title: "Hot liquids on exhaust",
    text: "Liquids at or above 100 °C can boil over or burst their containers when pressure falls or a container is moved. Use a fluids cycle with controlled cooling, and never process sealed containers not designed for it.",
  },
  {
    title: "Fitting test equipment",
    text: "Fit sensor entry glands and test gauges only with the chamber at atmospheric pressure and the steam supply isolated, under the site's permit-to-work procedure; check the glands are tight, since a leaking gland also upsets the air leakage test.",
  },
  {
    title: "What this record is and is not",
    text: "This record evaluates logged data against configured acceptance limits. It does not replace the sterilizer's own controls and indicators, its instructions for use, or release decisions made under the site's quality system. Follow local codes, the applicable standards (such as EN 285, EN 13060, ISO 17665, HTM 01-01 or ANSI/AAMI ST79) and licensed engineering practice.",
  },
];
