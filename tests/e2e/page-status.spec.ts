import type { APIRequestContext } from "@playwright/test";
import { DEMO, DEMO_PASSWORD, expect, test, type DemoRole } from "./fixtures";

/** Signs in the way scripts do (csrf, then the credentials callback); the context keeps the cookie. */
async function signedIn(request: APIRequestContext, role: DemoRole) {
  const { csrfToken } = await (await request.get("/api/auth/csrf")).json();
  const res = await request.post("/api/auth/callback/credentials", { form: { csrfToken, email: DEMO[role].email, password: DEMO_PASSWORD, json: "true" } });
  expect(res.status()).toBeLessThan(400);
  return request;
}

const status = async (request: APIRequestContext, path: string) => (await request.get(path, { maxRedirects: 0 })).status();

// The record page has a loading skeleton; its guard and existence check run above it, so the
// answer is a real status, not 200 with an error screen streamed after the skeleton.
test("cycle record and review queue answer real 404 and 403 statuses", async ({ playwright, baseURL }) => {
  const open = () => playwright.request.newContext({ baseURL });
  const engineer = await signedIn(await open(), "engineer");
  const { items } = await (await engineer.get("/api/cycles?pageSize=1")).json();
  const record = `/cycles/${items[0].id}`;
  expect(await status(engineer, record)).toBe(200);
  expect(await status(engineer, "/cycles/00000000-0000-0000-0000-000000000000")).toBe(404);
  expect(await status(engineer, "/review")).toBe(200);

  const auditor = await signedIn(await open(), "auditor");
  expect(await status(auditor, record)).toBe(200);
  expect(await status(auditor, "/review")).toBe(403);

  const admin = await signedIn(await open(), "admin");
  expect(await status(admin, record)).toBe(403);
  expect(await status(admin, "/cycles/00000000-0000-0000-0000-000000000000")).toBe(403);
});
