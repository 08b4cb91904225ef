import { readFileSync } from "node:fs";
import { expect, signIn, test } from "./fixtures";

/*
 * An engineer reads the site's audit trail: finds an approval among the demo's signed cycles,
 * narrows the trail to that cycle by its number, reads the approval in words and downloads the
 * filtered events as CSV. Nothing is approved here; the demo site's own approvals are read.
 */
test("an engineer filters the audit trail by a cycle, reads its approval in words and downloads the CSV", async ({ page }) => {
  await signIn(page, "engineer");
  await page.goto("/audit");
  await expect(page.getByRole("heading", { name: "Audit ledger" })).toBeVisible();
  await expect(page.getByTestId("chain-state")).toContainText("Chain intact");

  await page.getByLabel("Action").selectOption({ label: "Approved a cycle" });
  await page.getByRole("button", { name: "Filter" }).click();
  await expect(page).toHaveURL(/action=cycle\.sign\.approved/);
  const approval = ((await page.getByTestId("audit-what").first().textContent()) ?? "").trim();
  const cycleNumber = /^approved cycle (\S+)$/.exec(approval)?.[1];
  expect(cycleNumber, "an approval of a demo cycle in words").toBeTruthy();

  await page.getByLabel("Action").selectOption("");
  await page.getByLabel("Record (cycle number or id)").fill(cycleNumber!);
  await page.getByRole("button", { name: "Filter" }).click();
  await expect(page).toHaveURL(new RegExp(`record=${encodeURIComponent(cycleNumber!)}`));
  const events = page.getByTestId("audit-event");
  await expect(events.filter({ hasText: `approved cycle ${cycleNumber}` })).toHaveCount(1);
  await expect(events.filter({ hasText: `registered and analysed cycle ${cycleNumber}` })).toHaveCount(1);
  await expect(events.filter({ hasText: `approved cycle ${cycleNumber}` }).getByRole("link", { name: `Open the cycle ${cycleNumber}` })).toBeVisible();
  await expect(page.getByTestId("audit-events")).not.toContainText("[object Object]");

  const downloading = page.waitForEvent("download");
  await page.getByTestId("export-csv").click();
  const download = await downloading;
  expect(download.suggestedFilename()).toMatch(/^papin-audit-trail-\d{8}-\d{6}\.csv$/);
  const csv = readFileSync((await download.path())!, "utf8");
  expect(csv.split("\r\n")[0]).toBe("\uFEFFsequence,UTC time,site time,person,role,action,record,reason,old,new,event hash");
  expect(csv).toContain(`approved cycle ${cycleNumber}`);
  expect(csv).toContain("Validation engineer");
});
