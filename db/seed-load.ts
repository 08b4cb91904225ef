/**
 * `npm run db:seed-load -- --cycles N [--years Y] [--force]`: fills the configured database with N
 * simulated cycles on the demo site, spread over Y years (default 10), to measure the lists at the
 * size a large department reaches. Every cycle gets a small simulated logger file (its bytes
 * repeated between cycles of the same sterilizer and scenario), the real analysis of that file and
 * one audit event in the hash chain, with the analysis's stored series columns (analysis_series, so a chart never
 * falls back to parsing the file). Refuses a database holding anything but the demo site unless
 * `--force`. Signatures and reports are not made: load cycles in a confirmed status have none.
 */
import { count, eq, inArray, desc } from "drizzle-orm";
import { drizzle } from "drizzle-orm/libsql";
import { applyFilePragmas, openClient } from "./index";
import * as schema from "./schema";
import { acceptanceProfiles, analyses, analysisSeries, auditEvents, cycles, instruments, loggerFiles, sites, sterilizers, users, type CycleStatus, type NewCycle } from "./schema";
import { migrateDatabase } from "./migrate";
import { nonDemoData } from "./demo-data";
import { DEMO_USERS, loadDemoSite } from "./seed";
import { auditEventHash } from "./ledger";
import { env } from "@/lib/env";
import { canonicalJson, GENESIS_HASH } from "@/lib/integrity";
import { simulateCycle, toLoggerCsv, type Scenario } from "@/lib/simulator";
import { analyzeLoggerBytes } from "@/lib/cycles/analyze-file";
import { recordingToColumns } from "@/lib/cycles/series";
import { atmosphereAtAltitudeKpa } from "@/lib/steam";

const DEMO_SITE_CODE = "MBG-SSD";
const LOAD_DESCRIPTION = "Standard test pack, small-load test (demo load data)";
const BATCH_CYCLES = 500;
// SQLite allows 32,766 bound values per statement; a cycles row binds ~20.
const ROWS_PER_INSERT = 250;
const DAY_MS = 86_400_000;
const SCENARIOS: Scenario[] = ["pass", "pass", "pass", "pass", "pass", "pass", "pass", "air", "short-hold", "superheat"];

type Args = { cycles: number; years: number; force: boolean };

function parseArgs(argv: string[]): Args {
  const valueOf = (flag: string) => {
    const i = argv.indexOf(flag);
    return i >= 0 ? argv[i + 1] : undefined;
  };
  const cycles = Number(valueOf("--cycles"));
  const years = Number(valueOf("--years") ?? 10);
  if (!Number.isInteger(cycles) || cycles < 1 || cycles > 2_000_000) throw new Error("--cycles needs a whole number from 1 to 2,000,000, e.g. --cycles 100000.");
  if (!(years > 0 && years <= 50)) throw new Error("--years needs a number of years from 0 to 50.");
  return { cycles, years, force: argv.includes("--force") };
}

type SeriesRow = typeof analysisSeries.$inferInsert;
type Template = { bytes: Buffer; analysis: ReturnType<typeof analyzeLoggerBytes>; series: Omit<SeriesRow, "analysisId"> };

/** The analysis's recording as the intake stores it (one copy of the bytes per template, reused by its cycles). */
function seriesOf(analysis: Template["analysis"]): Template["series"] {
  const { meta, sampleCount, timesS, channelValues } = recordingToColumns(analysis.recording);
  const buffer = (bytes: Uint8Array) => Buffer.from(bytes.buffer, bytes.byteOffset, bytes.byteLength);
  return { meta, sampleCount, timesS: buffer(timesS), channelValues: buffer(channelValues) };
}

