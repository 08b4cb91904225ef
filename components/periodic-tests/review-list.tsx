import Link from "next/link";
import { EmptyState, Panel } from "@/components/ui/panel";
import { ResultBadge } from "@/components/equipment/state-badges";
import { formatDateTime } from "@/lib/format";
import { testKindLabel } from "@/lib/domain";
import { TableFrame } from "@/components/ui/table-frame";

type Row = { id: string; kind: string; performedAt: string; result: "pass" | "fail"; sterilizerName: string; performedBy: string; performedByName: string };

/** The review queue's second list: periodic-test records waiting for a signature, the longest-waiting first. */
export function PeriodicReviewList({ records, timeZone, actorId }: { records: Row[]; timeZone: string; actorId: string }) {
  return (
    <div className="mt-gutter">
      <Panel title={`Periodic-test records awaiting review · ${records.length}`}>
        {records.length === 0 ? (
          <EmptyState title="No periodic-test record waits for review." />
        ) : (
          <TableFrame label="Periodic tests awaiting review">
            <table className="data-table" data-testid="periodic-review-table">
              <caption className="sr-only">Periodic-test records awaiting review</caption>
              <thead>
                <tr>
                  <th>Done at</th>
                  <th>Sterilizer</th>
                  <th>Test</th>
                  <th>Result</th>
                  <th>Recorded by</th>
                </tr>
              </thead>
              <tbody>
                {records.map((r) => (
                  <tr key={r.id}>
                    <td className="whitespace-nowrap text-sm">
                      <Link href={`/periodic-tests/${r.id}`} className="text-steam-700 hover:underline">
                        {formatDateTime(r.performedAt, timeZone)}
                      </Link>
                    </td>
                    <td className="text-sm">{r.sterilizerName}</td>
                    <td className="text-sm">{testKindLabel(r.kind)}</td>
                    <td>
                      <ResultBadge result={r.result} />
                    </td>
                    <td className="text-sm">
                      {r.performedByName}
                      {r.performedBy === actorId && <span className="block text-xs text-ink-muted">You recorded it: another engineer signs.</span>}
                    </td>
                  </tr>
                ))}
              </tbody>
            </table>
          </TableFrame>
        )}
      </Panel>
    </div>
  );
}
