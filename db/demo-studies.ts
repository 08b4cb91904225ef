/**
 * The demo's qualification studies (issue 14 §9), built through the real workflow: signed thermometric cycles with a
 * probe at each position of a loading pattern, attached as runs, indicators read, deviations opened by the rules, and
 * the study signed by its author (Amara Osei), a reviewer (Priya Nair) and quality assurance (Jonas Weber).
 * - Fluids and media: an APPROVED heat-penetration study of three runs of a full media-bottle load; the bottom-shelf
 *   centre bottle (P4) heats slowest in every run, so it is the cold spot 3 of 3 times.
 * - Porous load 1: a RUNNING heat-penetration study of wrapped instrument trays; its first run failed (air in the
 *   chamber), which opened a deviation still under investigation; the second passed, one of the three in a row needed.
 * The cycles' logger files name the probes by position ("P1 (°C)" …) so the sensor map proposal maps them.
 */
import { eq } from "drizzle-orm";
import type { Database } from "./index";
import { acceptanceProfiles, instruments, sites, sterilizers, users, type AcceptanceProfile } from "./schema";
import { simulateCycle, toLoggerCsv, type Scenario, type SimulatedCycle } from "@/lib/simulator";
import { zoneOffsetMs, type ChannelPlacements, type LoadType, type PatternPosition } from "@/lib/domain";
import { atmosphereAtAltitudeKpa } from "@/lib/steam";
import { demoCycleStart } from "./demo-schedule";
import { insertDemoCycle } from "./demo-cycles";

type DemoActor = { id: string; email: string; name: string; role: "technician" | "engineer" | "auditor" | "admin"; siteId: string | null };
type Setting = { password: string; now: Date; timeZone: string };
type CycleSetting = Setting & { db: Database };

const FLUIDS_POSITIONS: PatternPosition[] = [
  { id: "P1", label: "Top shelf, front left bottle", sensorPosition: "load-item" },
  { id: "P2", label: "Top shelf, centre bottle", sensorPosition: "load-item" },
  { id: "P3", label: "Middle shelf, centre bottle", sensorPosition: "load-item" },
  { id: "P4", label: "Bottom shelf, centre bottle (above the drain)", sensorPosition: "load-item" },
  { id: "P5", label: "Bottom shelf, rear right bottle", sensorPosition: "load-item" },
  { id: "P6", label: "Middle shelf, door-side bottle", sensorPosition: "load-item" },
];
const TRAY_POSITIONS: PatternPosition[] = [
  { id: "P1", label: "Upper basket, left tray, centre of the instrument set", sensorPosition: "load-item" },
  { id: "P2", label: "Upper basket, right tray, inside the wrapped bowl", sensorPosition: "load-item" },
  { id: "P3", label: "Middle basket, heaviest tray (orthopaedic set)", sensorPosition: "load-item" },
  { id: "P4", label: "Middle basket, door-side tray", sensorPosition: "load-item" },
  { id: "P5", label: "Lower basket, left tray", sensorPosition: "load-item" },
  { id: "P6", label: "Lower basket, rear tray above the drain", sensorPosition: "load-item" },
];

/** The probes named by position, as the logger was set up for the study: "Pack 3 (°C)" becomes "P3 (°C)". */
function namedByPosition(sim: SimulatedCycle): SimulatedCycle {
  return { ...sim, channels: sim.channels.map((c) => ({ ...c, header: c.header.replace(/^Pack (\d+)/, "P$1") })) };
}

/**
 * A slower-heating position: the probe follows its neighbour with a first-order lag while heating (a full bottle lags
 * the steam) but never reads warmer than it, so it arrives at Ts last and collects the least lethality.
 */
function slowerAt(sim: SimulatedCycle, header: string, tauS: number): SimulatedCycle {
  const dtS = sim.timesS.length > 1 ? sim.timesS[1] - sim.timesS[0] : 1;
  return {
    ...sim,
    channels: sim.channels.map((c) => {
      if (c.header !== header) return c;
      const values = new Float64Array(c.values.length);
      let lagged = c.values[0];
      for (let i = 0; i < c.values.length; i++) {
        lagged += (c.values[i] - lagged) * Math.min(1, dtS / tauS);
        values[i] = Math.min(lagged, c.values[i]);
      }
      return { ...c, values };
    }),
  };
}

