import { mkdirSync, writeFileSync } from "node:fs";
import { execFileSync } from "node:child_process";
import { DEMO, expect, signIn, test } from "./fixtures";

const shots = "test-results/screenshots";
mkdirSync(shots, { recursive: true });

test("a technician submits, an engineer signs with a password, an auditor downloads and verifies the report", async ({ browser, baseURL }) => {
  test.setTimeout(180_000);
  const technician = await browser.newPage();
  await signIn(technician, "technician");
  const list = await (await technician.request.get("/api/cycles?status=draft&verdict=pass")).json();
  expect(list.total).toBeGreaterThan(0);
  const { id, cycleNumber } = list.items[0];
  const url = `/cycles/${id}`;
  await technician.goto(url);
  await expect(technician.getByText(cycleNumber).first()).toBeVisible();
  await technician.getByRole("button", { name: /Submit for review/ }).click();
  await expect(technician.getByText(/Submitted: the site's engineers have been notified/)).toBeVisible();

  const engineer = await browser.newPage();
  await signIn(engineer, "engineer");
  await engineer.goto(url);
  const signOff = engineer.getByTestId("sign-off");
  await signOff.getByLabel(/Approved/).check();
  await signOff.getByLabel(/Your password/).fill("wrong password");
  await signOff.getByRole("button", { name: "Sign" }).click();
  await expect(signOff.getByText(/password is not correct/)).toBeVisible();
  await signOff.getByLabel(/Your password/).fill("papin-demo");
  await signOff.getByRole("button", { name: "Sign" }).click();
  await expect(signOff.getByText(new RegExp(`Signed "Approved" by ${DEMO.engineer.name}`))).toBeVisible({ timeout: 30_000 });
  await expect(signOff.getByTestId("signatures")).toContainText("Signature verifies");
  await engineer.screenshot({ path: `${shots}/record-signed.png`, fullPage: true });

  const auditor = await browser.newPage();
  await signIn(auditor, "auditor");
  await auditor.goto("/archive");
  const row = auditor.getByTestId("archive-table").getByRole("row", { name: new RegExp(cycleNumber) });
  await expect(row).toBeVisible();
  const download = auditor.waitForEvent("download");
  await row.getByRole("link", { name: "Download" }).click();
  const file = await download;
  const pdfPath = `${shots}/archived-report.pdf`;
  await file.saveAs(pdfPath);
  const text = execFileSync("pdftotext", ["-layout", pdfPath, "-"], { encoding: "utf8" });
  expect(text).toContain(DEMO.engineer.name);
  expect(text).toMatch(/competent person/i);
  execFileSync("pdftoppm", ["-png", "-r", "60", "-f", "1", "-l", "1", pdfPath, `${shots}/archived-report`]);

  await auditor.getByTestId("verify-input").setInputFiles(pdfPath);
  await expect(auditor.getByTestId("verify-outcome")).toContainText(`is byte for byte the archived report`);
  const bytes = (await import("node:fs")).readFileSync(pdfPath);
  bytes[Math.floor(bytes.length / 2)] ^= 1;
  writeFileSync(`${shots}/altered-report.pdf`, bytes);
  await auditor.getByTestId("verify-input").setInputFiles(`${shots}/altered-report.pdf`);
  await expect(auditor.getByTestId("verify-outcome")).toContainText("does not match any archived report");
  await auditor.screenshot({ path: `${shots}/archive-verify.png`, fullPage: true });

  await auditor.goto("/audit");
  await expect(auditor.getByTestId("chain-state")).toContainText("Chain intact");
  await expect(auditor.getByTestId("audit-events")).toContainText(`approved cycle ${cycleNumber}`);

  const mailbox = await (await fetch(`${new URL(baseURL!).origin.replace(/:(\d+)$/, (_, p) => `:${Number(p) + 1}`)}/emails`, { headers: { Authorization: "Bearer re_e2e_fake" } })).json();
  const messages = Array.isArray(mailbox) ? mailbox : mailbox.data;
  const subjects = messages.map((m: { subject: string; to: string[] | string }) => `${m.subject} → ${[m.to].flat().join(",")}`);
  expect(subjects.some((s: string) => s.includes(cycleNumber) && s.includes(DEMO.technician.email))).toBe(true);
});

test("an engineer confirms a failed test as a signed failure; the record locks and its archived report says FAIL", async ({ browser }) => {
  test.setTimeout(180_000);
  const technician = await browser.newPage();
  await signIn(technician, "technician");
  // The demo returned its older failing cycles for correction; the technician sends one back unchanged.
  const returned = await (await technician.request.get("/api/cycles?status=returned&verdict=fail")).json();
  expect(returned.total).toBeGreaterThan(0);
  const { id, cycleNumber } = returned.items[0];
  expect((await technician.request.post(`/api/cycles/${id}/submit`)).status()).toBe(200);

  const engineer = await browser.newPage();
  await signIn(engineer, "engineer");
  await engineer.goto(`/cycles/${id}`);
  const signOff = engineer.getByTestId("sign-off");
  await expect(signOff.getByLabel(/^Approved/)).toBeDisabled();
  await signOff.getByLabel(/^Failure confirmed/).check();
  await signOff.getByLabel(/^Reason/).fill("The test failed as analysed; the sterilizer is to be investigated before a retest.");
  await signOff.getByLabel(/Your password/).fill("papin-demo");
  await signOff.getByRole("button", { name: "Sign" }).click();
  await expect(signOff.getByText(new RegExp(`Signed "Failure confirmed" by ${DEMO.engineer.name}`))).toBeVisible({ timeout: 30_000 });
  await expect(engineer.getByTestId("record-header")).toContainText("Failure confirmed");
  await expect(signOff).toContainText("Closed as a signed failure: the record is locked.");
  await engineer.screenshot({ path: `${shots}/record-failure-confirmed.png`, fullPage: true });

  const report = await engineer.request.get(`/api/cycles/${id}/report`);
  expect(report.headers()["x-papin-report"]).toBe("archived");
  const pdfPath = `${shots}/failure-confirmed-report.pdf`;
  writeFileSync(pdfPath, await report.body());
  const text = execFileSync("pdftotext", [pdfPath, "-"], { encoding: "utf8" }).replace(/\s+/g, " ");
  expect(text).toContain("FAIL · FAILURE CONFIRMED");
  expect(text).toContain(`Failure confirmed by ${DEMO.engineer.name}`);
  expect(text).toContain(cycleNumber);
  execFileSync("pdftoppm", ["-png", "-r", "60", "-f", "1", "-l", "1", pdfPath, `${shots}/failure-confirmed-report`]);
});
