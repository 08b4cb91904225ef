import type { TrendFigure } from "@/lib/periodic-tests/trends";
import { formatDate } from "@/lib/format";
import { plural } from "@/lib/domain";

const W = 520;
const H = 200;
const PAD = { left: 52, right: 14, top: 14, bottom: 30 };

function niceMax(v: number): number {
  if (v <= 0) return 1;
  const mag = Math.pow(10, Math.floor(Math.log10(v)));
  for (const step of [1, 2, 2.5, 5, 10]) if (v <= step * mag) return step * mag;
  return 10 * mag;
}

const fmt = (v: number, unit: string) => (unit === "s" ? (v >= 120 ? `${(v / 60).toFixed(1)} min` : `${v.toFixed(v < 10 ? 1 : 0)} s`) : `${v.toFixed(2)} K`);

/** One figure over time: a point per analysed cycle (● pass, ✕ fail), the limit as a dashed step line. */
export function TrendChart({ figure, timeZone }: { figure: TrendFigure; timeZone: string }) {
  const measured = figure.points.filter((p) => p.value !== null);
  const missing = figure.points.length - measured.length;
  const last = measured.at(-1);
  const header = (
    <div className="mb-1 flex flex-wrap items-baseline justify-between gap-2">
      <h3 className="text-sm font-semibold">{figure.label}</h3>
      <p className="text-xs text-ink-muted">
        {last ? (
          <>
            Latest {fmt(last.value!, figure.unit)}
            {last.limit !== null && (
              <>
                {" "}
                · limit {figure.comparison === "at-most" ? "≤" : "≥"} {fmt(last.limit, figure.unit)}
              </>
            )}
          </>
        ) : (
          "No measured value yet"
        )}
      </p>
    </div>
  );
  if (figure.points.length === 0) {
    return (
      <figure>
        {header}
        <p className="rounded-md border border-dashed border-ink-line px-3 py-6 text-center text-sm text-ink-muted">No analysed cycle in this period.</p>
      </figure>
    );
  }
  const times = figure.points.map((p) => Date.parse(p.at));
  const t0 = Math.min(...times);
  const t1 = Math.max(...times);
  const span = Math.max(t1 - t0, 3_600_000);
  const values = [...measured.map((p) => p.value!), ...figure.points.map((p) => p.limit ?? 0)];
  const yMax = niceMax(Math.max(...values) * 1.1);
  const x = (t: number) => PAD.left + ((t - t0) / span) * (W - PAD.left - PAD.right);
  const y = (v: number) => PAD.top + (1 - Math.min(v, yMax) / yMax) * (H - PAD.top - PAD.bottom);
  const ticks = [0, yMax / 2, yMax];

  let limitPath = "";
  figure.points.forEach((p, i) => {
    if (p.limit === null) return;
    const px = x(times[i]);
    const py = y(p.limit);
    limitPath += limitPath ? ` H ${px.toFixed(1)} V ${py.toFixed(1)}` : `M ${PAD.left} ${py.toFixed(1)} H ${px.toFixed(1)}`;
  });
  if (limitPath) limitPath += ` H ${W - PAD.right}`;

  const failing = measured.filter((p) => p.passed === false).length;
  const description = `${figure.label}: ${measured.length} measured cycles, ${failing} outside the limit${missing ? `, ${missing} not measured` : ""}.`;
  return (
    <figure>
      {header}
      {/* A group, not an image: each point is a link to its cycle and must stay reachable by keyboard and screen reader. */}
      <svg viewBox={`0 0 ${W} ${H}`} className="h-auto w-full" role="group" aria-label={description}>
        {ticks.map((t) => (
          <g key={t}>
            <line x1={PAD.left} x2={W - PAD.right} y1={y(t)} y2={y(t)} className="stroke-ink-line" strokeWidth={0.5} />
            <text x={PAD.left - 6} y={y(t) + 3} textAnchor="end" className="fill-ink-muted" fontSize={12}>
              {figure.unit === "s" ? `${+t.toFixed(0)} s` : `${+t.toFixed(2)} K`}
            </text>
          </g>
        ))}
        <text x={PAD.left} y={H - 8} className="fill-ink-muted" fontSize={12}>
          {formatDate(new Date(t0).toISOString(), timeZone)}
        </text>
        <text x={W - PAD.right} y={H - 8} textAnchor="end" className="fill-ink-muted" fontSize={12}>
          {formatDate(new Date(t1).toISOString(), timeZone)}
        </text>
        {limitPath && (
          <>
            <path d={limitPath} fill="none" className="stroke-caution-500" strokeWidth={1.5} strokeDasharray="5 3" />
            <text x={W - PAD.right} y={y(figure.points.at(-1)?.limit ?? 0) - 4} textAnchor="end" className="fill-caution-700" fontSize={12}>
              limit
            </text>
          </>
        )}
        <polyline
          points={figure.points
            .map((p, i) => (p.value === null ? null : `${x(times[i]).toFixed(1)},${y(p.value).toFixed(1)}`))
            .filter(Boolean)
            .join(" ")}
          fill="none"
          className="stroke-steam-500/50"
          strokeWidth={1}
        />
        {figure.points.map((p, i) => {
          if (p.value === null) return null;
          const cx = x(times[i]);
          const cy = y(p.value);
          const label = `${p.cycleNumber}: ${fmt(p.value, figure.unit)}${p.passed === false ? " (outside the limit)" : ""}`;
          return (
            <a key={p.cycleId} href={`/cycles/${p.cycleId}`} aria-label={label}>
              <title>{label}</title>
              {p.passed === false ? (
                <g className="stroke-fail-500" strokeWidth={2}>
                  <line x1={cx - 4} y1={cy - 4} x2={cx + 4} y2={cy + 4} />
                  <line x1={cx - 4} y1={cy + 4} x2={cx + 4} y2={cy - 4} />
                </g>
              ) : (
                <circle cx={cx} cy={cy} r={3.5} className="fill-steam-600" />
              )}
            </a>
          );
        })}
      </svg>
      <figcaption className="mt-1 text-xs text-ink-muted">
        {description} ● within the limit · ✕ outside it{missing ? ` · ${plural(missing, "cycle")} without a measured value (no plateau)` : ""}
      </figcaption>
    </figure>
  );
}
