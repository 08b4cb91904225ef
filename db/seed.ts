/**
 * The demo site: a fictional sterile-services department with its sterilizers, instruments,
 * acceptance profiles, users and three weeks of test cycles made by Papin's own simulator.
 * Loaded only into an empty database, so running it twice changes nothing the second time.
 */
import { count, eq } from "drizzle-orm";
import type { Database } from "./index";
import { acceptanceProfiles, calibrationCertificates, cycles, instruments, periodicTests, sites, sterilizers, testSchedules, users, type AcceptanceProfile, type Role } from "./schema";
import { appendAuditEvent } from "./ledger";
import { DEMO_USERS } from "./demo-users";
import { hashPassword } from "@/lib/auth/password";
import { simulateCycle, toLoggerCsv, type Scenario } from "@/lib/simulator";
import { atmosphereAtAltitudeKpa } from "@/lib/steam";
import { zoneOffsetMs } from "@/lib/domain";
import { STORY_OUT_OF_USE, STORY_RELEASED, tellFitnessStory } from "./demo-story";
import { DEMO_LOADS, demoCycleStart, demoPeriodicTests, demoScheduleFor, type DemoKind } from "./demo-schedule";
import { demoLoad, demoMapping } from "./demo-positions";
import { insertDemoCycle } from "./demo-cycles";
import { loadDemoStudies } from "./demo-studies";

export { DEMO_USERS };

const DAY_MS = 86_400_000;
const DEMO_TIME_ZONE = "Europe/London";

type DemoSterilizer = {
  key: string;
  name: string;
  serialNumber: string;
  model: string;
  chamberVolumeL: number;
  location: string;
  profileKey: "p134" | "p121fluids" | "p134large" | "p134bench";
  /** porous load (EN 285, vacuum), fluids (no vacuum, no porous-load tests) or a type B benchtop (EN 13060, vacuum) */
  kind: DemoKind;
  dialect: Parameters<typeof toLoggerCsv>[1];
};

const DEMO_STERILIZERS: DemoSterilizer[] = [
  {
    key: "P1",
    name: "Porous load 1",
    serialNumber: "MB-PL-0417",
    model: "Double-door porous-load sterilizer, 6 modules",
    chamberVolumeL: 445,
    location: "Wash room / clean room wall, bay 1",
    profileKey: "p134",
    kind: "porous",
    dialect: { delimiter: ",", decimal: ".", timeFormat: "iso" },
  },
  {
    key: "P2",
    name: "Porous load 2",
    serialNumber: "MB-PL-0523",
    model: "Double-door porous-load sterilizer, 12 modules",
    chamberVolumeL: 960,
    location: "Wash room / clean room wall, bay 2",
    profileKey: "p134large",
    kind: "porous",
    dialect: { delimiter: ";", decimal: ",", timeFormat: "dmy", pressureUnit: "bar", gauge: true },
  },
  {
    key: "F1",
    name: "Fluids and media",
    serialNumber: "MB-FL-0088",
    model: "Single-door sterilizer with fluids cycle",
    chamberVolumeL: 320,
    location: "Media preparation room",
    profileKey: "p121fluids",
    kind: "fluids",
    dialect: { delimiter: "\t", decimal: ".", timeFormat: "elapsed-seconds" },
  },
  {
    key: "B1",
    name: "Theatre benchtop",
    serialNumber: "MB-BT-1102",
    model: "Type B benchtop sterilizer",
    chamberVolumeL: 23,
    location: "Day-surgery theatre suite",
    profileKey: "p134bench",
    kind: "benchtop",
    dialect: { delimiter: ",", decimal: ".", timeFormat: "mdy-ampm", pressureUnit: "mbar" },
  },
];

// Mostly good cycles, with each kind of failure appearing a few times over the three weeks.
const SCENARIO_ROTATION: Scenario[] = [
  "pass",
  "pass",
  "pass",
  "air",
  "pass",
  "pass",
  "superheat",
  "pass",
  "pass",
  "short-hold",
  "pass",
  "pass",
  "slow-equilibration",
  "pass",
  "pass",
  "pass",
  "never-reaches",
  "pass",
];

export type DemoOutcome = { loaded: boolean; summary: string };

