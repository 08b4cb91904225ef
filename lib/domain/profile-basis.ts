/**
 * The basis of an acceptance profile's limits: the standard it claims, or local practice with a
 * reason. Each standard's minimums, so that a profile weaker than the standard it names is refused.
 * Figures and tags from ../shared/DOMAIN.md: [found] seen in a document, [memory] common practice
 * from general knowledge. Where a standard's figure is not known, no minimum is imposed and the
 * record says so instead of inventing one.
 */
import { AIR_LEAKAGE_TEST } from "./air-leakage";
import { formatDuration } from "./format";

export const PROFILE_BASES = ["en-285", "en-13060", "iso-17665", "ansi-aami-st79", "local"] as const;
export type ProfileBasis = (typeof PROFILE_BASES)[number];

export const PROFILE_BASIS_LABELS: Record<ProfileBasis, string> = {
  "en-285": "EN 285",
  "en-13060": "EN 13060",
  "iso-17665": "ISO 17665",
  "ansi-aami-st79": "ANSI/AAMI ST79",
  local: "Local practice",
};

export const PROFILE_BASIS_SCOPES: Record<ProfileBasis, string> = {
  "en-285": "large steam sterilizers, chamber of 60 l or more",
  "en-13060": "small steam sterilizers, chamber under 60 l",
  "iso-17665": "moist heat: the validated process sets the figures",
  "ansi-aami-st79": "steam sterilization in US health care",
  local: "the site's own protocol, with its reason",
};

/** The reason Papin gives profiles that existed before bases were recorded (migration 0004). */
export const BASIS_REASON_BEFORE_BASES = "set before bases were recorded";

/** Minimum holding time at one sterilization temperature of a standard's table. */
type HoldRow = { sterilizationTempC: number; minHoldingTimeS: number };

export type BasisMinimums = {
  /** the standard's sterilization temperatures with their minimum holding times; null when it sets none Papin knows */
  holds: HoldRow[] | null;
  /** widest band above the sterilization temperature, K */
  maxBandK: number | null;
  /** longest equilibration time for any chamber size, s */
  maxEquilibrationS: number | null;
  maxSpreadK: number | null;
  /** largest allowed |reference − Tsat(p)|, K */
  maxSaturationLimitK: number | null;
  /** the per-check words printed beside the profile's own limits */
  words: Partial<Record<string, string>>;
};

const NONE = { holds: null, maxBandK: null, maxEquilibrationS: null, maxSpreadK: null, maxSaturationLimitK: null, words: {} } as const;

