import { simulateCycle, toLoggerCsv } from "../../../lib/simulator";
import { getJson, percentile } from "./client";
import { BenchStop } from "./server";
import type { CaseResult, Session } from "./index";

const UPLOADS = 20;
const HOUR_MS = 3_600_000;

type Sterilizer = { id: string; name: string; status: string; defaultProfileId: string | null };
type Profile = { id: string; sterilizationTempC: number; holdingTimeS: number };
export type Target = { sterilizerId: string; profileId: string; sterilizationTempC: number; holdingTimeS: number };

/** A sterilizer in use on the demo site and its default profile (one run at `tempC` when there is one): where the bench registers cycles. */
export async function uploadTarget({ url, cookie }: Session, tempC: number): Promise<Target> {
  const { items: sterilizers } = await getJson<{ items: Sterilizer[] }>(`${url}/api/sterilizers`, cookie);
  const { items: profiles } = await getJson<{ items: Profile[] }>(`${url}/api/profiles`, cookie);
  const targets = sterilizers.flatMap((s) => {
    const profile = profiles.find((p) => p.id === s.defaultProfileId);
    return s.status === "in-use" && profile ? [{ sterilizerId: s.id, profileId: profile.id, sterilizationTempC: profile.sterilizationTempC, holdingTimeS: profile.holdingTimeS }] : [];
  });
  const target = targets.find((t) => t.sterilizationTempC === tempC) ?? targets[0];
  if (!target) throw new BenchStop("No sterilizer of the demo site is in use with a default profile; the bench has nowhere to upload.");
  return target;
}

/** POST /api/cycles with one logger file, as a script sends it: multipart, the session cookie, an Idempotency-Key. */
export async function uploadCycle({ url, cookie }: Session, target: Target, file: { name: string; bytes: Uint8Array }, cycleNumber: string) {
  const form = new FormData();
  form.set("sterilizerId", target.sterilizerId);
  form.set("profileId", target.profileId);
  form.set("cycleNumber", cycleNumber);
  form.set("load", "Standard test pack (bench upload)");
  form.append("files", new Blob([file.bytes as BlobPart], { type: "text/csv" }), file.name);
  const started = performance.now();
  const res = await fetch(`${url}/api/cycles`, { method: "POST", body: form, headers: { Cookie: cookie, Origin: url, "Idempotency-Key": `bench-${cycleNumber}` } });
  const body = (await res.json().catch(() => ({}))) as { id?: string; error?: string };
  return { status: res.status, ms: performance.now() - started, id: body.id, error: body.error };
}

/** 20 realistic files from the simulator (a cycle each, 1 s samples, six probes, each its own seed) uploaded at once. */
export async function uploadsCase(session: Session, target: Target, runId: string): Promise<CaseResult> {
  const files = Array.from({ length: UPLOADS }, (_, i) => {
    const sim = simulateCycle({
      scenario: "pass",
      sterilizationTempC: target.sterilizationTempC + 0.6,
      holdingTimeS: target.holdingTimeS + 30,
      seed: 70_000 + i,
      startedAt: new Date(Date.now() - (i + 1) * HOUR_MS),
    });
    return { name: `bench-${runId}-${i + 1}.csv`, bytes: toLoggerCsv(sim) };
  });
  const started = performance.now();
  const answers = await Promise.all(files.map((file, i) => uploadCycle(session, target, file, `BENCH-${runId}-${String(i + 1).padStart(2, "0")}`)));
  const wallS = (performance.now() - started) / 1000;
  const created = answers.filter((a) => a.status === 201).length;
  const refused = answers.find((a) => a.status !== 201);
  const kib = Math.round(files.reduce((sum, f) => sum + f.bytes.length, 0) / files.length / 1024);
  return {
    rows: [
      [
        `  ${UPLOADS} concurrent uploads (POST /api/cycles, ~${kib} KiB each)`,
        `${created} of ${UPLOADS} created; ${wallS.toFixed(2)} s wall, p95 ${(
          percentile(
            answers.map((a) => a.ms),
            95,
          ) / 1000
        ).toFixed(2)} s`,
        "all 201",
        "",
        refused ? `FAILED: HTTP ${refused.status} ${refused.error ?? ""}`.trim() : "goal met",
      ],
    ],
    failed: created !== UPLOADS,
  };
}
