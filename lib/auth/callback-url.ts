/**
 * Where to go after signing in: only a path on this site. A callback such as `/%5Cevil.example/` arrives decoded as
 * `/\evil.example/`, which browsers read as `//evil.example/`, another site; so every decoding of the value is
 * checked, and backslashes, control characters and anything that resolves to another origin fall back to the
 * overview.
 */
const PROBE_ORIGIN = "http://papin.invalid";
const FALLBACK = "/";

export function safeCallbackPath(value: string | null | undefined): string {
  if (typeof value !== "string" || value === "") return FALLBACK;
  let decoded = value;
  for (let round = 0; round < 4; round++) {
    if (!isPlainPath(decoded)) return FALLBACK;
    let next: string;
    try {
      next = decodeURIComponent(decoded);
    } catch {
      return FALLBACK;
    }
    if (next === decoded) return new URL(value, PROBE_ORIGIN).origin === PROBE_ORIGIN ? value : FALLBACK;
    decoded = next;
  }
  return FALLBACK; // still changing after four decodings: nobody's real link
}

function isPlainPath(path: string): boolean {
  return path.startsWith("/") && !path.startsWith("//") && !/[\\\u0000-\u001f\u007f]/.test(path);
}

/**
 * next-auth's `redirect` callback: a path on this site, or an absolute URL on the public origin reduced to its path;
 * anything else goes to the overview.
 */
export function sameOriginRedirect({ url, baseUrl }: { url: string; baseUrl: string }): string {
  const base = baseUrl.replace(/\/+$/, "");
  if (url.startsWith("/")) return base + safeCallbackPath(url);
  try {
    const target = new URL(url);
    if (target.origin === new URL(base).origin) return base + safeCallbackPath(target.pathname + target.search + target.hash);
  } catch {
    // not a URL at all
  }
  return base + FALLBACK;
}
