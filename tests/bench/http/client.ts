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

export function percentile(values: number[], p: number): number {
  if (values.length === 0) return NaN;
  const sorted = [...values].sort((a, b) => a - b);
  return sorted[Math.min(sorted.length - 1, Math.ceil((p / 100) * sorted.length) - 1)];
}

export type LoadResult = { requests: number; perSecond: number; p95Ms: number; failures: number; firstFailure?: string };

/**
 * A closed loop: `concurrency` workers each send the next request as soon as the last answer's body has arrived,
 * for `seconds`; Node's fetch keeps the connections alive. An answer other than 200 counts as a failure.
 */
export async function closedLoop(url: string, cookie: string, concurrency: number, seconds: number): Promise<LoadResult> {
  const latenciesMs: number[] = [];
  let failures = 0;
  let firstFailure: string | undefined;
  const started = performance.now();
  const endAt = started + seconds * 1000;
  const worker = async () => {
    while (performance.now() < endAt) {
      const t = performance.now();
      try {
        const res = await fetch(url, { headers: { Cookie: cookie } });
        await res.arrayBuffer();
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
