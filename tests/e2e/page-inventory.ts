import type { Page } from "@playwright/test";
import { can, type Permission } from "@/lib/auth/permissions";
import type { DemoRole } from "./fixtures";

/**
 * Every page of the portal, with the permission its guard asks for. The layout and accessibility
 * checks walk this list for every role; a new page belongs here (the test below fails otherwise).
 * A detail page is reached through the first matching link on its list page, so the ids come from
 * the demo site itself.
 */
export type PortalPage = { path: string; permission?: Permission; detail?: { list: string; link: RegExp } };

export const PORTAL_PAGES: PortalPage[] = [
  { path: "/" },
  { path: "/cycles", permission: "cycle:read" },
  { path: "/cycles/new", permission: "cycle:create" },
  { path: "/cycles/[id]", permission: "cycle:read", detail: { list: "/cycles", link: /^\/cycles\/[0-9a-f-]{36}$/ } },
  { path: "/review", permission: "review:queue" },
  { path: "/archive" },
  { path: "/sterilizers", permission: "equipment:read" },
  { path: "/sterilizers/[id]", permission: "equipment:read", detail: { list: "/sterilizers", link: /^\/sterilizers\/[0-9a-f-]{36}$/ } },
  { path: "/profiles", permission: "equipment:read" },
  { path: "/profiles/[id]", permission: "equipment:read", detail: { list: "/profiles", link: /^\/profiles\/[0-9a-f-]{36}$/ } },
  { path: "/instruments", permission: "equipment:read" },
  { path: "/instruments/[id]", permission: "equipment:read", detail: { list: "/instruments", link: /^\/instruments\/[0-9a-f-]{36}$/ } },
  { path: "/periodic-tests", permission: "equipment:read" },
  { path: "/periodic-tests/new", permission: "periodic-test:record" },
  { path: "/periodic-tests/[id]", permission: "equipment:read", detail: { list: "/periodic-tests", link: /^\/periodic-tests\/[0-9a-f-]{36}$/ } },
  { path: "/studies", permission: "study:read" },
  { path: "/studies/new", permission: "study:plan" },
  { path: "/studies/[id]", permission: "study:read", detail: { list: "/studies", link: /^\/studies\/[0-9a-f-]{36}$/ } },
  { path: "/steam", permission: "steam:calculate" },
  { path: "/audit", permission: "audit:read" },
  { path: "/tokens", permission: "api-token:manage" },
  { path: "/admin/users", permission: "users:manage" },
  { path: "/admin/site", permission: "settings:manage" },
  { path: "/admin/mail", permission: "mail:read-outbox" },
  { path: "/account/password", permission: "account:own-password" },
  { path: "/safety" },
];

/** Pages outside the signed-in portal. */
export const PUBLIC_PAGES = ["/sign-in", "/safety"];

export const pagesOf = (role: DemoRole) => PORTAL_PAGES.filter((p) => !p.permission || can(role, p.permission));

/** The address to open for a page: itself, or the first record linked from its list page. */
export async function resolvePath(page: Page, entry: PortalPage): Promise<string> {
  if (!entry.detail) return entry.path;
  await page.goto(entry.detail.list);
  // Some lists (the cycles) render their rows in the browser after the page: wait for a matching link.
  await page
    .waitForFunction((source) => [...document.querySelectorAll("a[href]")].some((a) => new RegExp(source).test(a.getAttribute("href") ?? "")), entry.detail.link.source, { timeout: 15_000 })
    .catch(() => undefined);
  const hrefs = await page.locator("a[href]").evaluateAll((links) => links.map((a) => a.getAttribute("href") ?? ""));
  const href = hrefs.find((h) => entry.detail!.link.test(h));
  if (!href) throw new Error(`No link to ${entry.path} on ${entry.detail.list}`);
  return href;
}
