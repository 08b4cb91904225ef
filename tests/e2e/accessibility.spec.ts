import AxeBuilder from "@axe-core/playwright";
import type { Page } from "@playwright/test";
import { DEMO, expect, signIn, test, type DemoRole } from "./fixtures";
import { PUBLIC_PAGES, pagesOf, resolvePath } from "./page-inventory";

/**
 * axe-core on every page for every role, with the WCAG 2.1 A and AA rules. A serious or critical
 * violation fails the test; the message names the page, the rule, its help text and the first
 * elements it found (for contrast, the colours and ratio), so the fix can start from the failure alone.
 */
const WCAG_TAGS = ["wcag2a", "wcag2aa", "wcag21a", "wcag21aa"];
const DESKTOP = { width: 1440, height: 900 };
const PHONE = { width: 390, height: 844 };

async function violationsOf(page: Page, where: string): Promise<string[]> {
  const { violations } = await new AxeBuilder({ page }).withTags(WCAG_TAGS).analyze();
  return violations
    .filter((v) => v.impact === "serious" || v.impact === "critical")
    .map((v) => {
      const targets = v.nodes.slice(0, 3).map((n) => n.target.join(" "));
      const detail = v.nodes[0]?.any[0]?.message ?? "";
      return `${where}: [${v.impact}] ${v.id} — ${v.help} (${v.nodes.length}×: ${targets.join(" | ")}) ${detail}`;
    });
}

/** Opens a page and lets it settle (data fetched in the browser, charts drawn), so axe sees what a reader sees. */
async function open(page: Page, path: string) {
  const response = await page.goto(path);
  expect(response?.status(), `${path} answers`).toBeLessThan(400);
  // A page that polls never goes quiet: settle for at most a few seconds, then check what is there.
  await page.waitForLoadState("networkidle", { timeout: 8_000 }).catch(() => undefined);
  await expect(page.locator("[aria-busy=true]")).toHaveCount(0, { timeout: 15_000 });
}

const report = (found: string[]) => (found.length === 0 ? "" : `\n${found.join("\n")}\n`);

/**
 * Presses Tab `presses` times and describes each element that took the focus, with whether a focus
 * indicator is drawn (an outline or a ring): what a keyboard user sees, step by step.
 */
async function tabThrough(page: Page, presses: number) {
  const steps: Array<{ name: string; visible: boolean }> = [];
  for (let i = 0; i < presses; i++) {
    await page.keyboard.press("Tab");
    steps.push(
      await page.evaluate(() => {
        const el = document.activeElement as HTMLElement | null;
        if (!el || el === document.body) return { name: "(page)", visible: true };
        const style = getComputedStyle(el);
        const outlined = style.outlineStyle !== "none" && parseFloat(style.outlineWidth) > 0;
        const ringed = style.boxShadow !== "none";
        const name = el.getAttribute("aria-label") ?? (el as HTMLInputElement).labels?.[0]?.textContent ?? el.textContent ?? "";
        return { name: `${el.tagName.toLowerCase()} "${name.trim().slice(0, 60)}"`, visible: outlined || ringed };
      }),
    );
  }
  return steps;
}

test.describe("accessibility (axe, WCAG 2.1 A/AA, serious and critical)", () => {
  test("signed-out pages", async ({ page }) => {
    test.setTimeout(180_000);
    const found: string[] = [];
    for (const viewport of [DESKTOP, PHONE]) {
      await page.setViewportSize(viewport);
      for (const path of PUBLIC_PAGES) {
        await open(page, path);
        found.push(...(await violationsOf(page, `${path} @${viewport.width}`)));
      }
    }
    expect(report(found)).toBe("");
  });

  for (const role of Object.keys(DEMO) as DemoRole[]) {
    // Each page is its own soft check, so one slow or failing page still reports all the others.
    test(`every page of the ${role}`, async ({ page }) => {
      test.setTimeout(600_000);
      await page.setViewportSize(DESKTOP);
      await signIn(page, role);
      for (const entry of pagesOf(role)) {
        const path = await resolvePath(page, entry);
        await open(page, path);
        expect.soft(report(await violationsOf(page, `${entry.path} @1440`)), entry.path).toBe("");
      }
      // The phone view folds the navigation into a menu: checked open, on the overview.
      await page.setViewportSize(PHONE);
      await open(page, "/");
      await page.getByText(/^Menu/).click();
      await expect(page.getByRole("navigation", { name: "Main" }).first()).toBeVisible();
      expect.soft(report(await violationsOf(page, "/ @390 menu open")), "/ @390").toBe("");
    });
  }

  test("the engineer's sign form on a submitted cycle record, with its error shown", async ({ page }) => {
    await page.setViewportSize(DESKTOP);
    await signIn(page, "engineer");
    await openSubmittedRecord(page);
    const signOff = page.getByTestId("sign-off");
    // A return without a reason is refused in the browser: the error shows without spending a password attempt.
    await signOff.getByLabel(/Returned for correction/).check();
    await signOff.getByRole("button", { name: "Sign" }).click();
    await expect(signOff.getByRole("alert")).toContainText("Give the reason for returning");
    expect(report(await violationsOf(page, "sign form with an error"))).toBe("");
  });
});

test.describe("keyboard", () => {
  test("the intake page: every control reached by Tab with a visible focus, and Tab leaves the form", async ({ page }) => {
    await page.setViewportSize(DESKTOP);
    await signIn(page, "technician");
    await open(page, "/cycles/new");
    const steps = await tabThrough(page, 60);
    const names = steps.map((s) => s.name).join("\n");
    expect(names, "the skip link comes first").toMatch(/^a "Skip to content"/);
    expect(names, "the drop area is reachable").toMatch(/Logger files: drop them here/);
    expect(names, "focus goes on past the form to the safety notice (no trap)").toMatch(/Read the safety notes/);
    expect(
      steps.filter((s) => !s.visible).map((s) => s.name),
      "elements focused without a visible indicator",
    ).toEqual([]);
  });

  test("the sign form: Tab goes through meaning, reason, password and Sign, then out, with a visible focus", async ({ page }) => {
    await page.setViewportSize(DESKTOP);
    await signIn(page, "engineer");
    await openSubmittedRecord(page);
    const signOff = page.getByTestId("sign-off");
    await signOff.getByLabel(/Returned for correction/).focus();
    const steps = await tabThrough(page, 5);
    const names = steps.map((s) => s.name);
    expect(names.slice(0, 3)).toEqual([expect.stringMatching(/^textarea "Reason/), expect.stringMatching(/^input "Your password/), 'button "Sign"']);
    expect(await signOff.evaluate((form) => form.contains(document.activeElement)), "Tab leaves the sign form").toBe(false);
    expect(
      steps.filter((s) => !s.visible).map((s) => s.name),
      "elements focused without a visible indicator",
    ).toEqual([]);
  });
});

async function openSubmittedRecord(page: Page) {
  const list = await (await page.request.get("/api/cycles?status=submitted&pageSize=1")).json();
  expect(list.total, "the demo site has a submitted cycle").toBeGreaterThan(0);
  await open(page, `/cycles/${list.items[0].id}`);
}
