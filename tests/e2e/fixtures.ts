import { test as base, expect, type Page } from "@playwright/test";

export const DEMO_PASSWORD = process.env.PAPIN_DEMO_PASSWORD ?? "papin-demo";
export const DEMO = {
  technician: { email: "technician@papin.example", name: "Tomás Reid" },
  engineer: { email: "engineer@papin.example", name: "Amara Osei" },
  auditor: { email: "auditor@papin.example", name: "Helen Varga" },
  admin: { email: "admin@papin.example", name: "Sam Okafor" },
} as const;
export type DemoRole = keyof typeof DEMO;

export async function signIn(page: Page, role: DemoRole, password = DEMO_PASSWORD) {
  await page.goto("/sign-in");
  await page.getByLabel("E-mail").fill(DEMO[role].email);
  await page.getByLabel("Password").fill(password);
  await page.getByRole("button", { name: "Sign in" }).click();
}

export const test = base;
export { expect };
