import { mkdirSync } from "node:fs";
import type { Page } from "@playwright/test";
import { DEMO, DEMO_PASSWORD, expect, signIn, test } from "./fixtures";
import { drawIndicatorSheetPng, type DrawnSheet } from "../../lib/simulator/indicator-sheet";

const shots = "test-results/screenshots";
mkdirSync(shots, { recursive: true });

// A vacuum sterilizer the demo leaves in use, with its required tests current (db/demo-story.ts).
const STERILIZER = "Porous load 1";

/** The value a datetime-local field takes: the browser's (this machine's) local clock, to the minute. */
const localInput = (d: Date) => {
  const pad = (n: number) => String(n).padStart(2, "0");
  return `${d.getFullYear()}-${pad(d.getMonth() + 1)}-${pad(d.getDate())}T${pad(d.getHours())}:${pad(d.getMinutes())}`;
};

async function recordBowieDick(page: Page, sheet: DrawnSheet, doneAt: Date, notes: string) {
  await page.goto("/periodic-tests/new?kind=bowie-dick");
  const form = page.getByRole("form", { name: "Record a Bowie-Dick test" });
  await form.getByLabel("Sterilizer").selectOption({ label: `${STERILIZER} (MB-PL-0417)` });
  await expect(form.getByLabel("Done at (your local time)")).not.toHaveValue("");
  await form.getByLabel("Done at (your local time)").fill(localInput(doneAt));
  await form.getByLabel(sheet === "uniform" ? /Uniform colour change/ : /Not uniform/).check();
  await form.getByLabel("Indicator lot").fill("E2E-LOT-7");
  // The photo goes in through the dropzone's own file input.
  await page.getByTestId("indicator-photo-input").setInputFiles({ name: `sheet-${sheet}.png`, mimeType: "image/png", buffer: Buffer.from(drawIndicatorSheetPng(sheet)) });
  await expect(page.getByTestId("indicator-photo-drop").getByRole("img", { name: /Preview of the chosen indicator sheet/ })).toBeVisible();
  await form.getByLabel("Notes (optional)").fill(notes);
  await form.getByRole("button", { name: "Save test record" }).click();
  await expect(form.getByRole("status")).toContainText(`Bowie-Dick test for ${STERILIZER} recorded: ${sheet === "uniform" ? "PASS" : "FAIL"}`);
}

async function signAsEngineer(page: Page, meaning: "approved" | "failure-confirmed") {
  await page.goto("/review");
  const row = page.getByTestId("periodic-review-table").getByRole("row", { name: new RegExp(STERILIZER) });
  await expect(row).toHaveCount(1);
  await row.getByRole("link").click();
  await expect(page.getByTestId("periodic-record-header")).toContainText(STERILIZER);
  await expect(page.getByRole("img", { name: /indicator sheet/i }).first()).toBeVisible();
  const form = page.getByRole("form", { name: "Electronic signature" });
  await expect(form.getByRole("radio", { name: meaning === "approved" ? /^Approved/ : /^Failure confirmed/ })).toBeChecked();
  await form.getByLabel(/Your password/).fill(DEMO_PASSWORD);
  await form.getByRole("button", { name: "Sign" }).click();
  // The form's own "Signed by …" line lasts only until the page refreshes into the signed record (which has no form),
  // so the signature is read where it stays: the record's signatures.
  const signatures = page.getByTestId("periodic-signatures");
  await expect(signatures).toContainText(new RegExp(`${DEMO.engineer.name}[\\s\\S]*${meaning === "approved" ? "Approved" : "Failure confirmed"}`), { timeout: 30_000 });
  await expect(signatures).toContainText("The record still matches what was signed.");
}

const boardItem = (page: Page) => page.getByTestId("status-board").locator(`li[data-sterilizer="${STERILIZER}"]`);

test("a failed Bowie-Dick test with its photo, confirmed by an engineer, takes the sterilizer out of use; an approved repeat brings it back", async ({ browser }) => {
  test.setTimeout(180_000);
  const technician = await browser.newPage();
  await signIn(technician, "technician");
  await expect(boardItem(technician)).toContainText("In use");

  const failedAt = new Date(Date.now() - 2 * 60_000);
  await recordBowieDick(technician, "paler-centre", failedAt, "Paler area at the centre of the sheet.");
  // Recorded but not signed: it does not count yet, so the board is unchanged.
  await technician.goto("/");
  await expect(boardItem(technician)).toContainText("In use");

  const engineer = await browser.newPage();
  await signIn(engineer, "engineer");
  await signAsEngineer(engineer, "failure-confirmed");
  await expect(engineer.getByTestId("periodic-record-header")).toContainText("Failure confirmed");
  await engineer.screenshot({ path: `${shots}/bowie-dick-failure-confirmed.png`, fullPage: true });

  await technician.goto("/");
  const item = boardItem(technician);
  await expect(item).toContainText("Out of use");
  await expect(item).toContainText(/The Bowie-Dick test of \d{4}-\d{2}-\d{2} failed \(confirmed\); it must pass again before use\./);
  await technician.screenshot({ path: `${shots}/home-out-of-use.png`, fullPage: true });

  await recordBowieDick(technician, "uniform", new Date(), "Repeat after the door seal was replaced.");
  await signAsEngineer(engineer, "approved");

  await technician.goto("/");
  await expect(boardItem(technician)).toContainText("In use");
  await expect(boardItem(technician)).not.toContainText("failed (confirmed)");
  await technician.screenshot({ path: `${shots}/home-back-in-use.png`, fullPage: true });

  // The sterilizer's page keeps both changes in its status history.
  await engineer.goto("/");
  await boardItem(engineer).getByRole("link", { name: STERILIZER }).click();
  await expect(engineer.getByRole("heading", { name: STERILIZER })).toBeVisible();
  const history = engineer.getByTestId("status-history").getByRole("listitem");
  await expect(history.nth(0)).toContainText("In use");
  await expect(history.nth(0)).toContainText("Found by the status rule: periodic-test.sign.approved");
  await expect(history.nth(1)).toContainText("Out of use");
  await expect(history.nth(1)).toContainText("periodic-test.sign.failure-confirmed");
  await engineer.screenshot({ path: `${shots}/sterilizer-status-history.png`, fullPage: true });
});
