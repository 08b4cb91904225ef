"use client";

import { PRESSURE_UNITS, TEMPERATURE_UNIT_SYMBOL, TEMPERATURE_UNITS } from "@/lib/steam/units";
import type { EditableColumn } from "@/lib/validations/intake";

export type MappedColumn = EditableColumn & {
  /** what the guess was unsure of, as the server said it */
  unsure: string[];
  /** the user changed this column */
  edited: boolean;
};

const ROLE_LABELS: Record<EditableColumn["role"], string> = {
  time: "Time",
  temperature: "Temperature",
  pressure: "Pressure",
  ignored: "Ignored",
};

const ELAPSED_UNITS = [
  { value: "s", label: "seconds" },
  { value: "min", label: "minutes" },
  { value: "h", label: "hours" },
  { value: "ms", label: "milliseconds" },
];

const REFERENCE_RE = /drain|ref/i;

/** Applies a change to one column and keeps the mapping coherent: one time column, one pressure column. */
export function changeColumn(columns: MappedColumn[], index: number, patch: Partial<EditableColumn>): MappedColumn[] {
  return columns.map((c) => {
    if (c.index === index) {
      const next: MappedColumn = { ...c, ...patch, edited: true };
      if (patch.role && patch.role !== c.role) {
        if (patch.role === "temperature") next.unit = "C";
        else if (patch.role === "pressure") {
          next.unit = "kPa";
          next.gauge = false;
        } else if (patch.role === "time") next.unit = "s";
        else next.unit = null;
        if (patch.role !== "pressure") next.gauge = false;
      }
      return next;
    }
    // A second time or pressure column would be refused by the server: the old one steps aside.
    if (patch.role && (patch.role === "time" || patch.role === "pressure") && c.role === patch.role) {
      return { ...c, role: "ignored", unit: null, gauge: false, edited: true };
    }
    return c;
  });
}

/** The reference channel after a change: kept when still a temperature column, else the drain-like or first one. */
export function settleReference(columns: readonly MappedColumn[], current: string | null): string | null {
  const temperatures = columns.filter((c) => c.role === "temperature");
  if (current && temperatures.some((c) => c.header === current)) return current;
  return (temperatures.find((c) => REFERENCE_RE.test(c.header)) ?? temperatures[0])?.header ?? null;
}

function UnitSelect({ column, onChange, id }: { column: MappedColumn; onChange: (patch: Partial<EditableColumn>) => void; id: string }) {
  if (column.role === "ignored") return <span className="text-2xs text-ink-faint">—</span>;
  if (column.role === "time") {
    return (
      <select id={id} aria-label={`Time unit of ${column.header}`} className="field-input px-1.5 py-1 text-xs" value={column.unit ?? ""} onChange={(e) => onChange({ unit: e.target.value || null })}>
        <option value="">date and time</option>
        {ELAPSED_UNITS.map((u) => (
          <option key={u.value} value={u.value}>
            elapsed {u.label}
          </option>
        ))}
      </select>
    );
  }
  if (column.role === "temperature") {
    return (
      <select id={id} aria-label={`Unit of ${column.header}`} className="field-input px-1.5 py-1 text-xs" value={column.unit ?? ""} onChange={(e) => onChange({ unit: e.target.value })}>
        {!column.unit && <option value="">choose…</option>}
        {TEMPERATURE_UNITS.map((u) => (
          <option key={u} value={u}>
            {TEMPERATURE_UNIT_SYMBOL[u]}
          </option>
        ))}
      </select>
    );
  }
  return (
    <select id={id} aria-label={`Unit of ${column.header}`} className="field-input px-1.5 py-1 text-xs" value={column.unit ?? ""} onChange={(e) => onChange({ unit: e.target.value })}>
      {!column.unit && <option value="">choose…</option>}
      {PRESSURE_UNITS.map((u) => (
        <option key={u} value={u}>
          {u}
        </option>
      ))}
    </select>
  );
}

