"use client";

import { TableFrame } from "@/components/ui/table-frame";
import { LOAD_TYPE_LABELS, LOAD_TYPES, SENSOR_POSITIONS, sensorPositionLabel, type LoadType, type PatternItem, type PatternPosition } from "@/lib/domain";

/** A loading pattern being written: text fields as typed (the server reads and checks them). */
export type PatternDraft = {
  name: string;
  description: string;
  loadType: LoadType | "";
  items: Array<{ name: string; quantity: string; note: string }>;
  positions: Array<{ id: string; label: string; sensorPosition: string; note: string }>;
};

export const EMPTY_PATTERN: PatternDraft = {
  name: "",
  description: "",
  loadType: "",
  items: [{ name: "", quantity: "1", note: "" }],
  positions: [
    { id: "P1", label: "", sensorPosition: "", note: "" },
    { id: "P2", label: "", sensorPosition: "", note: "" },
  ],
};

/** The draft as the service takes it: empty rows left out, quantities as numbers (a typo stays NaN and is refused, named). */
export function patternPayload(p: PatternDraft): { name: string; description?: string; loadType?: LoadType; items: PatternItem[]; positions: PatternPosition[] } {
  const items = p.items.filter((i) => i.name.trim() || i.note.trim()).map((i) => ({ name: i.name, quantity: Number(i.quantity.replace(",", ".")), ...(i.note.trim() ? { note: i.note } : {}) }));
  const positions = p.positions
    .filter((x) => x.id.trim() || x.label.trim())
    .map((x) => ({ id: x.id, label: x.label, ...(x.sensorPosition ? { sensorPosition: x.sensorPosition } : {}), ...(x.note.trim() ? { note: x.note } : {}) }));
  return { name: p.name, ...(p.description.trim() ? { description: p.description } : {}), ...(p.loadType ? { loadType: p.loadType } : {}), items, positions };
}

const cell = "field-input min-w-[6rem] py-1";