function placementsOf(positions: PatternPosition[]): ChannelPlacements {
  const placements: ChannelPlacements = { "Drain (°C)": { position: "reference-drain", note: "In the chamber drain, upstream of the drain valve" } };
  for (const p of positions) placements[`${p.id} (°C)`] = { position: "load-item", note: `${p.id}: ${p.label}` };
  return placements;
}

type RunPlan = { daysAgo: number; scenario: Scenario; seed: number };
type CycleContext = CycleSetting & {
  technician: DemoActor;
  signer: DemoActor;
  siteId: string;
  sterilizerId: string;
  sterilizerName: string;
  key: string;
  profile: AcceptanceProfile;
  instrumentId: string;
  atmosphereKpa: number;
};

/** One study cycle, stored as run and submitted on its day, then signed by an engineer: approved when it passed, failure confirmed when not. */
async function signedStudyCycle(c: CycleContext, run: RunPlan, ordinal: number, pattern: { positions: PatternPosition[]; loadType: LoadType; lot: string; load: string; coldSpot?: string }) {
  const { signCycle } = await import("@/lib/services/sign-off");
  const startedAt = demoCycleStart(c.now, c.timeZone, run.daysAgo, ordinal);
  if (!startedAt) throw new Error(`The demo study cycle ${run.daysAgo} days ago falls after the demo clock.`);
  let sim = simulateCycle({
    scenario: run.scenario,
    // Controlled 0.7 K above Ts, so the spread between load positions stays inside 2 K while every probe is in the hold.
    sterilizationTempC: c.profile.sterilizationTempC - 0.6,
    // The slowest bottle takes a few minutes to arrive: the controller holds long enough for it (fluids cycle as validated).
    holdingTimeS: c.profile.holdingTimeS + (pattern.coldSpot ? 300 : 30),
    seed: run.seed,
    startedAt: new Date(startedAt.getTime() + zoneOffsetMs(startedAt.getTime(), c.timeZone)),
    atmosphereKpa: c.atmosphereKpa,
    sampleIntervalS: 2,
  });
  sim = namedByPosition(sim);
  if (pattern.coldSpot) sim = slowerAt(sim, `${pattern.coldSpot} (°C)`, 45);
  const bytes = toLoggerCsv(sim, { delimiter: ",", decimal: ".", timeFormat: "iso", atmosphereKpa: c.atmosphereKpa });
  const cycleNumber = `${c.key}-${startedAt.toISOString().slice(0, 10).replace(/-/g, "")}-Q${ordinal}`;
  const created = await insertDemoCycle(c.db, {
    siteId: c.siteId,
    sterilizerId: c.sterilizerId,
    sterilizerName: c.sterilizerName,
    profile: c.profile,
    instrumentId: c.instrumentId,
    technician: c.technician,
    cycleNumber,
    testKind: "thermometric-full-load",
    loadDescription: pattern.load,
    loadType: pattern.loadType,
    loadLot: pattern.lot,
    status: "submitted",
    startedAt,
    bytes,
    mapping: { positions: placementsOf(pattern.positions) },
    atmosphereKpa: c.atmosphereKpa,
  });
  const passed = created.verdict === "pass";
  await signCycle(
    passed
      ? { actor: c.signer, id: created.id, password: c.password, meaning: "approved", reason: "Study run: every check passed; probes at the pattern's positions." }
      : { actor: c.signer, id: created.id, password: c.password, meaning: "failure-confirmed", reason: "Study run failed its checks; the study records a deviation." },
  );
  return { cycleId: created.id, cycleNumber, passed, startedAt };
}

const HOUR_MS = 3_600_000;
const BI = { organism: "Geobacillus stearothermophilus", population: 1.5e6, incubation: "48 h at 56 °C" };

