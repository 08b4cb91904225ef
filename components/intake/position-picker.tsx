"use client";

import { SENSOR_NOTE_MAX_CHARS, SENSOR_POSITION_LABELS, SENSOR_POSITIONS, type ChannelPlacement, type SensorPosition } from "@/lib/domain";

/** One temperature channel's position (a choice from the trade's list) and its note; used at intake and in a correction. */
export function PositionPicker({ header, placement, onChange, id }: { header: string; placement: ChannelPlacement | undefined; onChange: (next: ChannelPlacement | undefined) => void; id: string }) {
  const position = placement?.position ?? "";
  return (
    <div className="space-y-1" data-testid="position-picker" data-channel={header}>
      <select
        id={id}
        aria-label={`Position of ${header}`}
        className={`field-input px-1.5 py-1 text-xs ${position ? "" : "border-caution-500"}`}
        value={position}
        onChange={(e) => onChange(e.target.value ? { position: e.target.value as SensorPosition, note: placement?.note } : undefined)}
      >
        <option value="">position not recorded…</option>
        {SENSOR_POSITIONS.map((p) => (
          <option key={p} value={p}>
            {SENSOR_POSITION_LABELS[p]}
          </option>
        ))}
      </select>
      <input
        aria-label={`Position note of ${header}`}
        className="field-input px-1.5 py-1 text-xs"
        placeholder="note, e.g. sheet 19 of 38"
        maxLength={SENSOR_NOTE_MAX_CHARS}
        value={placement?.note ?? ""}
        disabled={!position}
        onChange={(e) => placement && onChange({ position: placement.position, note: e.target.value || undefined })}
      />
    </div>
  );
}
