import { execFileSync } from "node:child_process";
import { mkdirSync, writeFileSync } from "node:fs";
import type { Browser, Page } from "@playwright/test";
import { simulateCycle, simulatedPlacements, toLoggerCsv } from "@/lib/simulator";
import { DEMO, DEMO_PASSWORD, expect, signIn, test } from "./fixtures";

const shots = "test-results/screenshots";
mkdirSync(shots, { recursive: true });

/** The demo's second and third engineers (db/demo-users.ts): a study is signed by three different engineers. */
const REVIEWER = { email: "reviewer@papin.example", name: "Priya Nair" };
const QA = { email: "qa@papin.example", name: "Jonas Weber" };

async function signInAs(browser: Browser, who: { email: string; name: string }): Promise<Page> {
  const page = await browser.newPage();
  await page.goto("/sign-in");
  await page.getByLabel("E-mail").fill(who.email);
  await page.getByLabel("Password").fill(DEMO_PASSWORD);
  await page.getByRole("button", { name: "Sign in" }).click();
  await expect(page.getByRole("heading", { name: `Welcome, ${who.name}` })).toBeVisible();
  return page;
}

/** Signs the study on its page with the meaning given (its label), then waits for the signature in the list and the state in the header. */
async function signStudy(page: Page, url: string, meaning: string, signerName: string, expectedStatus: RegExp) {
  await page.goto(url);
  const form = page.getByTestId("study-sign");
  await form.getByLabel(new RegExp(`^${meaning.replace(/[()]/g, "\\$&")}`)).check();
  await form.getByLabel(/Your password/).fill(DEMO_PASSWORD);
  await form.getByRole("button", { name: "Sign" }).click();
  await expect(page.getByTestId("study-signatures")).toContainText(`${meaning} — ${signerName}`, { timeout: 30_000 });
  await page.reload();
  await expect(page.getByTestId("study-header")).toContainText(expectedStatus);
}

const PROBES = 3;

/**
 * Three passing cycles of Porous load 1, uploaded by the technician with their probe placements, submitted and approved
 * by an engineer: what a study's runs are made of. Each file is simulated with its own seed (no shared SHA-256).
 */
async function threeSignedCycles(technician: Page, engineer: Page) {
  const { items: sterilizers } = await (await technician.request.get("/api/sterilizers")).json();
  const sterilizer = sterilizers.find((s: { name: string }) => s.name === "Porous load 1");
  const { items: instruments } = await (await technician.request.get("/api/instruments")).json();
  const instrument = instruments.find((i: { name: string }) => /unit A/.test(i.name));
  const cycleNumbers: string[] = [];
  for (let run = 1; run <= 3; run++) {
    // 134 °C profile, 3 min hold: simulated 0.6 K above Ts with 30 s of hold to spare, as the demo does (db/seed.ts).
    const sim = simulateCycle({ scenario: "pass", sterilizationTempC: 134.6, holdingTimeS: 210, probeCount: PROBES, seed: 9100 + run, startedAt: new Date(Date.now() - (5 - run) * 3_600_000) });
    const headers = sim.channels.filter((c) => c.kind === "temperature").map((c) => c.header);
    const cycleNumber = `E2E-QS-${Date.now().toString(36)}-${run}`;
    const created = await technician.request.post("/api/cycles", {
      multipart: {
        files: { name: `qs-run-${run}.csv`, mimeType: "text/csv", buffer: Buffer.from(toLoggerCsv(sim)) },
        sterilizerId: sterilizer.id,
        profileId: sterilizer.defaultProfileId,
        instrumentId: instrument.id,
        cycleNumber,
        loadType: "wrapped-instruments",
        mapping: JSON.stringify({ positions: simulatedPlacements(headers) }),
      },
    });
    expect(created.status(), await created.text()).toBe(201);
    const { id, analysis } = await created.json();
    expect(analysis.verdict).toBe("pass");
    expect((await technician.request.post(`/api/cycles/${id}/submit`)).status()).toBe(200);
    const signed = await engineer.request.post(`/api/cycles/${id}/signatures`, { data: { password: DEMO_PASSWORD, meaning: "approved" } });
    expect(signed.status(), await signed.text()).toBe(201);
    cycleNumbers.push(cycleNumber);
  }
  return cycleNumbers;
}

