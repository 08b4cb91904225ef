import { mkdirSync } from "node:fs";
import type { Page } from "@playwright/test";
import { DEMO, expect, signIn, test, type DemoRole } from "./fixtures";
import { pagesOf, PUBLIC_PAGES, resolvePath } from "./page-inventory";

// Phone, tablet and desktop: a technician at the sterilizer, a tablet on the trolley, the office.
const SIZES = [
  { width: 390, height: 844 },
  { width: 768, height: 1024 },
  { width: 1440, height: 900 },
];
const shots = "test-results/layout";
mkdirSync(shots, { recursive: true });

const slug = (path: string) => (path === "/" ? "overview" : path.replace(/[^a-z0-9]+/gi, "-").replace(/^-|-$/g, ""));

/** Opens a page and waits until it has settled: loaded, no requests in flight, fonts in place. */
async function openSettled(page: Page, path: string) {
  const response = await page.goto(path, { waitUntil: "load" });
  expect(response?.status(), `${path} answered ${response?.status()}`).toBeLessThan(400);
  await page.waitForLoadState("networkidle");
  await page.evaluate(() => document.fonts.ready.then(() => undefined));
}

/** How far the page scrolls sideways, and the widest elements that stick out past the window's right edge. */
async function sidewaysOverflow(page: Page) {
  return page.evaluate(() => {
    const viewportPx = window.innerWidth;
    const overflowPx = document.scrollingElement!.scrollWidth - viewportPx;
    const describe = (el: Element) => {
      const id = el.id ? `#${el.id}` : "";
      const testId = el.getAttribute("data-testid") ? `[data-testid=${el.getAttribute("data-testid")}]` : "";
      const cls = typeof el.className === "string" && el.className ? `.${el.className.trim().split(/\s+/).slice(0, 4).join(".")}` : "";
      const text = (el.textContent ?? "").trim().replace(/\s+/g, " ").slice(0, 40);
      return `${el.tagName.toLowerCase()}${id}${testId}${cls} right=${Math.round(el.getBoundingClientRect().right)}px "${text}"`;
    };
    const sticksOut = (el: Element) => el.getBoundingClientRect().right > viewportPx + 0.5 && el.getBoundingClientRect().width > 0;
    // Content of a frame that scrolls (or clips) by itself inside the window does not move the page.
    const framed = (el: Element) => {
      for (let up = el.parentElement; up && up !== document.body; up = up.parentElement) {
        if (getComputedStyle(up).overflowX !== "visible" && !sticksOut(up)) return true;
      }
      return false;
    };
    // Innermost offenders first: an element sticking out whose children all stay inside is the cause.
    const offenders = [...document.body.querySelectorAll("*")]
      .filter((el) => sticksOut(el) && !framed(el))
      .filter((el) => ![...el.children].some(sticksOut))
      .sort((a, b) => b.getBoundingClientRect().right - a.getBoundingClientRect().right)
      .slice(0, 5)
      .map(describe);
    return { overflowPx, offenders };
  });
}

async function checkPage(page: Page, who: string, width: number, path: string, name: string) {
  await openSettled(page, path);
  const { overflowPx, offenders } = await sidewaysOverflow(page);
  await page.screenshot({ path: `${shots}/${who}-${width}-${slug(name)}.png`, fullPage: true });
  expect.soft(overflowPx, `${name} (${path}) as ${who} at ${width} px scrolls sideways by ${overflowPx} px; widest offenders:\n  ${offenders.join("\n  ")}`).toBeLessThanOrEqual(0);
}

// One test per role and size, each with its own sign-in, so a slow machine stays inside the timeout.
for (const role of Object.keys(DEMO) as DemoRole[]) {
  for (const size of SIZES) {
    test(`every page fits the screen for the ${role} at ${size.width} px`, async ({ page }) => {
      test.setTimeout(300_000);
      await page.setViewportSize(size);
      await signIn(page, role);
      for (const entry of pagesOf(role)) await checkPage(page, role, size.width, await resolvePath(page, entry), entry.path);
    });
  }
}

test("the public pages fit the screen at 390, 768 and 1440 px signed out", async ({ page }) => {
  for (const size of SIZES) {
    await page.setViewportSize(size);
    for (const path of PUBLIC_PAGES) await checkPage(page, "public", size.width, path, path);
  }
});

test("on a phone the navigation folds into a menu button that the keyboard opens and Escape closes", async ({ page }) => {
  await page.setViewportSize(SIZES[0]);
  await signIn(page, "technician");
  const menu = page.getByRole("button", { name: "Menu" });
  const cycles = page.getByRole("navigation", { name: "Main" }).getByRole("link", { name: "Cycles", exact: true });
  await expect(menu).toHaveAttribute("aria-expanded", "false");
  await expect(cycles).toBeHidden();
  await menu.focus();
  await page.keyboard.press("Enter");
  await expect(menu).toHaveAttribute("aria-expanded", "true");
  await expect(cycles).toBeVisible();
  await page.keyboard.press("Escape");
  await expect(menu).toHaveAttribute("aria-expanded", "false");
  await expect(menu).toBeFocused();
  await menu.click();
  await cycles.click();
  await expect(page).toHaveURL(/\/cycles$/);
  await expect(menu).toHaveAttribute("aria-expanded", "false");
});
