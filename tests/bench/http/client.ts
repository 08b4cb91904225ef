import { BenchStop } from "./server";

/** Signs in as scripts do (csrf token, then the credentials callback) and returns the Cookie header of the session. */
export async function signIn(url: string, email: string, password: string): Promise<string> {
  const csrf = await fetch(`${url}/api/auth/csrf`);
  const { csrfToken } = (await csrf.json()) as { csrfToken: string };
  const jar = new Map<string, string>();
  const keep = (res: Response) => res.headers.getSetCookie().forEach((c) => jar.set(c.slice(0, c.indexOf("=")), c.split(";")[0]));
  keep(csrf);
  const cookie = () => [...jar.values()].join("; ");
  const res = await fetch(`${url}/api/auth/callback/credentials`, {
    method: "POST",
    redirect: "manual",
    headers: { "Content-Type": "application/x-www-form-urlencoded", Cookie: cookie() },
    body: new URLSearchParams({ csrfToken, email, password, json: "true" }),
  });
  await res.arrayBuffer();
  keep(res);
  if (res.status >= 400 || ![...jar.keys()].some((name) => name.includes("session-token"))) throw new BenchStop(`Signing in as ${email} failed (HTTP ${res.status}).`);
  return cookie();
}

/** GET that must answer 200; returns the parsed JSON. */
export async function getJson<T>(url: string, cookie: string): Promise<T> {
  const res = await fetch(url, { headers: { Cookie: cookie } });
  if (res.status !== 200) throw new BenchStop(`GET ${new URL(url).pathname} answered HTTP ${res.status}: ${(await res.text()).slice(0, 300)}`);
  return (await res.json()) as T;
}

/**
 * The Cookie header after an answer, as a browser keeps it: a cookie the answer sets replaces the one of that name, one
 * it clears is dropped (the session cookie is written anew when the session's last activity is written back).
 */
export function updatedCookie(cookie: string, res: Response): string {
  const set = res.headers.getSetCookie();
  if (set.length === 0) return cookie;
  const jar = new Map(
    cookie
      .split("; ")
      .filter(Boolean)
      .map((pair) => [pair.slice(0, pair.indexOf("=")), pair]),
  );
  for (const line of set) {
    const pair = line.split(";")[0];
    const name = pair.slice(0, pair.indexOf("="));
    if (/;\s*max-age=0(;|$)|expires=thu, 01 jan 1970/i.test(line)) jar.delete(name);
    else jar.set(name, pair);
  }
  return [...jar.values()].join("; ");
}

export function percentile(values: number[], p: number): number {
  if (values.length === 0) return NaN;
  const sorted = [...values].sort((a, b) => a - b);
  return sorted[Math.min(sorted.length - 1, Math.ceil((p / 100) * sorted.length) - 1)];
}

export type LoadResult = { requests: number; perSecond: number; p95Ms: number; failures: number; firstFailure?: string };

/**
 * A closed loop (`url` the same each time, or a new one from the function for each request): `concurrency` workers each send the next request as soon as the last answer's body has arrived,
 * for `seconds`; Node's fetch keeps the connections alive, and the workers keep the session cookie as a browser does. An answer other than 200 counts as a failure.
 */
export async function closedLoop(url: string | (() => string), cookie: string, concurrency: number, seconds: number): Promise<LoadResult> {
  const next = typeof url === "string" ? () => url : url;
  const latenciesMs: number[] = [];
  let failures = 0;
  let firstFailure: string | undefined;
  let current = cookie;
  const started = performance.now();
  const endAt = started + seconds * 1000;
  const worker = async () => {
    while (performance.now() < endAt) {
      const t = performance.now();
      try {
        const res = await fetch(next(), { headers: { Cookie: current } });
        await res.arrayBuffer();
        current = updatedCookie(current, res);
        if (res.status !== 200) {
          failures++;
          firstFailure ??= `HTTP ${res.status}`;
        }
      } catch (error) {
        failures++;
        // fetch says only "fetch failed"; the cause names what happened to the connection (ECONNRESET, a timeout…).
        const cause = (error as { cause?: { code?: string; message?: string } }).cause;
        firstFailure ??= `${error instanceof Error ? error.message : String(error)}${cause ? ` (${cause.code ?? cause.message})` : ""}`;
      }
      latenciesMs.push(performance.now() - t);
    }
  };
  await Promise.all(Array.from({ length: concurrency }, worker));
  const elapsedS = (performance.now() - started) / 1000;
  return { requests: latenciesMs.length, perSecond: latenciesMs.length / elapsedS, p95Ms: percentile(latenciesMs, 95), failures, firstFailure };
}