export function MappingTable({
  columns,
  referenceColumn,
  preview,
  rowCount,
  onColumnChange,
  onReferenceChange,
  idPrefix,
  guessedReference,
}: {
  columns: MappedColumn[];
  referenceColumn: string | null;
  preview: { header: string[]; rows: string[][] };
  rowCount: number;
  onColumnChange: (index: number, patch: Partial<EditableColumn>) => void;
  onReferenceChange: (header: string) => void;
  idPrefix: string;
  /** the reference channel the server guessed; reasons about it are settled once the user picks another */
  guessedReference: string | null;
}) {
  const temperatures = columns.filter((c) => c.role === "temperature");
  const time = columns.find((c) => c.role === "time");
  const pressure = columns.find((c) => c.role === "pressure");
  const referenceSettled = referenceColumn !== guessedReference;
  return (
    <div>
      <div className="mb-3 flex flex-wrap items-end gap-4">
        <div>
          <label className="field-label" htmlFor={`${idPrefix}-reference`}>
            Reference channel (chamber drain)
          </label>
          <select id={`${idPrefix}-reference`} className="field-input min-w-56" value={referenceColumn ?? ""} onChange={(e) => onReferenceChange(e.target.value)}>
            {temperatures.length === 0 && <option value="">no temperature column yet</option>}
            {temperatures.map((c) => (
              <option key={c.index} value={c.header}>
                {c.header}
              </option>
            ))}
          </select>
        </div>
        <p className="max-w-xl pb-2 text-xs text-ink-muted">
          The plateau starts when the reference channel reaches the sterilization temperature, and the saturation check compares it with the steam temperature computed from the chamber pressure.
        </p>
      </div>
      <p className="mb-2 text-sm" data-testid="mapping-summary">
        <span className="text-ink-muted">Time:</span> <span className="mono">{time?.header ?? "none"}</span>
        <span className="text-ink-muted"> · Chamber pressure:</span>{" "}
        <span className="mono">{pressure ? `${pressure.header} (${pressure.unit ?? "unit?"} ${pressure.gauge ? "gauge" : "abs"})` : "none"}</span>
        <span className="text-ink-muted"> · Temperatures:</span> {temperatures.length}
        <span className="text-ink-muted"> · Reference:</span> <span className="mono">{referenceColumn ?? "none"}</span>
      </p>
      <div className="overflow-x-auto rounded-md border border-ink-line">
        <table className="data-table" data-testid="mapping-table">
          <thead className="bg-paper-sunk/60">
            <tr>
              {columns.map((c) => {
                const isReference = c.role === "temperature" && c.header === referenceColumn;
                return (
                  <th key={c.index} scope="col" className="min-w-36 align-top normal-case tracking-normal" data-column={c.header}>
                    <div className="mb-1.5 flex items-center gap-1.5 text-xs font-semibold text-ink">
                      <span className="mono break-all">{c.header || `Column ${c.index + 1}`}</span>
                      {isReference && <span className="rounded bg-steam-100 px-1 text-2xs font-medium text-steam-700">reference</span>}
                    </div>
                    <div className="space-y-1 font-normal">
                      <select
                        aria-label={`Role of ${c.header}`}
                        className="field-input px-1.5 py-1 text-xs"
                        value={c.role}
                        onChange={(e) => onColumnChange(c.index, { role: e.target.value as EditableColumn["role"] })}
                      >
                        {(Object.keys(ROLE_LABELS) as EditableColumn["role"][]).map((r) => (
                          <option key={r} value={r}>
                            {ROLE_LABELS[r]}
                          </option>
                        ))}
                      </select>
                      <UnitSelect id={`${idPrefix}-unit-${c.index}`} column={c} onChange={(patch) => onColumnChange(c.index, patch)} />
                      {c.role === "pressure" && (
                        <div className="flex gap-2 text-xs" role="radiogroup" aria-label={`Gauge or absolute: ${c.header}`}>
                          <label className="flex items-center gap-1">
                            <input type="radio" name={`${idPrefix}-gauge-${c.index}`} checked={!c.gauge} onChange={() => onColumnChange(c.index, { gauge: false })} />
                            absolute
                          </label>
                          <label className="flex items-center gap-1">
                            <input type="radio" name={`${idPrefix}-gauge-${c.index}`} checked={c.gauge} onChange={() => onColumnChange(c.index, { gauge: true })} />
                            gauge
                          </label>
                        </div>
                      )}
                      {c.unsure.length > 0 && (
                        <ul className="space-y-0.5" aria-label={`What the guess was unsure of for ${c.header}`}>
                          {c.unsure.map((reason) => (
                            <li key={reason} className={`text-2xs leading-snug ${c.edited || (referenceSettled && /reference/i.test(reason)) ? "text-ink-muted" : "text-caution-700"}`}>
                              <span aria-hidden="true">⚠ </span>
                              {reason}
                            </li>
                          ))}
                        </ul>
                      )}
                      {c.edited && <p className="text-2xs text-steam-700">changed by you</p>}
                    </div>
                  </th>
                );
              })}
            </tr>
          </thead>
          <tbody>
            {preview.rows.map((row, r) => (
              <tr key={r}>
                {columns.map((c) => (
                  <td key={c.index} className={`mono whitespace-nowrap ${c.role === "ignored" ? "text-ink-faint" : ""}`}>
                    {row[c.index] ?? ""}
                  </td>
                ))}
              </tr>
            ))}
          </tbody>
        </table>
      </div>
      <p className="mt-2 text-xs text-ink-muted">
        The first {preview.rows.length} of {rowCount.toLocaleString("en-GB")} data rows.
      </p>
    </div>
  );
}