type StudyPlan = {
  sterilizer: string;
  key: string;
  title: string;
  pattern: { name: string; description: string; loadType: LoadType; items: Array<{ name: string; quantity: number }>; positions: PatternPosition[]; lot: string; coldSpot?: string };
  protocol: string;
  runs: RunPlan[];
};

const APPROVED_STUDY: StudyPlan = {
  sterilizer: "Fluids and media",
  key: "F1",
  title: "Heat penetration, full load of 500 ml media bottles",
  pattern: {
    name: "Media bottles, full load (24 × 500 ml)",
    description: "Three wire shelves of eight loosely capped 500 ml bottles of culture medium, filled to 450 ml; probes in the liquid at mid-height.",
    loadType: "fluids-load",
    items: [
      { name: "Media bottle 500 ml, 450 ml fill, cap loose", quantity: 24 },
      { name: "Wire shelf", quantity: 3 },
    ],
    positions: FLUIDS_POSITIONS,
    lot: "MB-2610-QS",
    coldSpot: "P4",
  },
  protocol:
    "Three consecutive runs of the full media load on the validated 121 °C / 15 min fluids cycle. A thermocouple in the liquid of each listed bottle, the reference probe in the drain. Each position must reach at least the profile's minimum F0; a biological indicator (Geobacillus stearothermophilus, 10⁶) beside each probe, incubated 48 h at 56 °C, must show no growth.",
  runs: [
    { daysAgo: 40, scenario: "pass", seed: 8101 },
    { daysAgo: 39, scenario: "pass", seed: 8102 },
    { daysAgo: 38, scenario: "pass", seed: 8103 },
  ],
};

const RUNNING_STUDY: StudyPlan = {
  sterilizer: "Porous load 1",
  key: "P1",
  title: "Heat penetration, wrapped instrument trays (6 modules)",
  pattern: {
    name: "Wrapped instrument trays, 6 modules",
    description: "Six double-wrapped instrument trays in three baskets, the heaviest (orthopaedic set, 8.5 kg) in the middle basket; probes inside the wraps.",
    loadType: "wrapped-instruments",
    items: [
      { name: "Wrapped instrument tray, 4–8.5 kg", quantity: 6 },
      { name: "Loading basket", quantity: 3 },
    ],
    positions: TRAY_POSITIONS,
    lot: "TRAY-QS-2611",
  },
  protocol:
    "Three consecutive runs of the six-tray load on the 134 °C / 3 min porous-load cycle. A thermocouple inside the wrap of each listed tray, the reference probe in the drain; a biological indicator beside each probe. A failed run is investigated as a deviation and the series starts again.",
  runs: [
    { daysAgo: 8, scenario: "air", seed: 8202 },
    { daysAgo: 7, scenario: "pass", seed: 8203 },
  ],
};

/** Loads the demo's two studies (after the cycles and the fitness story); returns their numbers for the summary. */
export async function loadDemoStudies(db: Database, setting: Setting) {
  const actorOf = async (email: string): Promise<DemoActor> => {
    const [u] = await db.select().from(users).where(eq(users.email, email)).limit(1);
    return { id: u.id, email: u.email, name: u.name, role: u.role, siteId: u.siteId };
  };
  const people = {
    technician: await actorOf("technician@papin.example"),
    author: await actorOf("engineer@papin.example"),
    reviewer: await actorOf("reviewer@papin.example"),
    qa: await actorOf("qa@papin.example"),
  };
  const [logger] = await db.select({ id: instruments.id }).from(instruments).where(eq(instruments.serialNumber, "TL12-20417")).limit(1);
  const approved = await runStudy(db, setting, people, logger.id, APPROVED_STUDY, "approved");
  const running = await runStudy(db, setting, people, logger.id, RUNNING_STUDY, "running");
  return { approved, running };
}

type People = { technician: DemoActor; author: DemoActor; reviewer: DemoActor; qa: DemoActor };

