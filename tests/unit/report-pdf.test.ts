import { execFileSync } from "node:child_process";
import { createHash } from "node:crypto";
import { mkdirSync, mkdtempSync, readFileSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import path from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { renderCycleReport, type ReportModel } from "@/lib/reports";
import { buildReportModel, FIRST_FILE, SIGNER, type ThermometricReportModel } from "@/tests/fixtures/reports/model";
import { basisNoteFor } from "@/lib/domain";
import { SAFETY_NOTES } from "@/lib/safety";

// Reports are read back as a person's tools read them: poppler's pdftotext, pdffonts, pdfinfo,
// pdfimages and pdftoppm (Debian poppler-utils).
const work = mkdtempSync(path.join(tmpdir(), "papin-report-"));
const pagesDir = path.join(process.cwd(), "test-results", "report-pages");

function poppler(tool: string, args: string[]): string {
  return execFileSync(tool, args, { encoding: "utf8", maxBuffer: 64 * 1024 * 1024 });
}
const sha256 = (b: Uint8Array) => createHash("sha256").update(b).digest("hex");
const squash = (text: string) => text.replace(/\s+/g, " ").trim();

type Rendered = { pdf: Buffer; file: string; text: string; pages: number };

async function render(name: string, model: ReportModel): Promise<Rendered> {
  const pdf = await renderCycleReport(model);
  const file = path.join(work, `${name}.pdf`);
  writeFileSync(file, pdf);
  const pages = Number(/Pages:\s+(\d+)/.exec(poppler("pdfinfo", [file]))?.[1]);
  return { pdf, file, text: squash(poppler("pdftotext", [file, "-"])), pages };
}

function pageText(r: Rendered, page: number): string {
  return squash(poppler("pdftotext", ["-f", String(page), "-l", String(page), r.file, "-"]));
}

/** PNG pages for a person to look at (test-results/report-pages/), with their pixel sizes. */
function pngPages(r: Rendered, name: string): Array<{ file: string; width: number; height: number; bytes: number }> {
  mkdirSync(pagesDir, { recursive: true });
  const prefix = path.join(pagesDir, name);
  poppler("pdftoppm", ["-png", "-r", "60", "-f", "1", "-l", "2", r.file, prefix]);
  const digits = String(r.pages).length;
  return [1, 2].map((n) => {
    const file = `${prefix}-${String(n).padStart(digits, "0")}.png`;
    const png = readFileSync(file);
    return { file, width: png.readUInt32BE(16), height: png.readUInt32BE(20), bytes: png.length };
  });
}

let pass: Rendered;
let passModel: ThermometricReportModel;
let air: Rendered;
let airModel: ThermometricReportModel;
let draft: Rendered;
let draftModel: ThermometricReportModel;
let bench: Rendered;
let benchModel: ThermometricReportModel;

beforeAll(async () => {
  passModel = buildReportModel({ scenario: "pass" });
  airModel = buildReportModel({ scenario: "air" });
  pass = await render("pass", passModel);
  air = await render("air", airModel);
  draftModel = buildReportModel({ scenario: "slow-equilibration", draft: true });
  draft = await render("draft", draftModel);
  benchModel = buildReportModel({ scenario: "pass", benchtop: true });
  bench = await render("benchtop", benchModel);
}, 120_000);

afterAll(() => rmSync(work, { recursive: true, force: true }));

describe("the cycle report of a passing, approved cycle", () => {
  it("names the site, the sterilizer, the cycle, the test and the load, with the site's time zone", () => {
    const { detail } = passModel;
    for (const text of [
      detail.site.name,
      detail.sterilizer.name,
      `Serial number ${detail.sterilizer.serialNumber}`,
      "Chamber volume 336 l",
      `Cycle number ${detail.cycleNumber}`,
      "Thermometric test, small load",
      detail.loadDescription,
      "Site time zone Europe/London",
      // The file starts 07:30:00 UTC on 3 March 2025; the UK keeps GMT (UTC+0) until the last
      // Sunday of March (Summer Time Act 1972, as amended) [common practice].
      "Started (site) 3 Mar 2025 07:30:00 GMT (Europe/London)",
      "Started (UTC) 2025-03-03 07:30:00 UTC",
    ]) {
      expect(pass.text).toContain(squash(text));
    }
  });

  it("puts the verdict, big and plain, with the analysis summary on the first page", () => {
    const first = pageText(pass, 1);
    expect(first).toMatch(/VERDICT .*\bPASS\b/);
    expect(first).toContain(squash(passModel.detail.analysis!.summary));
    expect(first).not.toContain("FAIL");
  });

  it("lists every check with measured value, limit and the basis of the limit", () => {
    for (const check of passModel.detail.analysis!.checks) {
      expect(pass.text).toContain(squash(check.label));
      expect(pass.text).toContain(squash(basisNoteFor(check.id, "en-285", null, 134)));
    }
    expect(pass.text).toContain('Limits as configured in the acceptance profile "Porous load 134 °C / 3 min", basis EN 285: porous-load figures.');
    // Holding 180 s at 134 °C is EN 285's minimum for that temperature [DOMAIN.md §2.3]; the limit prints as a duration.
    expect(pass.text).toContain("at least 3 min 00 s");
    expect(pass.text).toContain("at most 15 s");
    expect(pass.text).toContain("within ±2.0 K");
  });

  it("prints plateau start and end as elapsed time with the site's clock time beside it", () => {
    const plateau = passModel.detail.analysis!.plateau!;
    const clock = (s: number) => new Date(Date.parse(passModel.detail.startedAt!) + s * 1000).toISOString().slice(11, 19);
    // 3 March 2025 is before the UK's change to BST, so the London clock reads UTC (GMT) [common practice].
    const elapsed = (s: number) => `${String(Math.floor(s / 60)).padStart(2, "0")}:${String(Math.round(s % 60)).padStart(2, "0")}`;
    expect(pageText(pass, 1)).toContain(`${elapsed(plateau.start)}–${elapsed(plateau.end)}`);
    expect(pageText(pass, 1)).toContain(`${clock(plateau.start)}–${clock(plateau.end)} site time`);
  });

  it("carries the chart legend and the phase diagram with its liquid and vapour sides named", () => {
    for (const text of [
      "The cycle against time",
      "Temperature (°C)",
      "Chamber pressure (kPa abs)",
      "Saturation temperature from chamber pressure (IAPWS-IF97)",
      "Sterilization band 134.0 to 137.0 °C",
      "plateau start",
      "plateau end",
      "Phase diagram of water",
      "LIQUID",
      "VAPOUR",
    ]) {
      expect(pass.text).toContain(text);
    }
  });

  it("draws its charts as vectors: the PDF holds no raster image", () => {
    const list = poppler("pdfimages", ["-list", pass.file]).trim().split("\n");
    expect(list.length).toBe(2); // pdfimages prints a two-line header and one line per image
  });

  it("tabulates each channel during holding with its F0", () => {
    for (const channel of passModel.detail.analysis!.channels) {
      expect(pass.text).toContain(channel.header);
      expect(pass.text).toContain(channel.f0.toFixed(2));
    }
  });

  it("names the instrument and the logger file with its size and SHA-256", () => {
    const [file] = passModel.detail.files;
    expect(pass.text).toContain("Twelve-channel thermometric logger");
    expect(pass.text).toContain(file.name);
    expect(pass.text).toContain(`${file.size.toLocaleString("en-GB")} bytes`);
    expect(pass.text).toContain(`SHA-256 ${file.sha256}`);
  });

  it("shows each signature's printed name, role, meaning, UTC and site time and bundle hash (21 CFR 11.50)", () => {
    expect(pass.text).toContain(SIGNER.engineer);
    expect(pass.text).toContain(SIGNER.reviewer);
    expect(pass.text).toContain("Approved: the signer approves this record and its verdict.");
    expect(pass.text).toContain("Reviewed: the signer has reviewed this record and its analysis.");
    expect(pass.text).toContain("Signed 2025-03-03 10:12:41 UTC 3 Mar 2025 10:12:41 GMT (Europe/London)");
    for (const sig of passModel.detail.signatures) expect(pass.text).toContain(`Bundle SHA-256 ${sig.bundleHash}`);
  });

  it("prints the general safety cautions and defers to local codes and licensed practice", () => {
    for (const text of [
      "competent person",
      "written scheme of examination",
      "Door interlocks",
      "Hot liquids on exhaust",
      "does not replace the sterilizer's own controls",
      "licensed engineering practice",
    ]) {
      expect(pass.text).toContain(text);
    }
  });

  it("gives the report's number and how to verify it, and is not marked as a draft", () => {
    expect(poppler("pdftotext", ["-layout", pass.file, "-"])).toMatch(/Report number\s+PR-2025-000117/);
    expect(pass.text).toContain("Drop this PDF on Signed archive › Check a report in Papin, or POST it to /api/reports/verify");
    expect(pass.text).not.toContain("DRAFT");
  });

  it("has the report number and 'Page X of Y' on every page", () => {
    expect(pass.pages).toBeGreaterThanOrEqual(3);
    for (let page = 1; page <= pass.pages; page++) {
      const text = pageText(pass, page);
      expect(text).toContain(`Page ${page} of ${pass.pages}`);
      expect(text).toContain("PR-2025-000117");
    }
  });

  it("uses only the shipped fonts, embedded, so no glyph falls back to a box or a stand-in face", () => {
    const rows = poppler("pdffonts", [pass.file]).trim().split("\n").slice(2);
    expect(rows.length).toBeGreaterThanOrEqual(3);
    for (const row of rows) {
      expect(row).toMatch(/^[A-Z]{6}\+(Inter|JetBrainsMono)-\S+\s+CID TrueType\s+Identity-H\s+yes yes yes/);
    }
    // Characters the latin subsets carry come through as themselves.
    expect(pass.text).toContain("°C");
    expect(pass.text).toContain("±2.0 K");
    expect(pass.text).toContain("— Sterile Services");
  });

  it("is an A4 PDF dated from generatedAt, made by Papin", () => {
    const info = poppler("pdfinfo", ["-isodates", pass.file]);
    expect(info).toMatch(/Page size:\s+595\.28 x 841\.89 pts \(A4\)/);
    expect(info).toMatch(/CreationDate:\s+2025-03-03T10:12:45Z/);
    expect(info).toMatch(/Creator:\s+Papin/);
    expect(info).toMatch(/Producer:\s+Papin/);
  });
});

describe("the report of a benchtop judged under EN 13060", () => {
  it("names EN 13060 as the basis and never describes the cycle with EN 285 wording", () => {
    expect(bench.text).toContain("basis EN 13060: type B cycle, chamber under 60 l.");
    expect(bench.text).toMatch(/Acceptance profile .*, basis EN 13060/);
    for (const check of benchModel.detail.analysis!.checks) expect(bench.text).toContain(squash(basisNoteFor(check.id, "en-13060", null, 134)));
    // The general safety caution lists the standards by name; the rest of the report must not mention EN 285.
    const withoutCaution = SAFETY_NOTES.reduce((text, note) => text.replace(squash(note.text), ""), bench.text);
    expect(withoutCaution).not.toMatch(/EN ?285/);
  });
});

describe("the report's bytes", () => {
  it("are the same for two renders of the same model, so an archived report can be checked by its hash", async () => {
    const again = await renderCycleReport(passModel);
    expect(sha256(again)).toBe(sha256(pass.pdf));
    expect(again.equals(pass.pdf)).toBe(true);
  });

  it("do not depend on the server's time zone", async () => {
    const before = process.env.TZ;
    process.env.TZ = "America/New_York";
    try {
      expect(new Date(2025, 0, 1).getTimezoneOffset()).toBe(300); // EST is UTC−5 [common practice]
      expect(sha256(await renderCycleReport(passModel))).toBe(sha256(pass.pdf));
    } finally {
      if (before === undefined) delete process.env.TZ;
      else process.env.TZ = before;
    }
  });

  it("change with generatedAt, which the PDF carries as its date and file identifier", async () => {
    const later = await renderCycleReport({ ...passModel, generatedAt: "2025-03-03T10:12:46.000Z" });
    expect(sha256(later)).not.toBe(sha256(pass.pdf));
  });

  it("refuse a generatedAt that is not a date, saying which value", async () => {
    await expect(renderCycleReport({ ...passModel, generatedAt: "yesterday" })).rejects.toThrow('generatedAt "yesterday" is not a date');
  });
});

describe("the report of a failing cycle (air in the chamber)", () => {
  it("says FAIL and explains what failed on the first page", () => {
    const first = pageText(air, 1);
    expect(first).toMatch(/VERDICT .*\bFAIL\b/);
    expect(first).toContain("What failed and why");
    expect(first).toContain("1 saturation flag: colder than saturated steam");
  });

  it("marks the failed check in the checks table", () => {
    expect(air.text).toMatch(/Reference agrees with saturated steam FAIL/);
  });

  it("lists each saturation flag with its diagnosis", () => {
    const flags = airModel.detail.analysis!.saturation.flags;
    expect(flags.length).toBeGreaterThan(0);
    flags.forEach((flag, i) => {
      expect(air.text).toContain(`Flag ${i + 1}: Colder than saturated steam`);
      expect(air.text).toContain(squash(flag.diagnosis));
    });
    // The simulated leak reads colder than saturation: air or other non-condensable gas [DOMAIN.md §2].
    expect(air.text).toContain("non-condensable");
  });

  it("is archived as a signed failure: FAIL, failure confirmed by whom and when, with the reason", () => {
    expect(pageText(air, 1)).toContain("FAIL · FAILURE CONFIRMED");
    // The fixture's signature: 2025-03-03 10:12:41 UTC is 10:12:41 GMT in London in March [worked by hand: no summer time before 30 March 2025].
    expect(air.text).toContain(`Failure confirmed by ${SIGNER.engineer} (Engineer (authorised person, decontamination)) on 3 Mar 2025 10:12:41 GMT (Europe/London)`);
    expect(air.text).toContain("Status: Failure confirmed: closed as a signed failure");
    expect(air.text).toContain("Failure confirmed: the signer confirms that this test failed");
    expect(air.text).toContain("Reason: Air in the chamber during the plateau");
    expect(air.text).not.toContain("DRAFT");
  });
});

describe("the report of a corrected cycle (logger file replaced after the first analysis)", () => {
  let replaced: Rendered;
  beforeAll(async () => {
    replaced = await render("replaced", buildReportModel({ scenario: "pass", replaced: true }));
  }, 60_000);

  it("states the replacement on the first page with the first file's SHA-256 and how the recordings differ", () => {
    expect(pageText(replaced, 1)).toContain(`Logger file replaced after the first analysis; first file SHA-256 ${FIRST_FILE.sha256}`);
    expect(replaced.text).toContain("The recording starts at 2025-03-03T07:30:00.000Z; the first file's started at 2025-03-03T05:10:00.000Z.");
  });

  it("prints the whole history of the analyses: when, who, reason, verdict, file and hash", () => {
    const history = replaced.text.slice(replaced.text.indexOf("History of the analyses"));
    expect(history).toContain(FIRST_FILE.name);
    expect(history).toContain("first analysis");
    expect(history).toContain("replaced with the cycle's own export");
    expect(history).toContain("(current)");
    expect(history).toMatch(/FAIL .*PASS/);
  });

  it("prints the instrument's calibration certificate and due date", () => {
    expect(replaced.text).toContain("Certificate CAL-25-0117");
    expect(replaced.text).toContain("Calibration due 2025-11-12");
  });
});

describe("a draft report", () => {
  it("is marked DRAFT — NOT APPROVED on every page", () => {
    expect(draft.pages).toBeGreaterThanOrEqual(3);
    for (let page = 1; page <= draft.pages; page++) expect(pageText(draft, page)).toContain("DRAFT — NOT APPROVED");
    // The diagonal mark is drawn, not typeset: it must not break up the text a reader copies.
    expect(draft.text).toContain("PAPIN Steam sterilizer cycle report");
    expect(draft.text).toContain("Check Result Measured Limit Basis of the limit");
  });

  it("says it has no signature yet and will not verify as archived", () => {
    expect(draft.text).toContain("No electronic signature yet.");
    expect(draft.text).toContain("a draft never verifies as an archived report");
  });

  it("still carries the slow channel's finding", () => {
    expect(pageText(draft, 1)).toMatch(/VERDICT .*\bFAIL\b/);
    expect(draft.text).toMatch(/Equilibration time FAIL/);
    expect(draft.text).toContain(squash(draftModel.detail.analysis!.diagnoses.find((d) => d.checkId === "equilibration-time")!.text));
  });
});

describe("a cycle with no analysis yet", () => {
  it("renders a report that says there is no verdict rather than failing", async () => {
    const model = buildReportModel({ draft: true });
    const bare: ReportModel = { ...model, detail: { ...model.detail, analysis: null, analysisId: null, analysisHistory: [] } };
    const r = await render("bare", bare);
    expect(r.text).toContain("NOT ANALYSED");
    expect(r.text).toContain("This cycle has no analysis yet, so it has no verdict.");
    expect(r.text).toContain("competent person");
  });
});

describe("a day-long record", () => {
  it("renders 86,400 samples of 16 temperature channels sent at full resolution", async () => {
    const model = buildReportModel({ day: true, points: 86_400 });
    expect(model.series.timesS.length).toBe(86_400);
    const r = await render("day", model);
    expect(r.text).toContain("86,400 samples");
    expect(r.text).toContain(model.series.channels[15].header);
    expect(poppler("pdfimages", ["-list", r.file]).trim().split("\n").length).toBe(2);
  }, 120_000);
});

describe("PNG pages for review", () => {
  // A4 is 210 x 297 mm (ISO 216) = 595.28 x 841.89 pt; at 60 dpi that is 496.1 x 701.6 px, which pdftoppm rounds up.
  it("come out of pdftoppm at A4 size for 60 dpi (497 x 702 px)", () => {
    for (const [name, r] of [
      ["pass", pass],
      ["air", air],
      ["draft", draft],
    ] as const) {
      for (const page of pngPages(r, name)) {
        expect(page.width).toBe(497);
        expect(page.height).toBe(702);
        // A blank white A4 page at 60 dpi compresses to about 2 KB; a page of text and charts is far larger.
        expect(page.bytes).toBeGreaterThan(20_000);
      }
    }
  });
});
