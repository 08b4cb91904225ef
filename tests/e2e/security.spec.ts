import type { ConsoleMessage, Page } from "@playwright/test";
import { expect, signIn, test } from "./fixtures";

/** Collects what the browser says about refused content (CSP) and uncaught page errors. */
function watch(page: Page) {
  const problems: string[] = [];
  page.on("console", (m: ConsoleMessage) => {
    if (m.type() === "error" || /Content Security Policy|Refused to/i.test(m.text())) problems.push(`${page.url()}: ${m.text()}`);
  });
  page.on("pageerror", (e) => problems.push(`${page.url()}: ${e.message}`));
  return problems;
}

test("every page and API answer carries the security headers", async ({ page, request }) => {
  const response = await page.goto("/sign-in");
  const headers = response!.headers();
  expect(headers["content-security-policy"]).toContain("frame-ancestors 'none'");
  expect(headers["content-security-policy"]).toContain("default-src 'self'");
  expect(headers["content-security-policy"]).toContain("object-src 'none'");
  expect(headers["x-content-type-options"]).toBe("nosniff");
  expect(headers["referrer-policy"]).toBe("same-origin");
  expect(headers["x-frame-options"]).toBe("DENY");

  const api = (await request.get("/api/health")).headers();
  expect(api["x-content-type-options"]).toBe("nosniff");
  expect(api["content-security-policy"]).toBe("frame-ancestors 'none'");
});

test("the policy refuses nothing Papin itself needs, on any page: chart, intake, steam table, mail preview", async ({ page }) => {
  test.setTimeout(120_000);
  const problems = watch(page);
  await signIn(page, "engineer");
  const { items } = await (await page.request.get("/api/cycles?pageSize=1&verdict=pass")).json();
  await page.goto(`/cycles/${items[0].id}`);
  await expect(page.locator("canvas").first()).toBeVisible();
  for (const path of ["/cycles", "/cycles/new", "/review", "/sterilizers", "/instruments", "/profiles", "/periodic-tests", "/periodic-tests/new", "/archive", "/steam", "/safety"]) {
    await page.goto(path);
    await page.waitForLoadState("networkidle");
  }
  await page.context().clearCookies();
  await signIn(page, "admin");
  for (const path of ["/admin/users", "/admin/site", "/admin/mail", "/audit"]) {
    await page.goto(path);
    await page.waitForLoadState("networkidle");
  }
  expect(problems).toEqual([]);
});

test("a signed-in visitor following /sign-in?callbackUrl=/%5Cevil.example/ stays on site", async ({ page, baseURL }) => {
  await signIn(page, "technician");
  await page.goto("/sign-in?callbackUrl=/%5Cevil.example/");
  expect(new URL(page.url()).origin).toBe(new URL(baseURL!).origin);
  await expect(page.getByRole("heading", { name: /Welcome/ })).toBeVisible();
});

test("signing in from a link with a foreign callback lands on the overview", async ({ page, baseURL }) => {
  await page.goto("/sign-in?callbackUrl=%2F%5Cevil.example%2F");
  await signIn(page, "auditor");
  expect(new URL(page.url()).origin).toBe(new URL(baseURL!).origin);
});

test("a server action posted from another site is refused with 403 and a plain sentence", async ({ request }) => {
  const foreign = await request.post("/admin/site", { headers: { "Next-Action": "7f3a0c", Origin: "https://evil.example", "Content-Type": "text/plain;charset=UTF-8" }, data: "[]", maxRedirects: 0 });
  expect(foreign.status()).toBe(403);
  expect(await foreign.text()).toMatch(/came from another site/);

  const crossSite = await request.post("/sign-in", { headers: { "Next-Action": "7f3a0c", "Sec-Fetch-Site": "cross-site", "Content-Type": "text/plain;charset=UTF-8" }, data: "[]", maxRedirects: 0 });
  expect(crossSite.status()).toBe(403);
});

test("a route handler refuses a foreign Origin with 403 and a JSON error", async ({ request }) => {
  const refused = await request.post("/api/reports/verify", {
    headers: { Origin: "https://evil.example" },
    multipart: { file: { name: "x.pdf", mimeType: "application/pdf", buffer: Buffer.from("%PDF-1.4") } },
  });
  expect(refused.status()).toBe(403);
  expect((await refused.json()).error).toMatch(/came from another site/);
});
