import { test as base, expect, type Page } from "@playwright/test";

export const DEMO_PASSWORD = process.env.PAPIN_DEMO_PASSWORD ?? "papin-demo";
export const DEMO = {
  technician: { email: "technician@papin.example", name: "Tomás Reid" },
  engineer: { email: "engineer@papin.example", name: "Amara Osei" },
  auditor: { email: "auditor@papin.example", name: "Helen Varga" },
  admin: { email: "admin@papin.example", name: "Sam Okafor" },
} as const;
export type DemoRole = keyof typeof DEMO;

/** Signs in through the form; with the right password, waits until the overview has loaded. */
export async function signIn(page: Page, role: DemoRole, password = DEMO_PASSWORD) {
  await page.goto("/sign-in");
  await page.getByLabel("E-mail").fill(DEMO[role].email);
  await page.getByLabel("Password").fill(password);
  await page.getByRole("button", { name: "Sign in" }).click();
  if (password === DEMO_PASSWORD) await expect(page.getByRole("heading", { name: `Welcome, ${DEMO[role].name}` })).toBeVisible();
}

export const test = base;
export { expect };
