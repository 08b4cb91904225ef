import { readdirSync, readFileSync } from "node:fs";
import path from "node:path";
import { describe, expect, it } from "vitest";
import {
  CYCLE_STATUS_LABELS,
  CYCLE_STATUSES,
  formatDuration,
  formatPressure,
  formatTemperature,
  INSTRUMENT_KIND_LABELS,
  INSTRUMENT_KINDS,
  PERIODIC_TEST_KINDS,
  ROLE_LABELS,
  ROLES,
  TEST_KINDS,
  testKindLabel,
} from "@/lib/domain";

const DOMAIN_DIR = path.join(process.cwd(), "lib/domain");

describe("lib/domain", () => {
  it("imports nothing outside its own folder, so the schema, the server and the browser can all take it", () => {
    for (const file of readdirSync(DOMAIN_DIR)) {
      const source = readFileSync(path.join(DOMAIN_DIR, file), "utf8");
      const specifiers = [...source.matchAll(/\bfrom\s+"([^"]+)"|\bimport\s*\(\s*"([^"]+)"|^import\s+"([^"]+)"/gm)].map((m) => m[1] ?? m[2] ?? m[3]);
      for (const specifier of specifiers) expect(specifier, `${file} imports ${specifier}`).toMatch(/^\.\/[\w-]+$/);
    }
  });

  it("has one word for every role, cycle status, instrument kind and test kind", () => {
    for (const role of ROLES) expect(ROLE_LABELS[role]).toMatch(/^[A-Z]/);
    for (const status of CYCLE_STATUSES) expect(CYCLE_STATUS_LABELS[status]).toMatch(/^[A-Z]/);
    for (const kind of INSTRUMENT_KINDS) expect(INSTRUMENT_KIND_LABELS[kind]).toMatch(/^[A-Z]/);
    for (const kind of [...TEST_KINDS, ...PERIODIC_TEST_KINDS]) expect(testKindLabel(kind)).toMatch(/^[A-Z][a-z]+[ -]/);
  });

  it("names the test kinds in the trade's words and spells out a kind it does not know", () => {
    expect(testKindLabel("bowie-dick")).toBe("Bowie-Dick test");
    expect(testKindLabel("air-leakage")).toBe("Air leakage test");
    expect(testKindLabel("steam-quality")).toBe("Steam quality test");
    expect(testKindLabel("steam-superheat")).toBe("Steam quality: superheat");
    expect(testKindLabel("vacuum_hold-check")).toBe("Vacuum hold check");
    expect(testKindLabel("toString")).toBe("ToString");
  });
});

describe("one formatter per quantity", () => {
  it("writes durations the way a technician reads them", () => {
    expect(formatDuration(8)).toBe("8.0 s");
    expect(formatDuration(95)).toBe("95 s");
    expect(formatDuration(185)).toBe("3 min 05 s");
    // EN 285's 134 °C holding time of 3 min [DOMAIN.md §2.2] prints as minutes and seconds.
    expect(formatDuration(180)).toBe("3 min 00 s");
    // Rounds the whole duration first, so 179.6 s never prints as "2 min 60 s".
    expect(formatDuration(179.6)).toBe("3 min 00 s");
    expect(formatDuration(7440)).toBe("2 h 04 min");
    expect(formatDuration(-12)).toBe("−12 s");
    expect(formatDuration(null)).toBe("—");
    expect(formatDuration(Number.NaN)).toBe("—");
  });

  it("writes temperatures in °C with a true minus sign", () => {
    expect(formatTemperature(134)).toBe("134.00 °C");
    expect(formatTemperature(121.1, 1)).toBe("121.1 °C");
    expect(formatTemperature(-0.5, 1)).toBe("−0.5 °C");
    expect(formatTemperature(undefined)).toBe("—");
  });

  it("writes pressures in kPa with their reference when it matters", () => {
    // 134 °C saturates at 304.20 kPa abs [DOMAIN.md §1.4, IF97 computed].
    expect(formatPressure(304.1989, { reference: "abs" })).toBe("304.2 kPa abs");
    expect(formatPressure(202.87, { digits: 2, reference: "gauge" })).toBe("202.87 kPa gauge");
    expect(formatPressure(101.325, { digits: 3 })).toBe("101.325 kPa");
    expect(formatPressure(null)).toBe("—");
  });
});