/** A few small files per sterilizer (10 s sampling, 3 probes), analysed once and reused. */
function templatesFor(profile: schema.AcceptanceProfile, atmosphereKpa: number, seed: number): Template[] {
  return SCENARIOS.map((scenario, i) => {
    const sim = simulateCycle({
      scenario,
      sterilizationTempC: profile.sterilizationTempC + 0.6,
      holdingTimeS: profile.holdingTimeS + 30,
      seed: seed + i,
      startedAt: new Date(Date.UTC(2020, 0, 1, 6)),
      atmosphereKpa,
      sampleIntervalS: 10,
      probeCount: 3,
    });
    const bytes = toLoggerCsv(sim, { delimiter: ",", decimal: ".", timeFormat: "iso", atmosphereKpa });
    const analysis = analyzeLoggerBytes(bytes, profile, {}, atmosphereKpa);
    return { bytes: Buffer.from(bytes), analysis, series: seriesOf(analysis) };
  });
}

/** Old cycles are confirmed (a few returned), the newest still draft or submitted. */
function statusOf(verdict: "pass" | "fail", ageRank: number, ordinal: number): CycleStatus {
  if (ageRank < 20) return "draft";
  if (ageRank < 60) return "submitted";
  if (ordinal % 37 === 0) return "returned";
  return verdict === "pass" ? "approved" : "failure-confirmed";
}

