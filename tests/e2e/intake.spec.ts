import { mkdirSync, mkdtempSync, readFileSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import path from "node:path";
import type { Page } from "@playwright/test";
import { simulateCycle, toLoggerCsv } from "../../lib/simulator";
import { expect, signIn, test } from "./fixtures";

const shots = "test-results/screenshots";
mkdirSync(shots, { recursive: true });
const workDir = mkdtempSync(path.join(tmpdir(), "papin-intake-e2e-"));
// Unique per run, so that the list search finds this run's cycle only.
const cycleNumber = `E2E-${Date.now().toString(36).toUpperCase()}`;

/**
 * A 134 °C / 3 min cycle from the project's simulator, written the way a generic logger exports it:
 * channels named CH1…CH7 with the drain probe last, so the guess cannot know which one is the
 * reference and takes CH1; and the pressure header without a unit ("Chamber pressure").
 */
function genericLoggerFile(name: string, seed: number): string {
  const sim = simulateCycle({ scenario: "pass", sterilizationTempC: 134, holdingTimeS: 180, seed });
  const text = new TextDecoder().decode(toLoggerCsv(sim, { delimiter: ",", decimal: ".", timeFormat: "iso", pressureUnit: "bar", gauge: false }));
  const lines = text.split(/\r?\n/).filter((l) => l !== "");
  const header = lines[0].split(",");
  const drainAt = header.findIndex((h) => /drain/i.test(h));
  const pressureAt = header.findIndex((h) => /chamber/i.test(h));
  expect(drainAt).toBeGreaterThan(0);
  expect(pressureAt).toBeGreaterThan(0);
  const order = [0, ...header.map((_, i) => i).filter((i) => i !== 0 && i !== drainAt && i !== pressureAt), drainAt, pressureAt];
  const renamed = order.map((i, n) => (i === 0 ? "Time" : i === pressureAt ? "Chamber pressure" : `CH${n} (°C)`));
  const out = [
    renamed.join(","),
    ...lines.slice(1).map((line) => {
      const cells = line.split(",");
      return order.map((i) => cells[i]).join(",");
    }),
  ];
  const file = path.join(workDir, name);
  writeFileSync(file, out.join("\r\n") + "\r\n");
  return file;
}

/** Drops files on the drop area the way a browser does: a drop event carrying a DataTransfer. */
async function dropFiles(page: Page, files: Array<{ name: string; type: string; base64?: string; sizeBytes?: number }>) {
  const dataTransfer = await page.evaluateHandle((list) => {
    const dt = new DataTransfer();
    for (const f of list) {
      const bytes = f.base64 ? Uint8Array.from(atob(f.base64), (c) => c.charCodeAt(0)) : new Uint8Array(f.sizeBytes ?? 0);
      dt.items.add(new File([bytes], f.name, { type: f.type }));
    }
    return dt;
  }, files);
  const zone = page.getByTestId("logger-dropzone");
  await zone.dispatchEvent("dragenter", { dataTransfer });
  await zone.dispatchEvent("drop", { dataTransfer });
}

const asDropped = (file: string) => ({ name: path.basename(file), type: "text/csv", base64: readFileSync(file).toString("base64") });

async function chooseByText(page: Page, label: string, text: string) {
  const select = page.getByLabel(label, { exact: true });
  const value = await select.locator("option", { hasText: text }).first().getAttribute("value");
  expect(value, `an option "${text}" in ${label}`).toBeTruthy();
  await select.selectOption(value!);
}

async function signInAs(page: Page, role: "technician" | "engineer" | "auditor") {
  await signIn(page, role);
  await expect(page.getByRole("heading", { name: /Welcome/ })).toBeVisible();
}

/** Opens the intake page and waits until React has made it interactive. */
async function openIntake(page: Page) {
  await page.goto("/cycles/new");
  await expect(page.getByRole("form", { name: "New test cycle" })).toHaveAttribute("data-ready", "true");
}

test.describe.configure({ mode: "serial" });

test("the drop area refuses a file that is too large or not a logger export, saying why", async ({ page }) => {
  await signInAs(page, "technician");
  await openIntake(page);
  await expect(page.getByText("up to 50 MB per file")).toBeVisible();
  await dropFiles(page, [
    { name: "day-export.csv", type: "text/csv", sizeBytes: 51 * 1024 * 1024 },
    { name: "chamber-photo.png", type: "image/png", sizeBytes: 2048 },
  ]);
  const rejections = page.getByTestId("dropzone-rejections");
  await expect(rejections).toContainText("day-export.csv is 51.0 MB; the limit is 50 MB per file");
  await expect(rejections).toContainText("chamber-photo.png is not a logger text file");
  await expect(page.getByTestId("mapping-table")).toHaveCount(0);
  await page.screenshot({ path: `${shots}/intake-rejected.png`, fullPage: true });
});

test("a technician drops a simulated logger file, corrects the mapping, analyses and sees the verdict", async ({ page }) => {
  const file = genericLoggerFile("generic-logger-134.csv", 21);
  await signInAs(page, "technician");
  await openIntake(page);
  await dropFiles(page, [asDropped(file)]);

  const table = page.getByTestId("mapping-table");
  await expect(table).toBeVisible();
  // The guess had no drain or reference header to go by: it takes CH1 and says it is unsure.
  const reference = page.getByLabel("Reference channel (chamber drain)");
  await expect(reference).toHaveValue("CH1 (°C)");
  await expect(table.locator('th[data-column="CH1 (°C)"]')).toContainText("no header names the drain or reference point");
  await expect(page.getByText(/generic-logger-134\.csv/)).toBeVisible();
  await page.screenshot({ path: `${shots}/intake-guessed.png`, fullPage: true });

  // The pressure header has no abs/gauge marker: nothing is pre-selected, the screen asks.
  const pressureCell = table.locator('th[data-column="Chamber pressure"]');
  await expect(pressureCell.getByTestId("pressure-reference-source")).toHaveText("The header does not say whether this is absolute or gauge pressure: choose one.");
  await expect(pressureCell.getByRole("radio", { name: "absolute", exact: true })).not.toBeChecked();
  await expect(pressureCell.getByRole("radio", { name: "gauge", exact: true })).not.toBeChecked();

  // Corrections: the drain probe is CH7; the chamber transducer reads bar.
  await reference.selectOption("CH7 (°C)");
  await page.getByLabel("Unit of Chamber pressure").selectOption("bar");
  await expect(table.locator('th[data-column="CH7 (°C)"]')).toContainText("reference");

  // A temperature column can be marked as the free-space sensor, and unmarked again.
  await page.getByLabel("Role of CH6 (°C)").selectOption("free-space");
  await expect(table.locator('th[data-column="CH6 (°C)"]')).toContainText("free space");
  await expect(page.getByTestId("mapping-summary")).toContainText("Free space: CH6 (°C)");
  await page.getByLabel("Role of CH6 (°C)").selectOption("temperature");
  await expect(page.getByTestId("mapping-summary")).toContainText("Free space: none");

  // Client-side validation first: no sterilizer chosen yet, and absolute or gauge not said.
  await page.getByRole("button", { name: "Analyse" }).click();
  await expect(page.getByTestId("intake-error")).toBeVisible();
  await expect(page.locator('[data-field-error="sterilizerId"]')).toHaveText("Choose the sterilizer that ran this cycle.");
  await expect(pressureCell.locator('[data-field-error="pressureReference"]')).toContainText('Choose whether "Chamber pressure" reads absolute or gauge pressure');
  await expect(page.getByTestId("mapping-errors")).toContainText('Choose whether "Chamber pressure" reads absolute or gauge pressure');
  await page.screenshot({ path: `${shots}/intake-pressure-reference-asked.png`, fullPage: true });
  await pressureCell.getByRole("radio", { name: "absolute", exact: true }).check();
  await expect(pressureCell.locator('[data-field-error="pressureReference"]')).toHaveCount(0);
  await expect(pressureCell.getByTestId("pressure-reference-source")).toHaveText("absolute, chosen by you");

  await chooseByText(page, "Sterilizer", "Porous load 1");
  // The sterilizer's default profile is preselected.
  await expect(page.getByLabel("Acceptance profile")).toHaveValue(/.+/);
  await expect(page.getByLabel("Acceptance profile").locator("option:checked")).toHaveText("134 °C / 3 min porous load");
  await chooseByText(page, "Logger (instrument)", "TL-12 (unit A)");
  await page.getByLabel("Cycle number").fill(cycleNumber);
  await page.getByLabel("Load description").fill("Standard test pack, 6 probes in the pack, drain probe CH7");
  await page.getByLabel(/Save this column mapping for the instrument/).check();
  await page.screenshot({ path: `${shots}/intake-corrected.png`, fullPage: true });

  await page.getByRole("button", { name: "Analyse" }).click();
  await expect(page.getByTestId("intake-progress")).toBeVisible();
  await page.waitForURL(/\/cycles\/[0-9a-f-]{36}$/, { timeout: 30_000 });
  const id = page.url().split("/").pop()!;

  await expect(page.getByTestId("record-header")).toContainText(cycleNumber);
  await expect(page.getByTestId("record-header")).toContainText("Pass");
  await expect(page.getByTestId("verdict")).toBeVisible();
  await expect(page.getByTestId("time-chart")).toBeVisible();
  await expect(page.getByTestId("phase-diagram")).toBeVisible();
  await page.waitForTimeout(500);
  await page.screenshot({ path: `${shots}/intake-record.png`, fullPage: true });

  // The record was analysed with the corrected mapping, and the file kept byte for byte.
  const detail = await (await page.request.get(`/api/cycles/${id}`)).json();
  expect(detail.analysis.referenceChannel).toBe("CH7 (°C)");
  expect(detail.analysis.verdict).toBe("pass");
  expect(detail.analysis.input.pressureReference).toEqual({ kind: "absolute", source: "user" });
  expect(detail.files[0].name).toBe("generic-logger-134.csv");
  expect(detail.files[0].size).toBe(readFileSync(file).byteLength);
});

test("the instrument's saved mapping is applied to its next file", async ({ page }) => {
  const file = genericLoggerFile("generic-logger-134-next.csv", 22);
  await signInAs(page, "technician");
  await openIntake(page);
  await chooseByText(page, "Logger (instrument)", "TL-12 (unit A)");
  // This time from the keyboard: the drop area takes focus and Enter opens the file chooser.
  const chooser = page.waitForEvent("filechooser");
  await page.getByTestId("logger-dropzone").press("Enter");
  await (await chooser).setFiles(file);
  await expect(page.getByTestId("mapping-notice")).toContainText("The mapping saved for Thermocouple logger TL-12 (unit A) was applied");
  await expect(page.getByLabel("Reference channel (chamber drain)")).toHaveValue("CH7 (°C)");
  await expect(page.getByLabel("Unit of Chamber pressure")).toHaveValue("bar");
  // The confirmed absolute came with the saved mapping: pre-filled and still shown.
  const pressureCell = page.getByTestId("mapping-table").locator('th[data-column="Chamber pressure"]');
  await expect(pressureCell.getByRole("radio", { name: "absolute", exact: true })).toBeChecked();
  await expect(pressureCell.getByTestId("pressure-reference-source")).toHaveText("absolute, as confirmed in the instrument's saved mapping");
  await page.screenshot({ path: `${shots}/intake-saved-mapping.png`, fullPage: true });
});

test("a file another cycle already holds is refused until the technician says why, and the record links both", async ({ page }) => {
  const file = genericLoggerFile("generic-logger-134.csv", 21);
  const duplicateNumber = cycleNumber.replace("E2E", "DUP");
  await signInAs(page, "technician");
  await openIntake(page);
  await chooseByText(page, "Logger (instrument)", "TL-12 (unit A)");
  await dropFiles(page, [asDropped(file)]);
  await expect(page.getByTestId("mapping-notice")).toContainText("The mapping saved for Thermocouple logger TL-12 (unit A) was applied");
  await chooseByText(page, "Sterilizer", "Porous load 1");
  await page.getByLabel("Cycle number").fill(duplicateNumber);
  await page.getByRole("button", { name: "Analyse" }).click();
  const refusal = page.locator('[data-field-error="duplicateReason"]');
  await expect(refusal).toContainText(`generic-logger-134.csv is the same file`);
  await expect(refusal).toContainText(`as cycle ${cycleNumber} on this site`);
  await page.getByLabel("Why this file belongs to this cycle too").fill("One logger export holds both test runs of the morning.");
  await page.screenshot({ path: `${shots}/intake-duplicate.png`, fullPage: true });
  await page.getByRole("button", { name: "Analyse" }).click();
  await page.waitForURL(/\/cycles\/[0-9a-f-]{36}$/, { timeout: 30_000 });
  await expect(page.getByTestId("shared-files")).toContainText(`is the same file as cycle ${cycleNumber}: One logger export holds both test runs of the morning.`);
});

test("the new cycle is found in the cycles list; filters sit in the URL and go with the CSV download", async ({ page }) => {
  await signInAs(page, "technician");
  await page.goto("/cycles");
  await expect(page.getByTestId("cycles-table")).toBeVisible();
  await expect(page.getByTestId("list-count")).toContainText(/of \d+ cycles/);
  await page.getByLabel("Search").fill(cycleNumber);
  await expect(page).toHaveURL(new RegExp(`[?&]q=${cycleNumber}`));
  await expect(page.getByTestId("list-count")).toHaveText("1–1 of 1 cycle");
  await page.getByLabel("Verdict").selectOption("pass");
  await expect(page).toHaveURL(/verdict=pass/);
  await expect(page.getByTestId("cycle-link")).toHaveText([cycleNumber]);
  const href = await page.getByTestId("export-csv").getAttribute("href");
  expect(href).toMatch(/^\/api\/cycles\/export\?/);
  expect(href).toContain(`q=${cycleNumber}`);
  expect(href).toContain("verdict=pass");
  const csv = await (await page.request.get(href!)).text();
  expect(csv).toContain(cycleNumber);
  expect(csv.trim().split("\r\n")).toHaveLength(2);
  await page.screenshot({ path: `${shots}/cycles-list-filtered.png`, fullPage: true });

  // The same URL reopened gives the same list; the sort is a click away.
  await page.reload();
  await expect(page.getByLabel("Search")).toHaveValue(cycleNumber);
  await page.getByLabel("Search").fill("");
  await page.getByRole("button", { name: "Clear filters" }).click();
  await page.getByRole("button", { name: /^Cycle/ }).click();
  await expect(page).toHaveURL(/sort=cycleNumber%3A(desc|asc)/);
  await page.getByTestId("cycle-link").first().click();
  await expect(page).toHaveURL(/\/cycles\/[0-9a-f-]{36}$/);
});

test("an engineer sees the review queue; a technician is refused it", async ({ page }) => {
  await signInAs(page, "engineer");
  await page.goto("/review");
  await expect(page.getByTestId("cycles-table")).toBeVisible();
  await expect(page.getByTestId("list-count")).not.toHaveText("Loading…");
  await page.screenshot({ path: `${shots}/review-queue.png`, fullPage: true });
  await page.context().clearCookies();
  await signInAs(page, "technician");
  const response = await page.goto("/review");
  expect(response?.status()).toBe(403);
  await expect(page.getByTestId("forbidden")).toBeVisible();
});

test("an auditor cannot open the intake page", async ({ page }) => {
  await signInAs(page, "auditor");
  const response = await page.goto("/cycles/new");
  expect(response?.status()).toBe(403);
  await expect(page.getByTestId("forbidden")).toBeVisible();
  await expect(page.getByTestId("logger-dropzone")).toHaveCount(0);
});