async function runStudy(db: Database, setting: Setting, people: People, instrumentId: string, plan: StudyPlan, until: "approved" | "running") {
  const studies = await import("@/lib/services/studies");
  const [sterilizer] = await db.select().from(sterilizers).where(eq(sterilizers.name, plan.sterilizer)).limit(1);
  const [profile] = await db.select().from(acceptanceProfiles).where(eq(acceptanceProfiles.id, sterilizer.defaultProfileId!)).limit(1);
  const { author, reviewer, qa, technician } = people;
  const { pattern } = plan;
  const created = await studies.createStudy({
    actor: author,
    input: {
      sterilizerId: sterilizer.id,
      kind: "heat-penetration",
      profileId: profile.id,
      runsRequired: 3,
      title: plan.title,
      loadingPattern: { name: pattern.name, description: pattern.description, loadType: pattern.loadType, items: pattern.items, positions: pattern.positions },
      protocol: plan.protocol,
      requalificationMonths: 12,
    },
  });
  const id = created.id;
  const sign = (actor: DemoActor, meaning: "protocol-approved" | "submitted-for-review" | "reviewed" | "qa-approved", reason?: string) =>
    studies.signStudy({ actor, id, password: setting.password, meaning, reason });
  await sign(reviewer, "protocol-approved", "Positions, criteria and indicators agree with the site's validation plan.");

  const [site] = await db.select().from(sites).where(eq(sites.id, sterilizer.siteId)).limit(1);
  const where = { siteId: site.id, sterilizerId: sterilizer.id, sterilizerName: sterilizer.name };
  const atmosphereKpa = atmosphereAtAltitudeKpa(site.altitudeM ?? 0);
  const context: CycleContext = { ...setting, db, technician, signer: reviewer, ...where, key: plan.key, profile, instrumentId, atmosphereKpa };
  for (const [index, run] of plan.runs.entries()) {
    const cycle = await signedStudyCycle(context, run, 900 + index + (plan.key === "F1" ? 0 : 10), { ...pattern, load: `${pattern.name} (demo)` });
    // The sensor map is the proposal from the probes' names (every position has its "Pn" channel).
    const { runId } = await studies.attachRun({ actor: technician, id, cycleId: cycle.cycleId });
    if (!cycle.passed) continue;
    // Read after 48 h of incubation, and never after the demo clock.
    const readAt = new Date(Math.min(cycle.startedAt.getTime() + 49 * HOUR_MS, setting.now.getTime() - HOUR_MS)).toISOString();
    for (const position of pattern.positions) {
      await studies.recordIndicator({
        actor: technician,
        id,
        runId,
        input: { positionId: position.id, kind: "biological", result: "no-growth", lot: "BI-GS-2609-12", readBy: technician.name, readAt, ...BI },
      });
    }
  }
  if (until === "approved") {
    await sign(author, "submitted-for-review", "Three consecutive passing runs; the cold spot (P4) received more than the minimum F0 in each.");
    await sign(reviewer, "reviewed", "Figures, sensor maps and indicator readings checked against the cycle records.");
    await sign(qa, "qa-approved", "Study complete, no deviation; the load pattern is qualified for routine use.");
  } else {
    const detail = await studies.getStudyDetail({ actor: author, id });
    const open = detail.deviations.find((d) => d.status === "open");
    if (open) {
      await studies.updateDeviation({
        actor: author,
        id,
        deviationId: open.id,
        changes: {
          impact: "No load was released from this run (a study run). The air removal of the cycle is in doubt until the cause is found; the series restarts after the investigation.",
          capaReference: "CAPA-2611-07",
        },
      });
    }
    // The engineer holds this load until it is qualified: the status board names it beside the sterilizer.
    const { setPatternRequiredBeforeUse } = await import("@/lib/services/requalification");
    await setPatternRequiredBeforeUse({ actor: author, patternId: detail.loadingPattern.id, requiredBeforeUse: true, reason: "New load pattern: not to be run until its study is approved." });
  }
  return created.studyNumber;
}
