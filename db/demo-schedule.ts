/**
 * What each demo sterilizer is tested for and when, so that a practitioner would believe the site: a porous-load
 * sterilizer has its daily Bowie-Dick and weekly air leakage tests; the type B benchtop (EN 13060, under 60 l) its
 * hollow load (helix) and air leakage tests; the fluids sterilizer no porous-load test at all, only its yearly
 * thermometric test. Every time lies before the demo's own "now", in the site's working hours.
 */
import type { periodicTests, testSchedules } from "./schema";
import { localDateTimeToInstant } from "@/lib/domain";
import { localDate } from "@/lib/periodic-tests/schedule";
import { defaultScheduleFor } from "@/lib/periodic-tests/sterilizer-class";
import { thisMorning } from "./demo-story";

export type DemoKind = "porous" | "fluids" | "benchtop";

const DAY_MS = 86_400_000;
const HOUR_MS = 3_600_000;

export const DEMO_LOADS: Record<DemoKind, string> = {
  porous: "Standard test pack, small-load test (demo)",
  fluids: "Fluids load: 12 × 500 ml media bottles, probes in reference bottles (demo)",
  benchtop: "Small load: wrapped instrument tray with a helix process challenge device (demo)",
};

type Schedule = Omit<typeof testSchedules.$inferInsert, "sterilizerId">;

export function demoScheduleFor(kind: DemoKind, chamberVolumeL: number): Schedule[] {
  if (kind === "fluids") return [{ kind: "thermometric-full-load", intervalDays: 365 }];
  const daily = defaultScheduleFor({ vacuumAirRemoval: true, chamberVolumeL });
  if (kind === "benchtop") return [...daily, { kind: "thermometric-small-load", intervalDays: 365 }];
  return [...daily, { kind: "thermometric-small-load", intervalDays: 91 }, { kind: "steam-non-condensable-gas", intervalDays: 365 }];
}

const pad = (n: number) => String(n).padStart(2, "0");

/** A local clock time `daysAgo` days before now, in the site's zone; today's is placed by thisMorning, never after now. */
function atLocal(now: Date, timeZone: string, daysAgo: number, hour: number, minute: number): Date {
  if (daysAgo === 0) return thisMorning(now, timeZone, `${pad(hour)}:${pad(minute)}`);
  const date = localDate(new Date(now.getTime() - daysAgo * DAY_MS), timeZone);
  return localDateTimeToInstant(`${date}T${pad(hour)}:${pad(minute)}:00`, timeZone)!;
}

const weekdayOf = (now: Date, timeZone: string, daysAgo: number) => new Date(`${localDate(new Date(now.getTime() - daysAgo * DAY_MS), timeZone)}T12:00:00Z`).getUTCDay();

/**
 * When a demo thermometric cycle started: on a weekday (one that would fall at the weekend moves back to the Friday),
 * in the day shift between 07:00 and 15:59 site time, its minute spread by the cycle's ordinal; null when it would not
 * yet be over by now (a cycle runs about an hour).
 */
export function demoCycleStart(now: Date, timeZone: string, daysAgo: number, ordinal: number): Date | null {
  const weekday = weekdayOf(now, timeZone, daysAgo);
  const day = daysAgo + (weekday === 6 ? 1 : weekday === 0 ? 2 : 0);
  const date = localDate(new Date(now.getTime() - day * DAY_MS), timeZone);
  const at = localDateTimeToInstant(`${date}T${pad(7 + ((ordinal * 5) % 9))}:${pad((ordinal * 23 + 11) % 60)}:00`, timeZone)!;
  return at.getTime() <= now.getTime() - HOUR_MS ? at : null;
}

type PeriodicRow = typeof periodicTests.$inferInsert;

/**
 * Three weeks of a sterilizer's routine tests, recorded before periodic-test records were signed (they carry over as
 * approved, without a signature). The story's sterilizers get this morning's steam-penetration test from the story.
 */
export function demoPeriodicTests(o: { siteId: string; sterilizerId: string; technicianId: string; now: Date; timeZone: string; index: number; story: boolean; kind: DemoKind }): PeriodicRow[] {
  const { siteId, sterilizerId, technicianId, now, timeZone, index, story, kind } = o;
  const base = { siteId, sterilizerId, performedBy: technicianId };
  const rows: PeriodicRow[] = [];
  const daysAgoAt = (days: number) => new Date(now.getTime() - days * DAY_MS).toISOString();
  if (kind === "fluids") {
    rows.push({ ...base, kind: "thermometric-full-load", performedAt: daysAgoAt(200), result: "pass", notes: "Yearly thermometric test with a full fluids load, logger TL-12." });
    return rows;
  }
  const penetration = kind === "benchtop" ? "hollow-load" : "bowie-dick";
  for (let daysAgo = 20; daysAgo >= 0; daysAgo--) {
    // The first test of the early shift, a few minutes apart from day to day and from one sterilizer to the next.
    const at = atLocal(now, timeZone, daysAgo, 6, 20 + ((daysAgo * 7 + index * 5) % 30));
    if (!(story && daysAgo === 0)) rows.push({ ...base, kind: penetration, performedAt: at.toISOString(), result: "pass", measurements: { indicator: "uniform change" } });
    if (daysAgo % 7 === 2) {
      // Leak rate in kPa/min; the limit is 0.13 kPa/min (EN 285 / HTM 2010). Porous load 1 failed once and was repaired.
      const leak = index === 0 && daysAgo === 16 ? 0.19 : 0.04 + 0.01 * index;
      rows.push({
        ...base,
        kind: "air-leakage",
        performedAt: new Date(at.getTime() + (40 + index * 6) * 60_000).toISOString(),
        result: leak <= 0.13 ? "pass" : "fail",
        status: leak <= 0.13 ? "approved" : "failure-confirmed",
        measurements: { p2Kpa: 5.1, p3Kpa: +(5.1 + leak * 10).toFixed(2), leakRateKpaPerMin: leak },
      });
    }
  }
  rows.push({ ...base, kind: "thermometric-small-load", performedAt: daysAgoAt(40 + index * 9), result: "pass", notes: "Small-load thermometric test, logger TL-12." });
  // NCG % = 100·Vg/Vc; limit 3.5 ml per 100 ml condensate (EN 285 / HTM 2010); a porous-load sterilizer's steam supply.
  if (kind === "porous")
    rows.push({ ...base, kind: "steam-non-condensable-gas", performedAt: daysAgoAt(120 + index * 20), result: "pass", measurements: { gasMl: 1.2, condensateMl: 100, percent: 1.2 } });
  return rows;
}