/** Name, description, load type, the items and the probe positions of a new loading pattern. */
export function PatternEditor({ value, onChange, error }: { value: PatternDraft; onChange: (next: PatternDraft) => void; error?: string }) {
  const set = <K extends keyof PatternDraft>(key: K, v: PatternDraft[K]) => onChange({ ...value, [key]: v });
  const setItem = (i: number, key: keyof PatternDraft["items"][number], v: string) =>
    set(
      "items",
      value.items.map((row, j) => (j === i ? { ...row, [key]: v } : row)),
    );
  const setPosition = (i: number, key: keyof PatternDraft["positions"][number], v: string) =>
    set(
      "positions",
      value.positions.map((row, j) => (j === i ? { ...row, [key]: v } : row)),
    );
  return (
    <fieldset className="min-w-0 space-y-4 rounded-md border border-ink-line p-4" aria-describedby={error ? "pattern-error" : undefined}>
      <legend className="px-1 text-sm font-semibold">New loading pattern</legend>
      <div className="grid gap-3 sm:grid-cols-2">
        <div>
          <label className="field-label" htmlFor="pattern-name">
            Name
          </label>
          <input id="pattern-name" className="field-input" value={value.name} onChange={(e) => set("name", e.target.value)} placeholder="Tray set, 2 baskets" />
        </div>
        <div>
          <label className="field-label" htmlFor="pattern-load-type">
            Load type
          </label>
          <select id="pattern-load-type" className="field-input" value={value.loadType} onChange={(e) => set("loadType", e.target.value as LoadType | "")}>
            <option value="">Not stated</option>
            {LOAD_TYPES.map((t) => (
              <option key={t} value={t}>
                {LOAD_TYPE_LABELS[t]}
              </option>
            ))}
          </select>
        </div>
      </div>
      <div>
        <label className="field-label" htmlFor="pattern-description">
          Description (how the load is arranged)
        </label>
        <textarea id="pattern-description" className="field-input" rows={2} value={value.description} onChange={(e) => set("description", e.target.value)} />
      </div>

      <div>
        <h3 className="text-sm font-semibold">Items</h3>
        <TableFrame label="Items of the load" className="mt-1">
          <table className="data-table">
            <thead>
              <tr>
                <th>Item</th>
                <th>Quantity</th>
                <th>Note</th>
                <th>
                  <span className="sr-only">Remove</span>
                </th>
              </tr>
            </thead>
            <tbody>
              {value.items.map((row, i) => (
                <tr key={i}>
                  <td>
                    <input aria-label={`Item ${i + 1} name`} className={cell} value={row.name} onChange={(e) => setItem(i, "name", e.target.value)} />
                  </td>
                  <td>
                    <input aria-label={`Item ${i + 1} quantity`} className={`${cell} w-20`} inputMode="numeric" value={row.quantity} onChange={(e) => setItem(i, "quantity", e.target.value)} />
                  </td>
                  <td>
                    <input aria-label={`Item ${i + 1} note`} className={cell} value={row.note} onChange={(e) => setItem(i, "note", e.target.value)} />
                  </td>
                  <td>
                    <button
                      type="button"
                      className="text-xs text-fail-700 underline"
                      onClick={() =>
                        set(
                          "items",
                          value.items.filter((_, j) => j !== i),
                        )
                      }
                    >
                      Remove item {i + 1}
                    </button>
                  </td>
                </tr>
              ))}
            </tbody>
          </table>
        </TableFrame>
        <button type="button" className="btn-secondary mt-2 px-2 py-1 text-sm" onClick={() => set("items", [...value.items, { name: "", quantity: "1", note: "" }])}>
          Add an item
        </button>
      </div>

      <div>
        <h3 className="text-sm font-semibold">Probe positions</h3>
        <p className="text-xs text-ink-muted">
          Each position gets one temperature probe in every run (and its indicators). The id starts the channel&apos;s header when you can (&quot;P3 tray 2&quot;).
        </p>
        <TableFrame label="Probe positions" className="mt-1">
          <table className="data-table">
            <thead>
              <tr>
                <th>Id</th>
                <th>Label</th>
                <th>Chamber position</th>
                <th>Note</th>
                <th>
                  <span className="sr-only">Remove</span>
                </th>
              </tr>
            </thead>
            <tbody>
              {value.positions.map((row, i) => (
                <tr key={i}>
                  <td>
                    <input aria-label={`Position ${i + 1} id`} className={`${cell} w-20`} value={row.id} onChange={(e) => setPosition(i, "id", e.target.value)} />
                  </td>
                  <td>
                    <input aria-label={`Position ${i + 1} label`} className={cell} value={row.label} onChange={(e) => setPosition(i, "label", e.target.value)} placeholder="Tray 2, centre" />
                  </td>
                  <td>
                    <select aria-label={`Position ${i + 1} chamber position`} className={cell} value={row.sensorPosition} onChange={(e) => setPosition(i, "sensorPosition", e.target.value)}>
                      <option value="">Not stated</option>
                      {SENSOR_POSITIONS.map((p) => (
                        <option key={p} value={p}>
                          {sensorPositionLabel(p)}
                        </option>
                      ))}
                    </select>
                  </td>
                  <td>
                    <input aria-label={`Position ${i + 1} note`} className={cell} value={row.note} onChange={(e) => setPosition(i, "note", e.target.value)} />
                  </td>
                  <td>
                    <button
                      type="button"
                      className="text-xs text-fail-700 underline"
                      onClick={() =>
                        set(
                          "positions",
                          value.positions.filter((_, j) => j !== i),
                        )
                      }
                    >
                      Remove position {i + 1}
                    </button>
                  </td>
                </tr>
              ))}
            </tbody>
          </table>
        </TableFrame>
        <button
          type="button"
          className="btn-secondary mt-2 px-2 py-1 text-sm"
          onClick={() => set("positions", [...value.positions, { id: `P${value.positions.length + 1}`, label: "", sensorPosition: "", note: "" }])}
        >
          Add a position
        </button>
      </div>
      {error && (
        <p className="field-error" id="pattern-error" role="alert">
          {error}
        </p>
      )}
    </fieldset>
  );
}
