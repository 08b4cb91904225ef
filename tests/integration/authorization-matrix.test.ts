import { readdirSync } from "node:fs";
import path from "node:path";
import { afterAll, beforeAll, describe, expect, it, vi } from "vitest";
import { useTemporaryDatabase } from "../support/test-db";

/*
 * Who may call what, route by route and action by action: the README's role matrix as a table, checked against the
 * real handlers on a fresh database with a faked session. Every exported method of app/api/**\/route.ts and every
 * export of app/**\/actions.ts must have a row here, and every row must still exist, or the first test fails: a new
 * route or action is added to this table (DEVELOPERS.md, "The authorization matrix").
 *
 * "allowed" means the guard let the caller through: any answer but 401/403 (an empty request may well get 400, 404
 * or 422). Server actions answer with a form state; the guard's sentences tell 401 ("sign in") from 403 ("does not
 * allow").
 */

const session = vi.hoisted(() => ({ current: null as null | { user: { id: string } } }));
vi.mock("next-auth", async (original) => ({ ...(await original<typeof import("next-auth")>()), getServerSession: async () => session.current }));
vi.mock("next/cache", () => ({ revalidatePath: () => {} }));

const ROLES = ["technician", "engineer", "auditor", "admin"] as const;
type Who = (typeof ROLES)[number] | "anonymous";
type Outcome = "allowed" | 401 | 403;
type Row = Record<Who, Outcome> & { bearer?: Outcome; notCalled?: string };

/** The roles named may; every other role gets 403, nobody signed in 401. */
function only(...allowed: Array<(typeof ROLES)[number]>): Row {
  return { ...(Object.fromEntries(ROLES.map((r) => [r, allowed.includes(r) ? "allowed" : 403])) as Record<(typeof ROLES)[number], Outcome>), anonymous: 401 };
}
const everyRole = () => only(...ROLES);
const PUBLIC: Row = { technician: "allowed", engineer: "allowed", auditor: "allowed", admin: "allowed", anonymous: "allowed" };
const readers = () => only("technician", "engineer", "auditor");
const makers = () => only("technician", "engineer");

/** "METHOD /api/path" (folders as in app/api, [id] kept) → who gets what; `bearer`: a valid gateway token, no session. */
const ROUTES: Record<string, Row> = {
  "GET /api/attachments/[id]": readers(),
  "GET /api/audit/export": only("engineer", "auditor", "admin"),
  "GET /api/audit/extract": only("engineer", "auditor", "admin"),
  "GET /api/audit/verify": only("engineer", "auditor", "admin"),
  "GET /api/auth/[...nextauth]": { ...PUBLIC, notCalled: "NextAuth's own sign-in endpoints need Next's request scope; the browser tests sign in through them" },
  "POST /api/auth/[...nextauth]": { ...PUBLIC, notCalled: "NextAuth's own sign-in endpoints need Next's request scope; the browser tests sign in through them" },
  "GET /api/cycles": { ...readers(), bearer: 401 },
  "POST /api/cycles": { ...makers(), bearer: "allowed" },
  "GET /api/cycles/[id]": readers(),
  "POST /api/cycles/[id]/analyses": makers(),
  "POST /api/cycles/[id]/indicator-sheet": makers(),
  "GET /api/cycles/[id]/report": readers(),
  "GET /api/cycles/[id]/series": readers(),
  "POST /api/cycles/[id]/signatures": only("engineer"),
  "POST /api/cycles/[id]/submit": makers(),
  "GET /api/cycles/export": readers(),
  "GET /api/dev/mailbox": only("admin"),
  "GET /api/health": PUBLIC,
  "GET /api/instruments": { ...readers(), bearer: 401 },
  "POST /api/logger-files/inspect": makers(),
  "GET /api/periodic-tests/[id]": readers(),
  "POST /api/periodic-tests/[id]/signatures": only("engineer"),
  "GET /api/profiles": { ...readers(), bearer: "allowed" },
  "GET /api/reports/[id]": only("engineer", "auditor"),
  "POST /api/reports/verify": everyRole(),
  "GET /api/steam/saturation": everyRole(),
  "GET /api/sterilizers": { ...readers(), bearer: "allowed" },
  "POST /api/sterilizers/[id]/status": only("engineer"),
  // Qualification studies (issue 14): read as cycles; engineers plan and sign; technicians and engineers attach runs and record evidence.
  "GET /api/studies": readers(),
  "POST /api/studies": only("engineer"),
  "GET /api/studies/[id]": readers(),
  "PATCH /api/studies/[id]": only("engineer"),
  "GET /api/studies/[id]/runs": readers(),
  "POST /api/studies/[id]/runs": makers(),
  "GET /api/studies/[id]/sensor-map": readers(),
  "GET /api/studies/[id]/indicators": readers(),
  "POST /api/studies/[id]/indicators": makers(),
  "GET /api/studies/[id]/deviations": readers(),
  "POST /api/studies/[id]/deviations": makers(),
  "PATCH /api/studies/[id]/deviations/[deviationId]": makers(),
  "POST /api/studies/[id]/signatures": only("engineer"),
};

