import { execFileSync } from "node:child_process";
import { createHash } from "node:crypto";
import { mkdtempSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import path from "node:path";
import { afterAll, describe, expect, it } from "vitest";
import { renderCycleReport, type ReportModel } from "@/lib/reports";
import { buildReportModel } from "@/tests/fixtures/reports/model";
import { indicatorSheetPng } from "@/tests/support/indicator-photo";

// Read back with poppler's pdftotext and pdfimages (Debian poppler-utils), as a person's tools read it.
const work = mkdtempSync(path.join(tmpdir(), "papin-bd-report-"));
afterAll(() => rmSync(work, { recursive: true, force: true }));
const squash = (text: string) => text.replace(/\s+/g, " ").trim();

async function render(name: string, model: ReportModel) {
  const file = path.join(work, `${name}.pdf`);
  writeFileSync(file, await renderCycleReport(model));
  return { text: squash(execFileSync("pdftotext", [file, "-"], { encoding: "utf8" })), images: execFileSync("pdfimages", ["-list", file], { encoding: "utf8" }) };
}

function bowieDickModel(sheet: ReportModel["bowieDick"]): ReportModel {
  // A logged cycle whose thermometric analysis passes: the report must still take the verdict from the sheet.
  const base = buildReportModel({ scenario: "pass" });
  return { ...base, detail: { ...base.detail, testKind: "bowie-dick" }, bowieDick: sheet };
}

describe("the report of a Bowie-Dick cycle", () => {
  const photo = indicatorSheetPng({ width: 40, height: 30, rgb: [200, 180, 90] });
  const photoSha256 = createHash("sha256").update(photo).digest("hex");

  it("prints the sheet's verdict (a non-uniform change fails over a passing thermometric file), its lot, the photo and the photo's SHA-256", async () => {
    const { text, images } = await render(
      "bd-fail",
      bowieDickModel({
        result: "non-uniform",
        passed: false,
        indicatorLot: "LOT-2207",
        recordedByName: "Priya Raman",
        recordedAt: "2025-03-03T07:52:00.000Z",
        photo: { name: "sheet.png", contentType: "image/png", sha256: photoSha256, bytes: photo },
      }),
    );
    expect(text).toContain("VERDICT FROM THE INDICATOR SHEET FAIL");
    expect(text).toContain("Not uniform (paler or uneven area)");
    expect(text).toContain("LOT-2207");
    expect(text).toContain(photoSha256);
    // The thermometric findings are not this test's verdict: no checks table, no "PASS" verdict box.
    expect(text).not.toContain("Checks against the acceptance limits");
    expect(text).not.toMatch(/VERDICT PASS/);
    // pdfimages -list: a header of two lines, then one line per embedded image; the photo is 40 × 30 px.
    const rows = images.trim().split("\n").slice(2);
    expect(rows.some((r) => /\s40\s+30\s/.test(r))).toBe(true);
  });

  it("without a recorded sheet it says so and prints no verdict", async () => {
    const { text } = await render("bd-none", bowieDickModel(null));
    expect(text).toContain("NO RESULT");
    expect(text).toContain("No indicator sheet has been recorded");
  });

  it("other test kinds keep their thermometric findings", async () => {
    const { text } = await render("thermo", buildReportModel({ scenario: "pass" }));
    expect(text).toContain("Checks against the acceptance limits");
    expect(text).not.toContain("INDICATOR SHEET");
  });
});