export const BASIS_MINIMUMS: Record<ProfileBasis, BasisMinimums> = {
  "en-285": {
    // DOMAIN §2.2: 121 °C 15 min, 126 °C 10 min, 134 °C 3 min [memory; the pairs also found in the Central Sterilising Club textbook, Table 10.2]
    holds: [
      { sterilizationTempC: 121, minHoldingTimeS: 900 },
      { sterilizationTempC: 126, minHoldingTimeS: 600 },
      { sterilizationTempC: 134, minHoldingTimeS: 180 },
    ],
    maxBandK: 3, // DOMAIN §2.2: upper limit = Ts + 3 K [memory]
    maxEquilibrationS: 30, // DOMAIN §2.3 a: 15 s up to 800 l, 30 s above [found: HTM 2010 §13.14(c)]
    maxSpreadK: 2, // DOMAIN §2.3 c [memory; 2 K between load items found in a forum quote]
    maxSaturationLimitK: 2, // DOMAIN §2.3 b / §2.4 [memory]
    words: {
      "equilibration-time": "EN 285: at most 15 s for chambers up to 800 l, 30 s above",
      spread: "EN 285: at most 2 K between the temperatures during holding",
      saturation: "EN 285: reference within 2 K of the saturation temperature",
      "saturation-band": "EN 285: the saturation temperature from pressure inside the band",
      "free-space": "EN 285 small-load test: free space at most 5 K above the reference in the first 60 s, 2 K after",
    },
  },
  "en-13060": {
    // DOMAIN §2.10: the same lower temperatures and holding times as EN 285, 121 °C 15 min and 134 °C 3 min [memory]
    holds: [
      { sterilizationTempC: 121, minHoldingTimeS: 900 },
      { sterilizationTempC: 134, minHoldingTimeS: 180 },
    ],
    // DOMAIN §2.10 / §7.6: band width +3 K or +4 K, not confirmed [memory]; only a band wider than either is refused.
    maxBandK: 4,
    // DOMAIN §2.10 / §7.6: no EN 13060 equilibration limit confirmed, so none is imposed.
    maxEquilibrationS: null,
    maxSpreadK: null,
    maxSaturationLimitK: 2, // DOMAIN §2.10: the same ≤ 2 K measured-versus-saturated check [memory]
    words: {
      band: "EN 13060: band width not confirmed (3 or 4 K); a band over 4 K is refused",
      "equilibration-time": "EN 13060: no equilibration limit confirmed; the profile's limit applies",
      spread: "EN 13060: no spread limit confirmed; the profile's limit applies",
      saturation: "EN 13060: reference within 2 K of the saturation temperature",
    },
  },
  // DOMAIN §2.1 / header: ISO 17665 asks for a specified, validated process and sets no fixed
  // time-temperature table of its own [memory], so Papin imposes no minimum.
  "iso-17665": { ...NONE, words: { "holding-time": "ISO 17665: the validated process specification sets the figures; no fixed minimum" } },
  "ansi-aami-st79": {
    // DOMAIN §2.11 [memory]: gravity 121 °C 30 min; dynamic air removal 132 °C 4 min and 135 °C 3 min.
    // A profile does not name the cycle type, so the shortest exposure listed at each temperature is
    // the minimum; gravity-displacement cycles need longer (15–30 min at 132 °C).
    holds: [
      { sterilizationTempC: 121, minHoldingTimeS: 1800 },
      { sterilizationTempC: 132, minHoldingTimeS: 240 },
      { sterilizationTempC: 135, minHoldingTimeS: 180 },
    ],
    maxBandK: null,
    maxEquilibrationS: null,
    maxSpreadK: null,
    maxSaturationLimitK: null,
    words: {},
  },
  local: NONE,
};

const EPS = 1e-6;
const degrees = (t: number) => `${+t.toFixed(2)} °C`;
/** "3 min", "15 min", "2 min 30 s": a standard's holding time the way the standard writes it. */
const holdText = (s: number) => (s >= 60 && s % 60 === 0 ? `${s / 60} min` : formatDuration(s));
const list = (items: string[]) => (items.length <= 1 ? items.join("") : `${items.slice(0, -1).join(", ")} and ${items.at(-1)}`);

/** The standard's row a sterilization temperature falls under: the highest listed temperature at or below it. */
function holdRowFor(holds: HoldRow[], sterilizationTempC: number): HoldRow | undefined {
  return [...holds].reverse().find((r) => r.sterilizationTempC <= sterilizationTempC + EPS);
}

export type ProfileLimitsInput = {
  sterilizationTempC: number;
  bandK: number;
  holdingTimeS: number;
  maxEquilibrationS: number;
  maxSpreadK: number;
  saturationLimitK: number;
  /** air leakage test limits; absent from callers that predate them */
  leakRateLimitKpaPerMin?: number;
  leakVacuumSetPointKpaAbs?: number;
  basis: ProfileBasis;
  basisReason?: string | null;
};

export type BasisShortfall = {
  field: "sterilizationTempC" | "bandK" | "holdingTimeS" | "maxEquilibrationS" | "maxSpreadK" | "saturationLimitK" | "leakRateLimitKpaPerMin" | "leakVacuumSetPointKpaAbs" | "basisReason";
  message: string;
};

/** Shortest reason accepted for local practice. */
export const MIN_BASIS_REASON_LENGTH = 10;