/** "/folder exportName" of app/**\/actions.ts (route groups left out) → who gets what. */
const ACTIONS: Record<string, Row> = {
  "/account/password changeOwnPasswordAction": everyRole(),
  "/admin/mail retryMailAction": only("admin"),
  "/admin/mail sendDueMailAction": only("admin"),
  "/admin/site updateSiteAction": only("admin"),
  "/admin/users createUserAction": only("admin"),
  "/admin/users updateUserAction": only("admin"),
  "/admin/users resetPasswordAction": only("admin"),
  "/admin/users unlockUserAction": only("admin"),
  "/instruments createInstrumentAction": only("engineer"),
  "/instruments addCertificateAction": only("engineer"),
  "/instruments clearMappingAction": only("engineer"),
  "/periodic-tests recordAirLeakageAction": makers(),
  "/periodic-tests recordBowieDickAction": makers(),
  "/periodic-tests recordNonCondensableGasAction": makers(),
  "/periodic-tests recordSuperheatAction": makers(),
  "/periodic-tests recordDrynessAction": makers(),
  "/profiles createProfileAction": only("engineer"),
  "/profiles updateProfileAction": only("engineer"),
  "/sterilizers createSterilizerAction": only("engineer"),
  "/sterilizers updateSterilizerAction": only("engineer"),
  "/sterilizers saveScheduleAction": only("engineer"),
  "/sterilizers removeScheduleAction": only("engineer"),
  "/sterilizers setSterilizerStatusAction": only("engineer"),
  "/sterilizers/[id] setPatternRequiredBeforeUseAction": only("engineer"),
  "/tokens issueApiTokenAction": only("engineer", "admin"),
  "/tokens revokeApiTokenAction": only("engineer", "admin"),
};

const HTTP_METHODS = ["GET", "HEAD", "POST", "PUT", "PATCH", "DELETE", "OPTIONS"];
const APP = path.join(import.meta.dirname, "../../app");

function filesNamed(dir: string, name: string): string[] {
  return readdirSync(dir, { withFileTypes: true }).flatMap((entry) => {
    const full = path.join(dir, entry.name);
    if (entry.isDirectory()) return filesNamed(full, name);
    return entry.name === name ? [full] : [];
  });
}

const folderOf = (file: string) => "/" + path.relative(APP, path.dirname(file)).split(path.sep).join("/");
const withoutGroups = (folder: string) => folder.replace(/\/\([^/)]+\)/g, "") || "/";
type Module = Record<string, unknown>;
const load = (file: string) => import(/* @vite-ignore */ file) as Promise<Module>;

const routeFiles = new Map(filesNamed(path.join(APP, "api"), "route.ts").map((file) => [folderOf(file), file]));
const actionFiles = new Map(filesNamed(APP, "actions.ts").map((file) => [withoutGroups(folderOf(file)), file]));

let ctx: Awaited<ReturnType<typeof useTemporaryDatabase>>;
const userIds: Partial<Record<Who, string>> = {};
let gatewayToken = "";

beforeAll(async () => {
  ctx = await useTemporaryDatabase();
  const { sites, users } = await import("@/db/schema");
  const [site] = await ctx.db.insert(sites).values({ name: "Matrix site", code: "MX" }).returning();
  for (const role of ROLES) {
    const [u] = await ctx.db
      .insert(users)
      .values({ email: `${role}@matrix.example`, name: role, role, passwordHash: "not used", siteId: site.id })
      .returning();
    userIds[role] = u.id;
  }
  const { issueApiToken } = await import("@/lib/services/api-tokens");
  const engineer = { id: userIds.engineer!, email: "engineer@matrix.example", name: "engineer", role: "engineer" as const, siteId: site.id };
  gatewayToken = (await issueApiToken({ actor: engineer, input: { name: "Matrix gateway", expiresInDays: 1, sterilizerIds: [] } })).token;
}, 120_000);
afterAll(() => ctx.cleanup());

