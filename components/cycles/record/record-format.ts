import type { Check } from "@/lib/analysis/types";
import type { Dialect, MappingOverrides } from "@/lib/logger-files/types";
import { formatDateTime, formatNumber } from "@/lib/format";
import { formatDuration, formatTemperature, plural, headerWithUnit } from "@/lib/domain";
import { hasZone } from "@/lib/cycles/chart-model";

/** A logger's start time: in the site's zone when the file named a zone, else as the logger's clock showed it. */
export function formatStartedAt(iso: string | null, timeZone: string): string {
  if (!iso) return "—";
  if (hasZone(iso)) return formatDateTime(iso, timeZone);
  return `${formatDateTime(`${iso.trim()}Z`, "UTC")} (logger clock)`;
}

export function formatFigure(value: number | null, unit: Check["unit"]): string {
  if (value === null || !Number.isFinite(value)) return "not measured";
  if (unit === "s") return value >= 120 ? `${formatDuration(value)} (${Math.round(value)} s)` : formatDuration(value);
  if (unit === "K") return `${formatNumber(value, 2)} K`;
  return formatTemperature(value);
}

export function formatLimit(check: Check): string {
  if (check.limit === null) return "—";
  const sign = check.comparison === "at-most" ? "≤" : "≥";
  return `${sign} ${formatFigure(check.limit, check.unit)}`;
}

const DELIMITER_WORDS: Record<string, string> = { ",": "comma", ";": "semicolon", "\t": "tab" };
const LINE_ENDINGS: Record<string, string> = { crlf: "CRLF", lf: "LF", cr: "CR" };

export function describeDialect(dialect: Dialect | null): string {
  if (!dialect) return "Not a logger file (kept as an attachment).";
  const parts = [
    dialect.encoding,
    `${DELIMITER_WORDS[dialect.delimiter] ?? dialect.delimiter}-separated`,
    dialect.decimal === "," ? "decimal comma" : "decimal point",
    `${LINE_ENDINGS[dialect.lineEnding] ?? dialect.lineEnding} line endings`,
  ];
  if (dialect.preambleLines > 0) parts.push(plural(dialect.preambleLines, "preamble line"));
  parts.push(dialect.headerLine ? `header on line ${dialect.headerLine}` : "no header line");
  parts.push(`times as ${String(dialect.timeFormat).replace(/-/g, " ")}`);
  if (dialect.quoted) parts.push("quoted cells");
  return parts.join(" · ");
}

export function describeMapping(mapping: MappingOverrides | null): string[] {
  if (!mapping) return [];
  const lines: string[] = [];
  if (mapping.timeColumn) lines.push(`Time: ${mapping.timeColumn}`);
  if (mapping.referenceColumn) lines.push(`Reference channel: ${mapping.referenceColumn}`);
  if (mapping.pressureColumn || mapping.pressureUnit || mapping.pressureGauge !== undefined) {
    const unit = mapping.pressureUnit ? ` in ${mapping.pressureUnit}` : "";
    const gauge = mapping.pressureGauge === undefined ? "" : mapping.pressureGauge ? ", gauge" : ", absolute";
    lines.push(`Pressure: ${mapping.pressureColumn ?? "as guessed"}${unit}${gauge}`);
  }
  if (mapping.temperatureUnit) lines.push(`Temperatures in ${mapping.temperatureUnit === "C" ? "°C" : mapping.temperatureUnit === "F" ? "°F" : "K"}`);
  for (const [header, o] of Object.entries(mapping.columns ?? {})) {
    const unit = [o.unit, o.gauge === undefined ? null : o.gauge ? "gauge" : "abs"].filter(Boolean).join(" ");
    lines.push(`${unit ? headerWithUnit(header, unit) : header}: ${o.role}`);
  }
  if (mapping.atmosphereKpa !== undefined) lines.push(`Atmosphere for gauge readings: ${formatNumber(mapping.atmosphereKpa, 3)} kPa`);
  return lines;
}

const ACTION_WORDS: Record<string, string> = {
  "cycle.create": "Registered and analysed",
  "cycle.reanalyse": "Analysed again",
  "cycle.submit": "Submitted for review",
  "cycle.sign.reviewed": "Signed as reviewed",
  "cycle.sign.approved": "Approved (signed)",
  "cycle.sign.failure-confirmed": "Failure confirmed (signed)",
  "cycle.sign.returned": "Returned for correction (signed)",
  "cycle.sign.rejected": "Returned for correction (signed as rejected)",
  "cycle.supersede": "Superseded by a new record",
  "report.download": "Report downloaded",
  "report.export-draft": "Draft report exported",
  "report.generate": "Report produced",
};

export function actionLabel(action: string): string {
  return (
    ACTION_WORDS[action] ??
    action
      .replace(/^cycle\./, "")
      .replace(/[.-]/g, " ")
      .replace(/^./, (c) => c.toUpperCase())
  );
}

/** One item of a list in an audit value: a file by its name, another object by its plain values, never "[object Object]". */
function itemText(item: unknown): string {
  if (item === null || typeof item !== "object") return String(item);
  const o = item as Record<string, unknown>;
  if (typeof o.name === "string") return o.name;
  const plain = Object.values(o).filter((v) => v !== null && (typeof v === "string" || typeof v === "number" || typeof v === "boolean"));
  return plain.length ? plain.map(String).join(" ") : "…";
}

/** A short, readable line from an audit event's JSON value; the full JSON stays available beside it. */
export function summariseAuditValue(json: string | null): string | null {
  if (!json) return null;
  try {
    const value = JSON.parse(json) as unknown;
    if (value === null || typeof value !== "object") return String(value);
    const entries = Object.entries(value as Record<string, unknown>)
      .filter(([, v]) => v !== null && v !== undefined && (typeof v !== "object" || Array.isArray(v)))
      .slice(0, 5)
      .map(([k, v]) => `${k}: ${Array.isArray(v) ? v.map(itemText).join(", ") : String(v)}`);
    return entries.length ? entries.join(" · ") : null;
  } catch {
    return json.length > 120 ? `${json.slice(0, 117)}…` : json;
  }
}
