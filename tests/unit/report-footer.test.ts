import { execFileSync } from "node:child_process";
import { mkdirSync, mkdtempSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import path from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { renderCycleReport } from "@/lib/reports";
import { breakReportNumber } from "@/lib/reports/footer";
import { buildReportModel } from "@/tests/fixtures/reports/model";

// The footer is read back as poppler's pdftotext -bbox sees it (Debian poppler-utils): each word with its box in points.
const work = mkdtempSync(path.join(tmpdir(), "papin-footer-"));
const pagesDir = path.join(process.cwd(), "test-results", "report-pages");
afterAll(() => rmSync(work, { recursive: true, force: true }));

// Long values of the kind that ran into each other: a report number as reportNumberFor() builds it from a long serial
// number, a long site name, a long sterilizer name and cycle number.
const LONG_REPORT_NUMBER = "PR-MBG-SSD-PL-0523-LONG-SERIAL-20261112073000-3F9A2C";
const LONG_SITE = "Marlow Bridge General Hospital NHS Foundation Trust — Central Sterile Services Department, Riverside Works";
const LONG_STERILIZER = "Porous load 2 (double-door, 12 modules, bay 2)";
const LONG_CYCLE = "P2-20261112-0009-REPEAT";

type Word = { xMin: number; yMin: number; xMax: number; yMax: number; text: string };
let pdfFile: string;
let pages: number;

function wordsOf(page: number): Word[] {
  const html = execFileSync("pdftotext", ["-bbox", "-f", String(page), "-l", String(page), pdfFile, "-"], { encoding: "utf8" });
  return [...html.matchAll(/<word xMin="([\d.]+)" yMin="([\d.]+)" xMax="([\d.]+)" yMax="([\d.]+)">([^<]*)<\/word>/g)].map((m) => ({
    xMin: Number(m[1]),
    yMin: Number(m[2]),
    xMax: Number(m[3]),
    yMax: Number(m[4]),
    text: m[5],
  }));
}

beforeAll(async () => {
  const model = buildReportModel({ scenario: "pass" });
  model.reportNumber = LONG_REPORT_NUMBER;
  model.detail = { ...model.detail, cycleNumber: LONG_CYCLE, site: { ...model.detail.site, name: LONG_SITE }, sterilizer: { ...model.detail.sterilizer, name: LONG_STERILIZER } };
  pdfFile = path.join(work, "long-footer.pdf");
  writeFileSync(pdfFile, await renderCycleReport(model));
  pages = Number(/Pages:\s+(\d+)/.exec(execFileSync("pdfinfo", [pdfFile], { encoding: "utf8" }))?.[1]);
  // A PNG of the first and last page at 100 dpi for a person to look at (test-results/report-pages/long-footer-*.png).
  mkdirSync(pagesDir, { recursive: true });
  execFileSync("pdftoppm", ["-png", "-r", "100", "-f", "1", "-l", "1", pdfFile, path.join(pagesDir, "long-footer-first")]);
  execFileSync("pdftoppm", ["-png", "-r", "100", "-f", String(pages), "-l", String(pages), pdfFile, path.join(pagesDir, "long-footer-last")]);
  // The footer strip alone at 150 dpi: from 40 pt above the bottom edge (1671 px of 1754).
  execFileSync("pdftoppm", ["-png", "-r", "150", "-f", "1", "-l", "1", "-x", "0", "-y", "1671", "-W", "1241", "-H", "83", pdfFile, path.join(pagesDir, "long-footer-strip")]);
}, 120_000);

describe("the report footer with long values", () => {
  it("keeps report number, subject and page count in columns that do not overlap, on every page", () => {
    expect(pages).toBeGreaterThanOrEqual(2);
    // A4 is 841.89 pt high (ISO 216); the footer starts 34 pt above the bottom edge.
    const footerTop = 841.89 - 34 - 1;
    for (let page = 1; page <= pages; page++) {
      const footer = wordsOf(page).filter((w) => w.yMin >= footerTop);
      const pageWord = footer.findIndex((w) => w.text === "Page");
      expect(footer.slice(pageWord).map((w) => w.text)).toEqual(["Page", String(page), "of", String(pages)]);
      // pdftotext gives the words in the order they are drawn: the report number's, then the subject's, then the page count.
      let numberEnd = 0;
      while (
        footer
          .slice(0, numberEnd)
          .map((w) => w.text)
          .join("").length < LONG_REPORT_NUMBER.length
      )
        numberEnd++;
      const numberWords = footer.slice(0, numberEnd);
      expect(numberWords.map((w) => w.text).join("")).toBe(LONG_REPORT_NUMBER);
      const subjectWords = footer.slice(numberEnd, pageWord);
      expect(subjectWords.slice(0, 2).map((w) => w.text)).toEqual(["Cycle", LONG_CYCLE]);
      const pageWords = footer.slice(pageWord);
      const right = (ws: Word[]) => Math.max(...ws.map((w) => w.xMax));
      const left = (ws: Word[]) => Math.min(...ws.map((w) => w.xMin));
      expect(right(numberWords)).toBeLessThan(left(subjectWords));
      expect(right(subjectWords)).toBeLessThan(left(pageWords));
      // Nothing below the page's bottom edge.
      expect(Math.max(...footer.map((w) => w.yMax))).toBeLessThan(841.89);
    }
  });

  it("prints the whole report number and the start of the subject", () => {
    const text = execFileSync("pdftotext", ["-f", "1", "-l", "1", pdfFile, "-"], { encoding: "utf8" }).replace(/\s+/g, " ");
    expect(text.replace(/ /g, "")).toContain(LONG_REPORT_NUMBER);
    expect(text).toContain(`Cycle ${LONG_CYCLE} · ${LONG_STERILIZER} · Marlow Bridge General Hospital NHS Foundation Trust`);
  });
});

describe("breakReportNumber", () => {
  it("breaks after hyphens so each line fits, and keeps every character", () => {
    // 36 characters per line: 150 pt / (0.6 em × 6.8 pt) = 36.8 (worked by hand).
    expect(breakReportNumber(LONG_REPORT_NUMBER)).toBe("PR-MBG-SSD-PL-0523-LONG-SERIAL-\n20261112073000-3F9A2C");
    expect(breakReportNumber("PR-MB-PL-0417-20261112073000-3F9A2C")).toBe("PR-MB-PL-0417-20261112073000-3F9A2C");
    expect(breakReportNumber("ABCDEFGHIJ", 4)).toBe("ABCD\nEFGH\nIJ");
  });
});