/**
 * Where a profile is weaker than the basis it names, one plain sentence per limit, each naming
 * the minimum ("EN 285 requires a holding time of at least 3 min at 134 °C"). Empty when the
 * profile meets its basis. A band that lies inside the standard's band (e.g. 134.5–136.5 °C
 * under EN 285) is stricter, not weaker, and passes.
 */
export function basisShortfalls(p: ProfileLimitsInput): BasisShortfall[] {
  if (p.basis === "local") {
    const reason = p.basisReason?.trim() ?? "";
    return reason.length >= MIN_BASIS_REASON_LENGTH ? [] : [{ field: "basisReason", message: "Local practice needs its reason: say which protocol or validation these limits come from." }];
  }
  const name = PROFILE_BASIS_LABELS[p.basis];
  const m = BASIS_MINIMUMS[p.basis];
  const out: BasisShortfall[] = [];
  if (m.holds) {
    const row = holdRowFor(m.holds, p.sterilizationTempC);
    const bandTop = (r: HoldRow) => (m.maxBandK === null ? null : r.sterilizationTempC + m.maxBandK);
    const sets = m.holds.map((r) => (bandTop(r) === null ? degrees(r.sterilizationTempC) : `${+r.sterilizationTempC.toFixed(2)}–${degrees(bandTop(r)!)}`));
    if (!row || (bandTop(row) !== null && p.sterilizationTempC > bandTop(row)! + EPS)) {
      out.push({
        field: "sterilizationTempC",
        message: `${name} sets ${m.maxBandK === null ? "sterilization temperatures of" : "the bands"} ${list(sets)}; ${degrees(p.sterilizationTempC)} is not covered, so choose local practice and give the reason.`,
      });
    } else {
      if (p.holdingTimeS + EPS < row.minHoldingTimeS) {
        out.push({ field: "holdingTimeS", message: `${name} requires a holding time of at least ${holdText(row.minHoldingTimeS)} at ${degrees(row.sterilizationTempC)}.` });
      }
      const top = bandTop(row);
      if (top !== null && p.sterilizationTempC + p.bandK > top + EPS) {
        out.push({
          field: "bandK",
          message: `${name} allows a band of at most ${m.maxBandK} K above ${degrees(row.sterilizationTempC)} (up to ${degrees(top)}); this band reaches ${degrees(p.sterilizationTempC + p.bandK)}.`,
        });
      }
    }
  }
  if (m.maxEquilibrationS !== null && p.maxEquilibrationS > m.maxEquilibrationS + EPS) {
    const note = p.basis === "en-285" ? " (15 s for chambers up to 800 l)" : "";
    out.push({ field: "maxEquilibrationS", message: `${name} allows an equilibration time of at most ${m.maxEquilibrationS} s${note}.` });
  }
  if (m.maxSpreadK !== null && p.maxSpreadK > m.maxSpreadK + EPS) {
    out.push({ field: "maxSpreadK", message: `${name} allows a spread of at most ${m.maxSpreadK} K between the temperatures during holding.` });
  }
  if (m.maxSaturationLimitK !== null && p.saturationLimitK > m.maxSaturationLimitK + EPS) {
    out.push({ field: "saturationLimitK", message: `${name} allows the reference at most ${m.maxSaturationLimitK} K from the saturation temperature.` });
  }
  return [...out, ...leakShortfalls(p, name)];
}

/** EN 285's air leakage figures (DOMAIN §2.5): rate at most 0.13 kPa/min [found], from a vacuum below 7 kPa abs [memory]; other bases set none Papin knows. */
function leakShortfalls(p: ProfileLimitsInput, name: string): BasisShortfall[] {
  if (p.basis !== "en-285") return [];
  const out: BasisShortfall[] = [];
  if (p.leakRateLimitKpaPerMin !== undefined && p.leakRateLimitKpaPerMin > AIR_LEAKAGE_TEST.maxLeakRateKpaPerMin + EPS) {
    out.push({ field: "leakRateLimitKpaPerMin", message: `${name} allows an air leakage rate of at most ${AIR_LEAKAGE_TEST.maxLeakRateKpaPerMin} kPa/min (1.3 mbar/min).` });
  }
  if (p.leakVacuumSetPointKpaAbs !== undefined && p.leakVacuumSetPointKpaAbs > AIR_LEAKAGE_TEST.vacuumSetPointKpaAbs + EPS) {
    out.push({ field: "leakVacuumSetPointKpaAbs", message: `${name} starts the air leakage test from a vacuum below ${AIR_LEAKAGE_TEST.vacuumSetPointKpaAbs} kPa abs.` });
  }
  return out;
}

