import { execFileSync } from "node:child_process";
import { createHash } from "node:crypto";
import { mkdirSync, mkdtempSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import path from "node:path";
import { beforeAll, describe, expect, it } from "vitest";
import { renderStudyReport, studyConclusion, type StudyReportDetail } from "@/lib/reports/study";
import { SAFETY_NOTES } from "@/lib/safety";
import { approvedStudy, runningStudyWithFailedRun } from "@/tests/fixtures/studies/report-detail";

// Read back as a person's tools read it: poppler's pdftotext and pdfinfo (Debian poppler-utils). The figures asserted
// are the constructed ones of tests/fixtures/studies/report-detail.ts, printed to one decimal (worked by hand).
const work = mkdtempSync(path.join(tmpdir(), "papin-study-report-"));
const squash = (text: string) => text.replace(/\s+/g, " ").trim();
const SITE = { name: "Riverside General", timeZone: "Europe/London" };

type Rendered = { pdf: Buffer; text: string; pages: number; file: string };
async function render(name: string, detail: StudyReportDetail, draft: boolean, reportNumber: string): Promise<Rendered> {
  const pdf = await renderStudyReport(detail, { reportNumber, generatedAt: "2026-03-20T14:30:00.000Z", draft, site: SITE });
  const file = path.join(work, `${name}.pdf`);
  writeFileSync(file, pdf);
  const pages = Number(/Pages:\s+(\d+)/.exec(execFileSync("pdfinfo", [file], { encoding: "utf8" }))?.[1]);
  return { pdf, file, pages, text: squash(execFileSync("pdftotext", [file, "-"], { encoding: "utf8" })) };
}

let approved: Rendered;
let running: Rendered;
beforeAll(async () => {
  approved = await render("approved", approvedStudy(), false, "QS-2026-001-R");
  running = await render("running", runningStudyWithFailedRun(), true, "DRAFT-QS-2026-002");
  // Pages for a person to look at (test-results/study-report-pages/).
  const dir = path.join(process.cwd(), "test-results", "study-report-pages");
  mkdirSync(dir, { recursive: true });
  execFileSync("pdftoppm", ["-png", "-r", "50", approved.file, path.join(dir, "approved")]);
}, 120_000);

describe("the approved study's report", () => {
  it("names the study, the protocol and its criteria with their source", () => {
    expect(approved.text).toContain("Qualification study report");
    expect(approved.text).toContain("Study QS-2026-001 · Heat penetration (defined load)");
    expect(approved.text).toContain("60.00 min at every load position, set by this study's protocol");
    expect(approved.text).toContain('3.0 K between positions during holding, from the profile "Porous load 134 °C" (its band)');
    expect(approved.text).toContain("3 consecutive passing runs");
    expect(approved.text).toContain("every 12 months; next due 2027-03-20");
  });

  it("prints the loading pattern and the sensor map, position by run", () => {
    expect(approved.text).toContain("Full load, 6 wrapped sets");
    expect(approved.text).toContain("Wrapped orthopaedic set");
    expect(approved.text).toMatch(/P3 Bottom shelf, wrapped set centre \(inside — the densest wrap\) T3 T3 T3/);
    expect(approved.text).toMatch(/P1 Top shelf, front left Top front left T1 T1 T1/);
  });

  it("prints each run's key figures and judgement", () => {
    expect(approved.text).toMatch(/1 C-2026-011 4 Mar 2026 07:30:00 GMT \(Europe\/London\) Approved, PASS 15 s 3 min 33 s P3, 71.30 min 1.84 K PASS/);
    expect(approved.text).toMatch(/3 C-2026-013 .* P3, 72.60 min 1.77 K PASS/);
  });

  it("prints the cross-run table, the heat map and the cold spot over the study", () => {
    // P3: 71.3, 70.8, 72.6 → minimum 70.8 (the fixture's made-up F0s).
    expect(approved.text).toMatch(/P3 Bottom shelf, wrapped set centre 71.30 70.80 72.60 70.80 134.20 136.00 17 s/);
    expect(approved.text).toContain("Cold spot over the study: P3 (Bottom shelf, wrapped set centre), lowest F0 70.80 min; the cold spot in 3 of 3 runs.");
    expect(approved.text).toContain("Heat map: F0 by position and run");
    expect(approved.text).toMatch(/70\.80 \*/);
  });

  it("prints indicators, the closed deviation, the conclusion, the four signatures and the safety notes", () => {
    expect(approved.text).toContain("Geobacillus stearothermophilus, lot");
    expect(approved.text).toContain("GS-2611, population 1.0e6, 48 h at 57");
    expect(approved.text).toMatch(/No growth GS-2611, population 1.0e6, 48 h at 57 \(negative\)/);
    expect(approved.text).toMatch(/Deviation 1: Raised by a person \(run 2\) Probe T4 gland was re-tightened before run 2\. CLOSED/);
    expect(approved.text).toContain("Corrective and preventive action: CAPA-2026-014");
    expect(approved.text).toContain("APPROVED");
    expect(approved.text).toContain("The study met its acceptance criteria: the last 3 runs passed in a row");
    for (const [name, meaning] of [
      ["Priya Nair", "Protocol approved:"],
      ["Amara Osei", "Submitted for review (author):"],
      ["Priya Nair", "Reviewed:"],
      ["Jonas Weber", "Approved for quality assurance:"],
    ]) {
      expect(approved.text).toContain(name);
      expect(approved.text).toContain(meaning);
    }
    expect(approved.text).toContain("Signed 2026-03-20 14:30:00 UTC");
    expect(approved.text).not.toContain("not signed yet");
    for (const note of SAFETY_NOTES) expect(approved.text).toContain(note.title);
  });

  it("carries the report number and page x of y on every page, and no draft mark", () => {
    expect(approved.pages).toBeGreaterThan(1);
    for (let n = 1; n <= approved.pages; n++) {
      const page = squash(execFileSync("pdftotext", ["-f", String(n), "-l", String(n), approved.file, "-"], { encoding: "utf8" }));
      expect(page).toContain("QS-2026-001-R");
      expect(page).toContain(`Page ${n} of ${approved.pages}`);
    }
    expect(approved.text).not.toContain("DRAFT");
  });

  it("gives the same bytes for the same study and options (what lets the archive check it by hash)", async () => {
    const again = await renderStudyReport(approvedStudy(), { reportNumber: "QS-2026-001-R", generatedAt: "2026-03-20T14:30:00.000Z", draft: false, site: SITE });
    const hash = (b: Uint8Array) => createHash("sha256").update(b).digest("hex");
    expect(hash(again)).toBe(hash(approved.pdf));
  }, 60_000);
});

describe("a running study with a failed run", () => {
  it("is marked as a draft, not approved, on every page", () => {
    expect(running.text).toContain("DRAFT — NOT APPROVED");
    const pagesWithBanner = running.text.split("DRAFT — NOT APPROVED").length - 1;
    expect(pagesWithBanner).toBe(running.pages);
  });

  it("names the failed run with its reason, the low F0 and the open deviation, and does not claim the criteria were met", () => {
    expect(running.text).toContain("Run 3 (cycle C-2026-013): failed P3 received 55.2 min F0, less than the 60.0 min the study requires.");
    expect(running.text).toContain("Growth (positive)");
    expect(running.text).toMatch(/Deviation 1: A run failed \(run 3\) Run 3 failed: P3 received 55\.2 min F0, less than the 60\.0 min the study requires\. OPEN/);
    expect(running.text).toContain("Impact: not yet assessed");
    expect(running.text).toContain("NOT CONCLUDED");
    expect(running.text).toContain("The study is not concluded: 0 of 3 consecutive passing runs; 1 deviation open.");
    expect(running.text).not.toContain("met its acceptance criteria");
    expect(running.text).toContain("Approved for quality assurance: not signed yet.");
  });
});

describe("the conclusion sentence", () => {
  it("never claims success for an approved status while a deviation is open (fail closed)", () => {
    const detail = approvedStudy();
    detail.deviations[0] = { ...detail.deviations[0], status: "open" };
    const c = studyConclusion(detail);
    expect(c.tone).toBe("open");
    expect(c.sentence).toBe("The study is not concluded: 1 deviation open.");
  });

  it("says a failed study failed, with the signer's reason", () => {
    const detail = { ...runningStudyWithFailedRun(), status: "failed" as const };
    detail.signatures = [
      ...detail.signatures,
      { id: "f", meaning: "failed" as const, printedName: "Priya Nair", role: "Engineer", signedAt: "2026-03-09T10:00:00.000Z", reason: "Run 3 was too cold at P3" },
    ];
    expect(studyConclusion(detail)).toMatchObject({ tone: "fail", word: "FAILED", sentence: "The study failed and is closed: Run 3 was too cold at P3." });
  });

  it("waits for review when the series is complete but the study is not approved yet", () => {
    const detail = { ...approvedStudy(), status: "ready-for-review" as const };
    expect(studyConclusion(detail).sentence).toBe("The study is not concluded: 3 of 3 consecutive passing runs, no deviation open; waiting for review and QA approval.");
  });
});
