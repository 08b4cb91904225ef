/**
 * The qualification-study API as the tests call it (route handlers, the session mocked by the test file), with signed
 * cycles to attach made through the real upload and sign-off routes.
 */
import { loggerFile, REVIEW_PASSWORD, type reviewFlow, type ReviewSite, type Session } from "./review-flow";

const URL_BASE = "http://papin.test";
const json = (body: unknown) => ({ method: "POST", body: JSON.stringify(body), headers: { "content-type": "application/json" } });

/** Three positions the simulator's placements name one each (lib/simulator/positions.ts): top, bottom and side of the pack. */
export const PACK_PATTERN = {
  name: "Textile pack, one per basket",
  description: "One standard textile pack on the middle shelf",
  loadType: "textiles",
  items: [{ name: "Textile pack 30 × 30 × 50 cm", quantity: 1 }],
  positions: [
    { id: "P1", label: "Pack top", sensorPosition: "pack-top" },
    { id: "P2", label: "Pack bottom", sensorPosition: "pack-bottom" },
    { id: "P3", label: "Pack side", sensorPosition: "pack-side" },
  ],
};

export function studyFlow(session: Session, site: ReviewSite, cycles: ReturnType<typeof reviewFlow>) {
  const as = (userId: string) => (session.current = { user: { id: userId } });
  const ctx = (id: string) => ({ params: Promise.resolve({ id }) });

  async function create(asUser: string, body: Record<string, unknown>) {
    const { POST } = await import("@/app/api/studies/route");
    as(asUser);
    return POST(
      new Request(`${URL_BASE}/api/studies`, json({ sterilizerId: site.sterilizerId, profileId: site.profileId, kind: "heat-penetration", loadingPattern: PACK_PATTERN, ...body })),
      undefined,
    );
  }

  async function createId(asUser: string, body: Record<string, unknown> = {}) {
    const res = await create(asUser, body);
    if (res.status !== 201) throw new Error(`create answered ${res.status}: ${await res.text()}`);
    return (await res.json()).id as string;
  }

  async function get(id: string, asUser: string) {
    const { GET } = await import("@/app/api/studies/[id]/route");
    as(asUser);
    return GET(new Request(`${URL_BASE}/api/studies/${id}`), ctx(id));
  }

  async function detail(id: string, asUser: string) {
    const res = await get(id, asUser);
    if (res.status !== 200) throw new Error(`detail answered ${res.status}: ${await res.text()}`);
    return res.json();
  }

  async function attach(id: string, asUser: string, body: Record<string, unknown>) {
    const { POST } = await import("@/app/api/studies/[id]/runs/route");
    as(asUser);
    return POST(new Request(`${URL_BASE}/api/studies/${id}/runs`, json(body)), ctx(id));
  }

  async function sign(id: string, asUser: string, body: Record<string, unknown>) {
    const { POST } = await import("@/app/api/studies/[id]/signatures/route");
    as(asUser);
    return POST(new Request(`${URL_BASE}/api/studies/${id}/signatures`, json({ password: REVIEW_PASSWORD, ...body })), ctx(id));
  }

  async function indicator(id: string, asUser: string, body: Record<string, unknown>) {
    const { POST } = await import("@/app/api/studies/[id]/indicators/route");
    as(asUser);
    return POST(new Request(`${URL_BASE}/api/studies/${id}/indicators`, json(body)), ctx(id));
  }

  async function raise(id: string, asUser: string, body: Record<string, unknown>) {
    const { POST } = await import("@/app/api/studies/[id]/deviations/route");
    as(asUser);
    return POST(new Request(`${URL_BASE}/api/studies/${id}/deviations`, json(body)), ctx(id));
  }

  async function patchDeviation(id: string, deviationId: string, asUser: string, body: Record<string, unknown>) {
    const { PATCH } = await import("@/app/api/studies/[id]/deviations/[deviationId]/route");
    as(asUser);
    return PATCH(new Request(`${URL_BASE}/api/studies/${id}/deviations/${deviationId}`, { ...json(body), method: "PATCH" }), { params: Promise.resolve({ id, deviationId }) });
  }

  /** A cycle registered by the technician and signed by the engineer: approved ("pass") or failure-confirmed ("air"). */
  async function signedCycle(scenario: "pass" | "air" = "pass", signer = site.people.engineer) {
    const id = await cycles.register(site.people.technician, { bytes: await loggerFile({ scenario }) });
    await cycles.submit(id, site.people.technician);
    const res = await cycles.sign(id, signer, { meaning: scenario === "pass" ? "approved" : "failure-confirmed", reason: scenario === "pass" ? undefined : "Air in the chamber." });
    if (res.status !== 201) throw new Error(`cycle sign-off answered ${res.status}: ${await res.text()}`);
    return id;
  }

  return { create, createId, get, detail, attach, sign, indicator, raise, patchDeviation, signedCycle };
}