/** "EN 13060" or "Local practice: validated 5 min cycle, report VR-12". */
export function describeBasis(basis: ProfileBasis, basisReason?: string | null): string {
  const label = PROFILE_BASIS_LABELS[basis];
  const reason = basisReason?.trim();
  return reason ? `${label}: ${reason}` : label;
}

/**
 * What the profile's basis says about one check, printed beside it on the record and the report
 * in place of any standard the analysis might name: a benchtop judged under EN 13060 is never
 * described with EN 285 wording. Check ids the basis has no words for get a plain "no figure".
 */
export function basisNoteFor(checkId: string, basis: ProfileBasis, basisReason: string | null | undefined, sterilizationTempC: number): string {
  if (basis === "local") return describeBasis(basis, basisReason);
  const name = PROFILE_BASIS_LABELS[basis];
  const m = BASIS_MINIMUMS[basis];
  const words = m.words[checkId];
  if (words) return words;
  const row = m.holds ? holdRowFor(m.holds, sterilizationTempC) : undefined;
  if (checkId === "holding-time") return row ? `${name}: at least ${holdText(row.minHoldingTimeS)} at ${degrees(row.sterilizationTempC)}` : `${name}: no holding time set; the profile's applies`;
  if (checkId === "band" && m.maxBandK !== null && row) return `${name}: band ${+row.sterilizationTempC.toFixed(2)}–${degrees(row.sterilizationTempC + m.maxBandK)}`;
  if (checkId === "plateau-reached" && row) return `${name}: sterilization temperature ${degrees(row.sterilizationTempC)}`;
  return `${name}: no figure of its own for this check; the profile's applies`;
}

/** One line of what a basis requires, for the profile form: "121 °C ≥ 15 min, …; band ≤ 3 K; …". */
export function summariseBasisMinimums(basis: ProfileBasis): string {
  if (basis === "local") return "No minimums: the site's protocol sets the limits, and the reason is printed on every record.";
  const m = BASIS_MINIMUMS[basis];
  const parts: string[] = [];
  if (m.holds) parts.push(m.holds.map((r) => `${degrees(r.sterilizationTempC)} ≥ ${holdText(r.minHoldingTimeS)}`).join(", "));
  if (m.maxBandK !== null) parts.push(`band ≤ ${m.maxBandK} K`);
  if (m.maxEquilibrationS !== null) parts.push(`equilibration ≤ ${m.maxEquilibrationS} s${basis === "en-285" ? " (15 s up to 800 l)" : ""}`);
  if (m.maxSpreadK !== null) parts.push(`spread ≤ ${m.maxSpreadK} K`);
  if (m.maxSaturationLimitK !== null) parts.push(`saturation ± ${m.maxSaturationLimitK} K`);
  if (basis === "en-285") parts.push(`air leakage ≤ ${AIR_LEAKAGE_TEST.maxLeakRateKpaPerMin} kPa/min from below ${AIR_LEAKAGE_TEST.vacuumSetPointKpaAbs} kPa abs`);
  const unknown = [m.maxEquilibrationS === null && "equilibration", m.maxSpreadK === null && "spread", m.maxSaturationLimitK === null && "saturation"].filter(Boolean);
  const tail = unknown.length ? `; no ${list(unknown as string[])} figure${unknown.length > 1 ? "s" : ""} known, so none imposed` : "";
  return parts.length ? `${PROFILE_BASIS_LABELS[basis]}: ${parts.join("; ")}${tail}.` : `${PROFILE_BASIS_LABELS[basis]} sets no fixed figures Papin knows; none imposed.`;
}
