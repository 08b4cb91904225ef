export const PERIODIC_TEST_LABELS: Record<string, string> = {
  "air-leakage": "Air leakage test",
  "bowie-dick": "Bowie-Dick test",
  "steam-non-condensable-gas": "Steam quality: non-condensable gases",
  "steam-superheat": "Steam quality: superheat",
  "steam-dryness": "Steam quality: dryness",
  "thermometric-small-load": "Thermometric test, small load",
  "thermometric-full-load": "Thermometric test, full load",
  "routine-load": "Routine load",
};

export function formatDateTime(iso: string | null | undefined, timeZone = "UTC"): string {
  if (!iso) return "—";
  const d = new Date(iso);
  if (Number.isNaN(d.getTime())) return iso;
  return new Intl.DateTimeFormat("en-GB", { dateStyle: "medium", timeStyle: "short", timeZone }).format(d);
}

export function formatDate(iso: string | null | undefined, timeZone = "UTC"): string {
  if (!iso) return "—";
  const d = new Date(iso.length === 10 ? `${iso}T12:00:00Z` : iso);
  if (Number.isNaN(d.getTime())) return iso;
  return new Intl.DateTimeFormat("en-GB", { dateStyle: "medium", timeZone }).format(d);
}

export function formatSeconds(s: number | null | undefined): string {
  if (s === null || s === undefined || !Number.isFinite(s)) return "—";
  if (s < 120) return `${s.toFixed(s < 10 ? 1 : 0)} s`;
  const m = Math.floor(s / 60);
  const rest = Math.round(s - m * 60);
  return `${m} min ${String(rest).padStart(2, "0")} s`;
}

export function formatNumber(v: number | null | undefined, digits = 2): string {
  if (v === null || v === undefined || !Number.isFinite(v)) return "—";
  return v.toFixed(digits);
}

export function formatBytes(n: number): string {
  if (n < 1024) return `${n} B`;
  if (n < 1024 * 1024) return `${(n / 1024).toFixed(1)} KiB`;
  return `${(n / 1024 / 1024).toFixed(1)} MiB`;
}
