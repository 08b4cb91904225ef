"use client";

import { PRESSURE_UNITS, TEMPERATURE_UNIT_SYMBOL, TEMPERATURE_UNITS } from "@/lib/steam/units";
import type { EditableColumn } from "@/lib/validations/intake";
import type { ChannelPlacement, ChannelPlacements } from "@/lib/domain";
import { PressureReferenceChoice, type GaugeSource } from "./pressure-reference";
import { headerWithUnit } from "@/lib/domain";
import { PositionPicker } from "./position-picker";

export type MappedColumn = EditableColumn & {
  /** what the guess was unsure of, as the server said it */
  unsure: string[];
  /** pressure only: who said absolute or gauge (null while nobody has) */
  gaugeFrom: GaugeSource;
  /** the user changed this column */
  edited: boolean;
};

/** The roles offered per column; "free-space" is a temperature column that is also the free-space sensor. */
export type RoleChoice = EditableColumn["role"] | "free-space";

const ROLE_LABELS: Record<RoleChoice, string> = {
  time: "Time",
  temperature: "Temperature",
  "free-space": "Free space",
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
      if (patch.gauge !== undefined) next.gaugeFrom = "user";
      if (patch.role && patch.role !== c.role) {
        if (patch.role === "temperature") next.unit = "C";
        else if (patch.role === "pressure") next.unit = "kPa";
        else if (patch.role === "time") next.unit = "s";
        else next.unit = null;
        // A column newly marked as pressure waits for the user to say absolute or gauge.
        next.gauge = patch.role === "pressure" ? null : false;
        next.gaugeFrom = null;
      }
      return next;
    }
    // A second time or pressure column would be refused by the server: the old one steps aside.
    if (patch.role && (patch.role === "time" || patch.role === "pressure") && c.role === patch.role) {
      return { ...c, role: "ignored", unit: null, gauge: false, gaugeFrom: null, edited: true };
    }
    return c;
  });
}

/** The reference channel after a change: kept when still a temperature column, else the drain-like or first one; never the free-space sensor. */
export function settleReference(columns: readonly MappedColumn[], current: string | null, freeSpace: string | null = null): string | null {
  const temperatures = columns.filter((c) => c.role === "temperature" && c.header !== freeSpace);
  if (current && temperatures.some((c) => c.header === current)) return current;
  return (temperatures.find((c) => REFERENCE_RE.test(c.header)) ?? temperatures[0])?.header ?? null;
}

/** The free-space sensor after a change: kept while its column is still a temperature, else none. */
export function settleFreeSpace(columns: readonly MappedColumn[], current: string | null): string | null {
  return current && columns.some((c) => c.role === "temperature" && c.header === current) ? current : null;
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
  freeSpaceColumn,
  onRoleChange,
  pressureReferenceError,
  idPrefix,
  guessedReference,
  placements,
  onPlacementChange,
}: {
  /** where each temperature channel's probe sat, by header */
  placements: ChannelPlacements;
  onPlacementChange: (header: string, next: ChannelPlacement | undefined) => void;
  columns: MappedColumn[];
  referenceColumn: string | null;
  /** the temperature column of the free-space sensor, null when there is none */
  freeSpaceColumn: string | null;
  onRoleChange: (index: number, role: RoleChoice) => void;
  /** shown at the pressure column while absolute or gauge is not chosen */
  pressureReferenceError: string | null;
  preview: { header: string[]; rows: string[][] };
  rowCount: number;
  onColumnChange: (index: number, patch: Partial<EditableColumn>) => void;
  onReferenceChange: (header: string) => void;
  idPrefix: string;
  /** the reference channel the server guessed; reasons about it are settled once the user picks another */
  guessedReference: string | null;
}) {
  const temperatures = columns.filter((c) => c.role === "temperature");
  const referenceChoices = temperatures.filter((c) => c.header !== freeSpaceColumn);
  const roleOf = (c: MappedColumn): RoleChoice => (c.role === "temperature" && c.header === freeSpaceColumn ? "free-space" : c.role);
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
            {referenceChoices.length === 0 && <option value="">no temperature column yet</option>}
            {referenceChoices.map((c) => (
              <option key={c.index} value={c.header}>
                {c.header}
              </option>
            ))}
          </select>
        </div>
        <p className="max-w-xl pb-2 text-xs text-ink-muted">
          The plateau starts when the reference channel reaches the sterilization temperature, and the saturation check compares it with the steam temperature computed from the chamber pressure. Give
          each temperature channel the position its probe sat at: a thermometric test without them can be saved as a draft but not approved.
        </p>
      </div>
      <p className="mb-2 text-sm" data-testid="mapping-summary">
        <span className="text-ink-muted">Time:</span> <span className="mono">{time?.header ?? "none"}</span>
        <span className="text-ink-muted"> · Chamber pressure:</span>{" "}
        <span className="mono">
          {pressure ? headerWithUnit(pressure.header, `${pressure.unit ?? "unit?"} ${pressure.gauge === null ? "abs or gauge?" : pressure.gauge ? "gauge" : "abs"}`) : "none"}
        </span>
        <span className="text-ink-muted"> · Temperatures:</span> {temperatures.length}
        <span className="text-ink-muted"> · Reference:</span> <span className="mono">{referenceColumn ?? "none"}</span>
        <span className="text-ink-muted"> · Free space:</span> <span className="mono">{freeSpaceColumn ?? "none"}</span>
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
                      {roleOf(c) === "free-space" && <span className="rounded bg-steam-100 px-1 text-2xs font-medium text-steam-700">free space</span>}
                    </div>
                    <div className="space-y-1 font-normal">
                      <select aria-label={`Role of ${c.header}`} className="field-input px-1.5 py-1 text-xs" value={roleOf(c)} onChange={(e) => onRoleChange(c.index, e.target.value as RoleChoice)}>
                        {(Object.keys(ROLE_LABELS) as RoleChoice[]).map((r) => (
                          <option key={r} value={r}>
                            {ROLE_LABELS[r]}
                          </option>
                        ))}
                      </select>
                      <UnitSelect id={`${idPrefix}-unit-${c.index}`} column={c} onChange={(patch) => onColumnChange(c.index, patch)} />
                      {c.role === "temperature" && (
                        <PositionPicker id={`${idPrefix}-position-${c.index}`} header={c.header} placement={placements[c.header]} onChange={(next) => onPlacementChange(c.header, next)} />
                      )}
                      {c.role === "pressure" && (
                        <PressureReferenceChoice
                          header={c.header}
                          gauge={c.gauge}
                          from={c.gaugeFrom}
                          name={`${idPrefix}-gauge-${c.index}`}
                          error={pressureReferenceError}
                          onChoose={(gauge) => onColumnChange(c.index, { gauge })}
                        />
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