test("an engineer plans a study in the browser; three signed cycles become its runs; author, reviewer and QA sign it and its report is archived", async ({ browser }) => {
  test.setTimeout(600_000);
  const author = await browser.newPage();
  await signIn(author, "engineer");

  // Planning, in the browser.
  await author.goto("/studies");
  await author.getByRole("link", { name: "Plan a study" }).click();
  await expect(author.getByRole("heading", { name: "Plan a qualification study" })).toBeVisible();
  await author.getByLabel("Sterilizer", { exact: true }).selectOption({ label: "Porous load 1" });
  await expect(author.getByLabel("Profile", { exact: true })).not.toHaveValue("");
  await author.getByLabel("Define a new loading pattern").check();
  await author.getByLabel("Name", { exact: true }).fill("E2E wrapped tray set");
  await author.getByLabel("Item 1 name").fill("Wrapped instrument tray");
  await author.getByLabel("Item 1 quantity").fill("4");
  await author.getByRole("button", { name: "Add a position" }).click();
  const labels = ["Tray 1, top", "Tray 2, centre", "Tray 3, bottom"];
  for (const [i, label] of labels.entries()) await author.getByLabel(`Position ${i + 1} label`).fill(label);
  // The demo cycles' probe heads sit in the pack; chosen here so the criteria are the study's own, not the profile's.
  await author.getByLabel("Minimum F0 at every load position").fill("30");
  await author.getByLabel("Largest spread between positions during holding").fill("3");
  await author.getByLabel("Protocol", { exact: true }).fill("Three consecutive runs of the wrapped tray set; one probe and one biological indicator per tray.");
  await author.getByRole("button", { name: "Save the draft study" }).click();
  await author.waitForURL(/\/studies\/[0-9a-f-]{36}$/, { timeout: 30_000 });
  const url = new URL(author.url()).pathname;
  const studyId = url.split("/").pop()!;
  await expect(author.getByTestId("study-header")).toContainText("Draft protocol");
  await expect(author.getByTestId("study-criteria")).toContainText("30.0 min (set by this study)");
  const studyNumber = (await author.getByRole("heading", { level: 1 }).textContent())!.split(" · ")[0].trim();
  expect(studyNumber).toMatch(/^QS-\d{4}-\d{3}$/);

  // The author cannot approve their own protocol; a second engineer does.
  await expect(author.getByTestId("study-sign").getByLabel(/Protocol approved/)).toHaveCount(0);
  const reviewer = await signInAs(browser, REVIEWER);
  await signStudy(reviewer, url, "Protocol approved", REVIEWER.name, /Protocol approved/);

  // Three signed cycles, attached in the browser with their sensor maps confirmed channel by channel.
  const technician = await browser.newPage();
  await signIn(technician, "technician");
  const cycleNumbers = await threeSignedCycles(technician, author);
  for (const [i, cycleNumber] of cycleNumbers.entries()) {
    await author.goto(url);
    const select = author.getByLabel("Signed cycle");
    const value = await select.locator("option", { hasText: cycleNumber }).getAttribute("value");
    await select.selectOption(value!);
    await author.getByRole("button", { name: "Show its sensor map" }).click();
    const form = author.getByTestId("attach-run");
    await expect(form).toBeVisible();
    await form.getByLabel(/channel Drain/).selectOption("");
    for (let p = 1; p <= PROBES; p++) await form.getByLabel(new RegExp(`channel Pack ${p}\\b`)).selectOption(`P${p}`);
    await form.getByRole("button", { name: /Confirm the map and attach/ }).click();
    await expect(author.getByTestId("runs-table")).toContainText(`Run ${i + 1}`, { timeout: 30_000 });
  }
  await expect(author.getByTestId("runs-table")).toContainText(cycleNumbers[2]);

  // Indicators: a negative biological indicator at every position of every run, through the API.
  const study = await (await author.request.get(`/api/studies/${studyId}`)).json();
  expect(study.runs).toHaveLength(3);
  for (const run of study.runs)
    for (let p = 1; p <= PROBES; p++) {
      const recorded = await technician.request.post(`/api/studies/${studyId}/indicators`, {
        data: {
          runId: run.id,
          positionId: `P${p}`,
          kind: "biological",
          result: "no-growth",
          organism: "Geobacillus stearothermophilus",
          lot: "BI-E2E-1",
          population: 1e6,
          incubation: "48 h at 57 °C",
          readBy: DEMO.technician.name,
          readAt: new Date().toISOString(),
        },
      });
      expect(recorded.status(), await recorded.text()).toBe(201);
    }

  await author.goto(url);
  await expect(author.getByTestId("runs-table")).not.toContainText("Pending");
  await expect(author.getByTestId("cold-spot")).toContainText("Cold spot");
  await expect(author.getByTestId("cross-run-table")).toContainText("P3");
  await author.screenshot({ path: `${shots}/study-runs.png`, fullPage: true });

  // Author submits, the second engineer reviews, a third approves for quality assurance.
  await signStudy(author, url, "Submitted for review (author)", DEMO.engineer.name, /Ready for review/);
  await signStudy(reviewer, url, "Reviewed", REVIEWER.name, /Ready for review/);
  const qa = await signInAs(browser, QA);
  await signStudy(qa, url, "Approved for quality assurance", QA.name, /Approved/);
  await expect(qa.getByTestId("study-signatures")).toContainText(DEMO.engineer.name);
  await expect(qa.getByTestId("study-signatures")).toContainText(REVIEWER.name);
  await expect(qa.getByTestId("study-signatures")).toContainText(QA.name);
  await qa.screenshot({ path: `${shots}/study-approved.png`, fullPage: true });

  // The archived report downloads from the page and verifies byte for byte.
  // The route answers inline (the browser shows the PDF), so the test fetches the link's target with the page's session.
  const href = await qa.getByRole("link", { name: /Download the archived report/ }).getAttribute("href");
  expect(href).toMatch(/^\/api\/studies\/[^/]+\/report$/);
  const served = await qa.request.get(href!);
  expect(served.status()).toBe(200);
  expect(served.headers()["x-papin-report"]).toBe("archived");
  const pdfPath = `${shots}/study-report.pdf`;
  writeFileSync(pdfPath, await served.body());
  const text = execFileSync("pdftotext", [pdfPath, "-"], { encoding: "utf8" }).replace(/\s+/g, " ");
  expect(text).toContain(studyNumber);
  expect(text).toContain(QA.name);
  const auditor = await browser.newPage();
  await signIn(auditor, "auditor");
  const bytes = (await import("node:fs")).readFileSync(pdfPath);
  const verified = await auditor.request.post("/api/reports/verify", { multipart: { file: { name: "study-report.pdf", mimeType: "application/pdf", buffer: bytes } } });
  expect((await verified.json()).match).toBe(true);
  writeFileSync(`${shots}/study-report.sha256`, (await verified.json()).sha256 ?? "");
});
