/**
 * The demo's fitness-for-use story, this morning on the demo site, told through the real workflow
 * (the records, their photos, the engineer's password signatures and the status rule):
 * - Porous load 2: its Bowie-Dick sheet shows a paler centre; the engineer confirms the failure
 *   and it stays OUT OF USE until a repeat passes.
 * - Theatre benchtop (type B, EN 13060): its first hollow load (helix) test of the day failed and
 *   was confirmed (out of use); the door seal was replaced, the repeat passed and was approved, so
 *   it is back IN USE. Its status history shows both changes.
 */
import { eq } from "drizzle-orm";
import type { Database } from "./index";
import { sterilizers, users, type Role } from "./schema";
import { drawIndicatorSheetPng, type DrawnSheet } from "@/lib/simulator/indicator-sheet";
import { localDateTimeToInstant } from "@/lib/domain";
import { localDate } from "@/lib/periodic-tests/schedule";

export const STORY_OUT_OF_USE = "Porous load 2";
export const STORY_RELEASED = "Theatre benchtop";

/**
 * A time this morning in the site's zone: the local clock time asked for once the demo is loaded after 10:05;
 * earlier, the morning is squeezed into the time since local midnight, keeping the order, so it is today and never
 * in the future.
 */
export function thisMorning(now: Date, timeZone: string, localTime: string): Date {
  const midnight = localDateTimeToInstant(`${localDate(now, timeZone)}T00:00:00`, timeZone)!.getTime();
  const [h, m] = localTime.split(":").map(Number);
  const morningMs = 10 * 3_600_000 + 5 * 60_000;
  const squeeze = Math.min(1, (now.getTime() - midnight) / morningMs);
  return new Date(midnight + (h * 3_600_000 + m * 60_000) * squeeze);
}

const photoOf = (sheet: DrawnSheet, name: string) => new File([Buffer.from(drawIndicatorSheetPng(sheet))], name, { type: "image/png" });

export async function tellFitnessStory(db: Database, { password, now, timeZone }: { password: string; now: Date; timeZone: string }) {
  const { recordBowieDick } = await import("@/lib/services/periodic-test-records");
  const { signPeriodicTest } = await import("@/lib/services/periodic-test-review");
  const actorOf = async (role: Role) => {
    const [u] = await db.select().from(users).where(eq(users.role, role)).limit(1);
    return { id: u.id, email: u.email, name: u.name, role: u.role, siteId: u.siteId };
  };
  const technician = await actorOf("technician");
  const engineer = await actorOf("engineer");
  const idOf = async (name: string) => (await db.select({ id: sterilizers.id }).from(sterilizers).where(eq(sterilizers.name, name)).limit(1))[0].id;

  const bowieDick = async (name: string, localTime: string, sheet: DrawnSheet, notes: string, kind: "bowie-dick" | "hollow-load" = "bowie-dick") => {
    const at = thisMorning(now, timeZone, localTime);
    const input = {
      sterilizerId: await idOf(name),
      kind,
      performedAt: at.toISOString(),
      notes,
      outcome: sheet === "uniform" ? ("uniform" as const) : ("non-uniform" as const),
      indicatorLot: "BDS-2611-04",
      photo: photoOf(sheet, `indicator-sheet-${name.toLowerCase().replace(/\s+/g, "-")}-${sheet}.png`),
    };
    return recordBowieDick({ actor: technician, input });
  };
  const sign = (id: string, meaning: "approved" | "failure-confirmed", reason: string) => signPeriodicTest({ actor: engineer, id, password, meaning, reason });

  const released1 = await bowieDick(STORY_RELEASED, "06:40", "paler-centre", "Helix indicator strip paler towards the closed end. Door seal found split at the hinge side.", "hollow-load");
  await sign(released1.id, "failure-confirmed", "Non-uniform change: air was not removed from the helix. Out of use until the door seal is replaced and the test is repeated.");
  const released2 = await bowieDick(STORY_RELEASED, "08:05", "uniform", "Repeat after the door seal was replaced by the maintenance contractor.", "hollow-load");
  await sign(released2.id, "approved", "Uniform change along the whole indicator strip after the seal was replaced; the sterilizer may be used.");

  const held = await bowieDick(STORY_OUT_OF_USE, "06:35", "paler-centre", "Paler area at the centre of the sheet; the load was not started.");
  await sign(held.id, "failure-confirmed", "Non-uniform change: air removal or a leak is suspected. Out of use until the vacuum system is checked and a repeat test passes.");
  return { outOfUse: STORY_OUT_OF_USE, released: STORY_RELEASED };
}
