import Link from "next/link";
import { RecordableKind } from "@/lib/domain";

const CAUTIONS: Record<RecordableKind, string> = {
  "air-leakage":
    "Fit test gauges and sensor glands only with the chamber at atmospheric pressure and the steam supply isolated, under the site's permit-to-work procedure. A leaking gland also upsets this test: repeat it with test sensors removed.",
  "bowie-dick": "The test pack and chamber are hot after the cycle: wear heat-resistant gloves and eye protection when unloading, and open the door only once the cycle is complete.",
  "hollow-load": "The helix and chamber are hot after the cycle: wear heat-resistant gloves and eye protection when taking out the indicator strip, and open the door only once the cycle is complete.",
  "steam-non-condensable-gas": "",
  "steam-superheat": "",
  "steam-dryness": "",
};

const STEAM_SAMPLING =
  "Steam sampling works on a live steam line. Isolate and vent the line before fitting the Pitot tube or sample point, check the fittings are tight before opening the supply, and wear heat-resistant gloves, long sleeves and eye or face protection: live steam, hot condensate and hot pipework cause severe burns. Follow the permit-to-work procedure, and let a competent person do the work.";

/** The caution that belongs to each test, in general terms; local codes and licensed practice come first. */
export function SafetyCaution({ kind }: { kind: RecordableKind }) {
  const text = kind.startsWith("steam-") ? STEAM_SAMPLING : CAUTIONS[kind];
  return (
    <aside aria-label="Safety caution" className="rounded-md border border-caution-500/30 bg-caution-50 px-3 py-2 text-sm text-caution-700">
      <p>
        <span className="font-semibold">⚠ Safety: </span>
        {text}
      </p>
      <p className="mt-1 text-xs">
        General cautions only: the sterilizer&apos;s instructions, local regulations, the standards and licensed practice come first.{" "}
        <Link href="/safety" className="underline">
          Safety notes
        </Link>
      </p>
    </aside>
  );
}