async function main() {
  const args = parseArgs(process.argv.slice(2));
  const { DATABASE_URL, DATABASE_AUTH_TOKEN, PAPIN_DEMO_PASSWORD } = env();
  const client = openClient(DATABASE_URL, DATABASE_AUTH_TOKEN);
  await applyFilePragmas(client, DATABASE_URL);
  const db = drizzle(client, { schema });
  await migrateDatabase(db);
  await loadDemoSite(db, { password: PAPIN_DEMO_PASSWORD });
  const [site] = await db.select().from(sites).where(eq(sites.code, DEMO_SITE_CODE));
  if (!site) throw new Error(`the database has no demo site (code ${DEMO_SITE_CODE}); load cycles go onto the demo site only.`);
  const foreign = await nonDemoData(db, site.id);
  if (foreign && !args.force) throw new Error(`the database at DATABASE_URL is not a demo database (${foreign}); run again with --force to add load data anyway.`);

  const siteSterilizers = await db.select().from(sterilizers).where(eq(sterilizers.siteId, site.id));
  const profiles = await db.select().from(acceptanceProfiles).where(eq(acceptanceProfiles.siteId, site.id));
  const [instrument] = await db.select().from(instruments).where(eq(instruments.siteId, site.id)).limit(1);
  const people = await db
    .select({ id: users.id, email: users.email, role: users.role })
    .from(users)
    .where(
      inArray(
        users.email,
        DEMO_USERS.map((u) => u.email),
      ),
    );
  const technician = people.find((p) => p.role === "technician");
  if (!technician || siteSterilizers.length === 0) throw new Error("the demo site has no technician or no sterilizers to record load cycles under.");
  const atmosphereKpa = site.atmosphereKpa ?? atmosphereAtAltitudeKpa(site.altitudeM ?? 0);
  const machines = siteSterilizers.map((s, i) => {
    const profile = profiles.find((p) => p.id === s.defaultProfileId) ?? profiles[0];
    return { sterilizer: s, profile, key: `L${i + 1}`, templates: templatesFor(profile, atmosphereKpa, 50_000 + i * 100) };
  });

  const started = Date.now();
  const nowMs = Date.now();
  const spanMs = args.years * 365 * DAY_MS;
  const [{ existing }] = await db.select({ existing: count() }).from(cycles).where(eq(cycles.siteId, site.id));
  for (let from = 0; from < args.cycles; from += BATCH_CYCLES) {
    const to = Math.min(from + BATCH_CYCLES, args.cycles);
    await db.transaction(async (tx) => {
      const cycleRows: NewCycle[] = [];
      const fileRows: schema.NewLoggerFile[] = [];
      const analysisRows: schema.NewAnalysis[] = [];
      const seriesRows: SeriesRow[] = [];
      const [last] = await tx.select({ hash: auditEvents.hash }).from(auditEvents).orderBy(desc(auditEvents.seq)).limit(1);
      let prevHash = last?.hash ?? GENESIS_HASH;
      const eventRows: (typeof auditEvents.$inferInsert)[] = [];
      for (let i = from; i < to; i++) {
        const ordinal = existing + i + 1;
        const machine = machines[i % machines.length];
        const template = machine.templates[Math.floor(i / machines.length) % machine.templates.length];
        const verdict = template.analysis.result.verdict;
        // Evenly spread over the span, oldest first, at a working hour.
        const startedAt = new Date(nowMs - spanMs + Math.floor(((i + 0.5) * spanMs) / args.cycles));
        const status = statusOf(verdict, args.cycles - 1 - i, ordinal);
        const cycleId = crypto.randomUUID();
        const fileId = crypto.randomUUID();
        const analysisId = crypto.randomUUID();
        const cycleNumber = `${machine.key}-${startedAt.toISOString().slice(0, 10).replace(/-/g, "")}-${String(ordinal).padStart(6, "0")}`;
        const submittedAt = status === "draft" ? null : new Date(startedAt.getTime() + 3_600_000).toISOString();
        cycleRows.push({
          id: cycleId,
          siteId: site.id,
          sterilizerId: machine.sterilizer.id,
          profileId: machine.profile.id,
          instrumentId: instrument?.id ?? null,
          cycleNumber,
          testKind: "thermometric-small-load",
          loadDescription: LOAD_DESCRIPTION,
          status,
          verdict,
          startedAt: startedAt.toISOString(),
          currentAnalysisId: analysisId,
          createdBy: technician.id,
          createdAt: startedAt.toISOString(),
          submittedBy: submittedAt ? technician.id : null,
          submittedAt,
        });
        fileRows.push({
          id: fileId,
          cycleId,
          name: `${cycleNumber}.csv`,
          sizeBytes: template.bytes.byteLength,
          sha256: template.analysis.sha256,
          bytes: template.bytes,
          dialect: template.analysis.dialect,
          mapping: template.analysis.mapping,
          duplicateReason: "demo load data: one simulated file stands for many cycles",
          uploadedBy: technician.id,
          uploadedAt: startedAt.toISOString(),
        });
        analysisRows.push({
          id: analysisId,
          cycleId,
          loggerFileId: fileId,
          engineVersion: template.analysis.engineVersion,
          inputHash: template.analysis.inputHash,
          limits: template.analysis.limits,
          result: template.analysis.result,
          verdict,
          createdBy: technician.id,
          createdAt: startedAt.toISOString(),
        });
        seriesRows.push({ ...template.series, analysisId, createdAt: startedAt.toISOString() });
        const fields = {
          at: new Date().toISOString(),
          actorId: technician.id,
          actorEmail: technician.email,
          siteId: site.id,
          action: "cycle.create",
          entityType: "cycle",
          entityId: cycleId,
          oldValue: null,
          newValue: canonicalJson({ cycleNumber, demoLoad: true, status, verdict }),
          reason: "demo load data (npm run db:seed-load)",
          prevHash,
        };
        prevHash = auditEventHash(fields);
        eventRows.push({ ...fields, hash: prevHash });
      }
      for (let k = 0; k < cycleRows.length; k += ROWS_PER_INSERT) {
        await tx.insert(cycles).values(cycleRows.slice(k, k + ROWS_PER_INSERT));
        await tx.insert(loggerFiles).values(fileRows.slice(k, k + ROWS_PER_INSERT));
        await tx.insert(analyses).values(analysisRows.slice(k, k + ROWS_PER_INSERT));
        await tx.insert(analysisSeries).values(seriesRows.slice(k, k + ROWS_PER_INSERT));
        await tx.insert(auditEvents).values(eventRows.slice(k, k + ROWS_PER_INSERT));
      }
    });
    if (to % 10_000 === 0 || to === args.cycles) console.log(`${to.toLocaleString("en")} of ${args.cycles.toLocaleString("en")} cycles (${((Date.now() - started) / 1000).toFixed(1)} s)`);
  }
  await client.execute("ANALYZE");
  console.log(`Loaded ${args.cycles.toLocaleString("en")} demo cycles onto ${site.name} in ${((Date.now() - started) / 1000).toFixed(1)} s.`);
  client.close();
}

main().catch((error: unknown) => {
  console.error(`Papin could not load demo cycles: ${error instanceof Error ? error.message : String(error)}`);
  process.exit(1);
});