function actAs(who: Who) {
  session.current = who === "anonymous" ? null : { user: { id: userIds[who]! } };
}

/** Calls a route handler with an empty request; params filled with a made-up id. */
async function callRoute(key: string, who: Who | "bearer"): Promise<number> {
  const [method, folder] = key.split(" ");
  const handler = (await load(routeFiles.get(folder)!))[method] as (request: Request, context: unknown) => Promise<Response>;
  const id = "00000000-0000-4000-8000-000000000000";
  const url = `http://papin.test${folder.replace("[id]", id)}`;
  const headers: Record<string, string> = who === "bearer" ? { authorization: `Bearer ${gatewayToken}` } : {};
  actAs(who === "bearer" ? "anonymous" : who);
  const response = await handler(new Request(url, { method, headers }), { params: Promise.resolve({ id }) });
  return response.status;
}

/** Calls a server action with an empty form; its form state says whether the guard refused. */
async function callAction(key: string, who: Who): Promise<Outcome> {
  const [folder, name] = key.split(" ");
  const action = (await load(actionFiles.get(folder)!))[name] as (state: unknown, form: FormData) => Promise<{ status: string; message?: string }>;
  actAs(who);
  const state = await action({ status: "idle" }, new FormData());
  if (state.status === "error" && /sign in/i.test(state.message ?? "")) return 401;
  if (state.status === "error" && /does not allow/i.test(state.message ?? "")) return 403;
  return "allowed";
}

const outcomeOf = (status: number): Outcome => (status === 401 || status === 403 ? status : "allowed");
const columns = (row: Row): Array<Who | "bearer"> => [...ROLES, "anonymous", ...(row.bearer === undefined ? [] : (["bearer"] as const))];
const expected = (row: Row) => Object.fromEntries(columns(row).map((who) => [who, row[who as Who | "bearer"] as Outcome]));

describe("the authorization matrix covers every route and server action", () => {
  it("has a row for each exported route method and action, and none for one that is gone", async () => {
    const found: string[] = [];
    for (const [folder, file] of routeFiles) for (const name of Object.keys(await load(file))) if (HTTP_METHODS.includes(name)) found.push(`${name} ${folder}`);
    for (const [folder, file] of actionFiles) for (const [name, value] of Object.entries(await load(file))) if (typeof value === "function") found.push(`${folder} ${name}`);
    const rows = [...Object.keys(ROUTES), ...Object.keys(ACTIONS)];
    expect(found.filter((key) => !rows.includes(key)).sort(), "routes or actions without a row in the matrix").toEqual([]);
    expect(rows.filter((key) => !found.includes(key)).sort(), "rows for routes or actions that no longer exist").toEqual([]);
  });

  it("names the three gateway routes with a bearer column, and at least one other route refusing a token", () => {
    const withBearer = Object.entries(ROUTES).filter(([, row]) => row.bearer !== undefined);
    expect(withBearer.filter(([, row]) => row.bearer === "allowed").map(([key]) => key)).toEqual(["POST /api/cycles", "GET /api/profiles", "GET /api/sterilizers"]);
    expect(withBearer.some(([, row]) => row.bearer === 401)).toBe(true);
  });
});

describe("route handlers answer each role as the table says", () => {
  for (const [key, row] of Object.entries(ROUTES)) {
    it.skipIf(row.notCalled !== undefined)(key, async () => {
      const observed: Record<string, Outcome> = {};
      for (const who of columns(row)) observed[who] = outcomeOf(await callRoute(key, who));
      expect(observed).toEqual(expected(row));
    });
  }
});

describe("server actions answer each role as the table says", () => {
  for (const [key, row] of Object.entries(ACTIONS)) {
    it(key, async () => {
      const observed: Record<string, Outcome> = {};
      for (const who of columns(row)) observed[who] = await callAction(key, who as Who);
      expect(observed).toEqual(expected(row));
    });
  }
});
