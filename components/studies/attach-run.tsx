"use client";

import { useRouter } from "next/navigation";
import { useEffect, useState } from "react";
import { attachRunAction } from "@/app/(portal)/studies/[id]/actions";
import { useFormAction } from "@/components/equipment/form-bits";
import { ActionMessage } from "@/components/ui/action-message";
import { TableFrame } from "@/components/ui/table-frame";
import { sensorPositionLabel, type PatternPosition } from "@/lib/domain";
import type { SensorMapProposal } from "@/lib/studies/contracts";

/**
 * Confirming where each channel of the chosen cycle sat: the proposal from the cycle's placements, each channel's
 * position changeable; attaching is refused in the browser (and on the server) until every pattern position has
 * exactly one channel.
 */
export function AttachRunForm({
  studyId,
  cycleId,
  cycleNumber,
  proposal,
  positions,
}: {
  studyId: string;
  cycleId: string;
  cycleNumber: string;
  proposal: SensorMapProposal;
  positions: PatternPosition[];
}) {
  const router = useRouter();
  const { state, pending, formRef, onSubmit, errors } = useFormAction(attachRunAction);
  const [map, setMap] = useState<Record<string, string>>(() => Object.fromEntries(proposal.channels.map((c) => [c.header, c.positionId ?? ""])));
  useEffect(() => {
    if (state.status === "ok" && state.href) router.push(state.href);
  }, [state, router]);

  const chosen = Object.values(map).filter(Boolean);
  const missing = positions.filter((p) => !chosen.includes(p.id));
  const doubled = positions.filter((p) => chosen.filter((c) => c === p.id).length > 1);
  const problem = missing.length > 0 ? `No channel for ${missing.map((p) => p.id).join(", ")}: every position of the pattern needs its probe.` : null;

  return (
    <form ref={formRef} onSubmit={onSubmit} className="space-y-3" noValidate aria-label={`Attach ${cycleNumber} as a run`} data-testid="attach-run">
      <input type="hidden" name="id" value={studyId} />
      <input type="hidden" name="cycleId" value={cycleId} />
      <input type="hidden" name="sensorMap" value={JSON.stringify(map)} />
      <p className="text-sm text-ink-soft">
        Proposed from the placements recorded with {cycleNumber}. Check each channel; a channel left at &quot;Not a load position&quot; (the drain reference, for one) is not judged.
      </p>
      <TableFrame label="Sensor map">
        <table className="data-table">
          <thead>
            <tr>
              <th>Channel</th>
              <th>Placement recorded with the cycle</th>
              <th>Pattern position</th>
            </tr>
          </thead>
          <tbody>
            {proposal.channels.map((c, i) => (
              <tr key={c.header}>
                <td className="mono text-sm">{c.header}</td>
                <td className="text-sm">{c.placement ? sensorPositionLabel(c.placement) : "—"}</td>
                <td>
                  <select
                    aria-label={`Pattern position of channel ${c.header}`}
                    id={`map-${i}`}
                    className="field-input py-1"
                    value={map[c.header] ?? ""}
                    onChange={(e) => setMap({ ...map, [c.header]: e.target.value })}
                  >
                    <option value="">Not a load position</option>
                    {positions.map((p) => (
                      <option key={p.id} value={p.id}>
                        {p.id} · {p.label}
                      </option>
                    ))}
                  </select>
                </td>
              </tr>
            ))}
          </tbody>
        </table>
      </TableFrame>
      {problem && (
        <p className="text-sm text-caution-700" role="status">
          {problem}
        </p>
      )}
      {doubled.length > 0 && (
        <p className="text-xs text-ink-muted">
          {doubled.map((p) => p.id).join(", ")} {doubled.length === 1 ? "has" : "have"} more than one channel: they are read together (the lower F0 and the wider temperature range count).
        </p>
      )}
      {errors.sensorMap && <p className="field-error">{errors.sensorMap}</p>}
      <ActionMessage state={state} />
      <button className="btn-primary" disabled={pending || problem !== null}>
        {pending ? "Attaching…" : `Confirm the map and attach ${cycleNumber}`}
      </button>
    </form>
  );
}