export async function loadDemoSite(db: Database, { password, now = new Date() }: { password: string; now?: Date }): Promise<DemoOutcome> {
  const [{ n }] = await db.select({ n: count() }).from(sites);
  if (n > 0) return { loaded: false, summary: "" };

  const passwordHash = await hashPassword(password);
  let cycleCount = 0;
  let failCount = 0;

  await db.transaction(async (tx) => {
    const altitudeM = 45;
    const [site] = await tx
      .insert(sites)
      .values({
        name: "Marlow Bridge General Hospital — Sterile Services",
        code: "MBG-SSD",
        timeZone: DEMO_TIME_ZONE,
        altitudeM,
        address: "Unit 4, Riverside Works, Marlow Bridge (fictional)",
      })
      .returning();
    const atmosphereKpa = atmosphereAtAltitudeKpa(altitudeM);

    const userIds: Record<Role, string> = {} as Record<Role, string>;
    for (const u of DEMO_USERS) {
      const [row] = await tx
        .insert(users)
        .values({ ...u, passwordHash, siteId: site.id })
        .returning({ id: users.id });
      userIds[u.role] = row.id;
    }
    const admin = { actorId: userIds.admin, actorEmail: "admin@papin.example", siteId: site.id };
    await appendAuditEvent(tx, { ...admin, action: "demo.load", entityType: "site", entityId: site.id, newValue: { name: site.name } });

    const profileRows = await tx
      .insert(acceptanceProfiles)
      .values([
        {
          siteId: site.id,
          name: "134 °C / 3 min porous load",
          sterilizationTempC: 134,
          bandK: 3,
          holdingTimeS: 180,
          maxEquilibrationS: 15,
          basis: "en-285",
          basisReason: "thermometric test: band 134–137 °C, 3 min hold, equilibration ≤ 15 s for chambers up to 800 l",
        },
        {
          siteId: site.id,
          name: "134 °C / 3 min porous load, chamber over 800 l",
          sterilizationTempC: 134,
          bandK: 3,
          holdingTimeS: 180,
          maxEquilibrationS: 30,
          basis: "en-285",
          basisReason: "thermometric test: equilibration ≤ 30 s for chambers over 800 l",
        },
        {
          siteId: site.id,
          name: "121 °C / 15 min fluids (media bottles)",
          sterilizationTempC: 121,
          bandK: 3,
          holdingTimeS: 900,
          // The load lags the drain in a fluids cycle: the validated process allows 5 min for the bottles to reach 121 °C.
          maxEquilibrationS: 300,
          basis: "iso-17665",
          basisReason: "fluids cycle as validated: 15 min at 121–124 °C in the reference bottles, F0 reported per channel",
        },
        {
          siteId: site.id,
          name: "134 °C / 3 min benchtop",
          sterilizationTempC: 134,
          bandK: 3,
          holdingTimeS: 180,
          maxEquilibrationS: 15,
          basis: "en-13060",
          basisReason: "type B cycle, chamber under 60 l",
        },
      ])
      .returning();
    const profiles: Record<DemoSterilizer["profileKey"], AcceptanceProfile> = {
      p134: profileRows[0],
      p134large: profileRows[1],
      p121fluids: profileRows[2],
      p134bench: profileRows[3],
    };

    const instrumentRows = await tx
      .insert(instruments)
      .values([
        { siteId: site.id, name: "Thermocouple logger TL-12 (unit A)", serialNumber: "TL12-20417", kind: "logger", channelCount: 12 },
        { siteId: site.id, name: "Thermocouple logger TL-12 (unit B)", serialNumber: "TL12-20533", kind: "logger", channelCount: 12 },
        { siteId: site.id, name: "Chamber pressure transducer 0–6 bar abs", serialNumber: "PT6-00321", kind: "pressure-sensor", channelCount: 1 },
      ])
      .returning();
    const day = (offset: number) => new Date(now.getTime() + offset * DAY_MS).toISOString().slice(0, 10);
    await tx.insert(calibrationCertificates).values([
      { instrumentId: instrumentRows[0].id, certificateNumber: "CAL-24-1187", issuedBy: "Riverside Calibration Lab (fictional)", calibratedOn: day(-300), dueOn: day(65), uncertaintyK: 0.25 },
      { instrumentId: instrumentRows[1].id, certificateNumber: "CAL-24-0903", issuedBy: "Riverside Calibration Lab (fictional)", calibratedOn: day(-352), dueOn: day(13), uncertaintyK: 0.25 },
      {
        instrumentId: instrumentRows[2].id,
        certificateNumber: "CAL-24-0771",
        issuedBy: "Riverside Calibration Lab (fictional)",
        calibratedOn: day(-372),
        dueOn: day(-7),
        notes: "Overdue: book recalibration before the next quarterly test.",
      },
    ]);

    for (const [index, s] of DEMO_STERILIZERS.entries()) {
      const profile = profiles[s.profileKey];
      const [sterilizer] = await tx
        .insert(sterilizers)
        .values({
          siteId: site.id,
          name: s.name,
          serialNumber: s.serialNumber,
          model: s.model,
          chamberVolumeL: s.chamberVolumeL,
          location: s.location,
          defaultProfileId: profile.id,
          airDetectorFitted: s.kind === "porous",
        })
        .returning();
      await tx.insert(testSchedules).values(demoScheduleFor(s.kind, s.chamberVolumeL).map((d) => ({ ...d, sterilizerId: sterilizer.id })));
      // The story's sterilizers get this morning's Bowie-Dick test from the story (db/demo-story.ts), signed.
      const story = s.name === STORY_OUT_OF_USE || s.name === STORY_RELEASED;
      await tx
        .insert(periodicTests)
        .values(demoPeriodicTests({ siteId: site.id, sterilizerId: sterilizer.id, technicianId: userIds.technician, now, timeZone: DEMO_TIME_ZONE, index, story, kind: s.kind }));

      const instrument = instrumentRows[index % 2];
      // Every third day per sterilizer over three weeks, staggered so each day has some work; on weekdays, in the day shift.
      for (let daysAgo = 21 - index; daysAgo >= 0; daysAgo -= 3) {
        const startedAt = demoCycleStart(now, DEMO_TIME_ZONE, daysAgo, cycleCount);
        if (!startedAt) continue;
        const ordinal = cycleCount;
        const scenario = SCENARIO_ROTATION[ordinal % SCENARIO_ROTATION.length];
        const sim = simulateCycle({
          scenario,
          sterilizationTempC: profile.sterilizationTempC + 0.6,
          holdingTimeS: profile.holdingTimeS + 30,
          seed: 1000 + ordinal,
          // The loggers' clocks show the site's local time, without a zone, as intake reads them.
          startedAt: new Date(startedAt.getTime() + zoneOffsetMs(startedAt.getTime(), DEMO_TIME_ZONE)),
          atmosphereKpa,
          sampleIntervalS: 2,
        });
        const bytes = toLoggerCsv(sim, { ...s.dialect, atmosphereKpa });
        const cycleNumber = `${s.key}-${startedAt.toISOString().slice(0, 10).replace(/-/g, "")}-${String(ordinal + 1).padStart(3, "0")}`;
        const { verdict } = await insertDemoCycle(tx, {
          siteId: site.id,
          sterilizerId: sterilizer.id,
          sterilizerName: s.name,
          profile,
          instrumentId: instrument.id,
          technician: { id: userIds.technician, email: "technician@papin.example" },
          cycleNumber,
          testKind: s.kind === "fluids" ? "thermometric-full-load" : "thermometric-small-load",
          loadDescription: DEMO_LOADS[s.kind],
          ...demoLoad(ordinal, s.kind),
          status: daysAgo > 3 ? "submitted" : "draft",
          startedAt,
          bytes,
          mapping: demoMapping(bytes),
          atmosphereKpa,
        });
        cycleCount++;
        if (verdict === "fail") failCount++;
      }
    }
  });

  const decisions = await signOlderDemoCycles(db, password, now);
  const story = await tellFitnessStory(db, { password, now, timeZone: DEMO_TIME_ZONE });
  const studies = await loadDemoStudies(db, { password, now, timeZone: DEMO_TIME_ZONE });

  return {
    loaded: true,
    summary: `1 site, ${DEMO_USERS.length} users, ${DEMO_STERILIZERS.length} sterilizers, ${cycleCount} cycles (${failCount} failing), ${decisions.approved} approved with archived reports, ${decisions.returned} returned; ${story.outOfUse} out of use after a confirmed Bowie-Dick failure, ${story.released} back in use after a passing repeat; qualification study ${studies.approved} approved, ${studies.running} running with an open deviation`,
  };
}

/**
 * Older demo cycles go through the real review path: the engineer signs with the demo password,
 * which approves passing cycles (archiving their reports) and returns failing ones with a reason.
 */
async function signOlderDemoCycles(db: Database, password: string, now: Date) {
  const { signCycle } = await import("@/lib/services/sign-off");
  const [engineer] = await db.select().from(users).where(eq(users.role, "engineer")).limit(1);
  const actor = { id: engineer.id, email: engineer.email, name: engineer.name, role: engineer.role, siteId: engineer.siteId };
  const cutoff = new Date(now.getTime() - 6 * DAY_MS).toISOString();
  const older = (await db.select().from(cycles).where(eq(cycles.status, "submitted"))).filter((c) => (c.startedAt ?? "") < cutoff);
  let approved = 0;
  let returned = 0;
  for (const cycle of older) {
    if (cycle.verdict === "pass" && approved < 4) {
      await signCycle({ actor, id: cycle.id, password, meaning: "approved" });
      approved++;
    } else if (cycle.verdict === "fail") {
      await signCycle({ actor, id: cycle.id, password, meaning: "returned", reason: "The analysis failed; find the cause (see the diagnosis), correct it and repeat the test." });
      returned++;
    }
  }
  return { approved, returned };
}
