import { DEMO, expect, signIn, test } from "./fixtures";
import { mkdirSync } from "node:fs";

const shots = "test-results/screenshots";
mkdirSync(shots, { recursive: true });

test("an anonymous visitor is sent to sign-in", async ({ page }) => {
  await page.goto("/cycles");
  await expect(page).toHaveURL(/\/sign-in/);
  await expect(page.getByRole("heading", { name: "Sign in" })).toBeVisible();
  await expect(page.getByTestId("demo-accounts")).toContainText("technician@papin.example");
  await page.screenshot({ path: `${shots}/sign-in.png`, fullPage: true });
});

test("a wrong password gets a clear message and no session", async ({ page }) => {
  await signIn(page, "engineer", "not-the-password");
  await expect(page.getByText("That e-mail and password do not match an account.")).toBeVisible();
  await page.goto("/");
  await expect(page).toHaveURL(/\/sign-in/);
});

for (const role of Object.keys(DEMO) as Array<keyof typeof DEMO>) {
  test(`the ${role} signs in and sees their overview`, async ({ page }) => {
    await signIn(page, role);
    await expect(page.getByRole("heading", { name: `Welcome, ${DEMO[role].name}` })).toBeVisible();
    await expect(page.getByTestId("signed-in-name")).toHaveText(DEMO[role].name);
    await expect(page.getByRole("link", { name: "Read the safety notes" })).toBeVisible();
    await page.screenshot({ path: `${shots}/home-${role}.png`, fullPage: true });
  });
}

test("a technician opening the admin page is refused by the server", async ({ page }) => {
  await signIn(page, "technician");
  await expect(page.getByRole("heading", { name: /Welcome/ })).toBeVisible();
  await expect(page.getByRole("link", { name: "Users" })).toHaveCount(0);
  const response = await page.goto("/admin/users");
  expect(response?.status()).toBe(403);
  await expect(page.getByTestId("forbidden")).toBeVisible();
  await expect(page.getByTestId("users-table")).toHaveCount(0);
});

test("the admin sees the user list and the server answers the health check", async ({ page, request }) => {
  await signIn(page, "admin");
  await page.goto("/admin/users");
  await expect(page.getByTestId("users-table")).toContainText("auditor@papin.example");
  const health = await request.get("/api/health");
  expect(await health.json()).toMatchObject({ ok: true });
});
