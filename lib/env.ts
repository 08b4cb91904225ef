import { z } from "zod";

/*
 * The one place that reads the environment (the linter refuses `process.env` elsewhere outside tests).
 * Every variable Papin, its tools and its tests read is declared here and listed in README's configuration table.
 * Imported by the portal (Node.js runtime, proxy.ts included), by scripts run under tsx and by the Playwright config,
 * so it imports nothing but zod.
 */
const port = (fallback: number) => z.coerce.number().int().min(0).max(65535).default(fallback);

const schema = z.object({
  NODE_ENV: z.enum(["development", "production", "test"]).default("development"),

  // The database: an embedded SQLite file, or a libSQL server with its token.
  DATABASE_URL: z.string().min(1).default("file:data/papin.db"),
  DATABASE_AUTH_TOKEN: z.string().optional(),

  // Sessions: the signing secret (required in production) and the public URL when the portal sits behind a proxy.
  NEXTAUTH_SECRET: z.string().min(16, "NEXTAUTH_SECRET must be at least 16 characters").optional(),
  NEXTAUTH_URL: z.string().url("NEXTAUTH_URL must be a URL such as https://papin.example.org").optional(),
  /** Port of `npm run dev` (and of `npm start`, which reads it in package.json's script). */
  PORT: port(3000),

  // Accounts: sign-in throttling and session lifetime.
  /** Trust the last X-Forwarded-For address as the client's (only behind a proxy that sets it); else one "direct" bucket. */
  PAPIN_TRUST_PROXY: z.enum(["true", "false"]).default("false"),
  PAPIN_SIGNIN_MAX_FAILURES: z.coerce.number().int().min(1).max(100).default(5),
  PAPIN_SIGNIN_LOCK_MINUTES: z.coerce
    .number()
    .positive()
    .max(24 * 60)
    .default(15),
  PAPIN_SESSION_IDLE_MINUTES: z.coerce
    .number()
    .positive()
    .max(24 * 60)
    .default(30),
  PAPIN_SESSION_MAX_HOURS: z.coerce
    .number()
    .positive()
    .max(24 * 30)
    .default(12),

  PAPIN_DEMO: z.enum(["0", "1"]).default("1"),
  PAPIN_DEMO_PASSWORD: z.string().min(8).default("papin-demo"),
  PAPIN_UPLOAD_LIMIT_MB: z.coerce.number().positive().max(500).default(50),
  /** Files one upload may carry; a request with more is refused with 413 while it streams. */
  PAPIN_UPLOAD_MAX_FILES: z.coerce.number().int().min(1).max(100).default(10),
  /** The outside anchor of the audit ledger (one JSON line per head); default: ledger-anchors.jsonl beside the database file, or data/ for a libSQL server. */
  PAPIN_LEDGER_ANCHOR_FILE: z.string().optional(),

  // Outgoing mail through the Resend SDK; with neither a key nor a base URL, mail waits in the outbox.
  RESEND_API_KEY: z.string().optional(),
  RESEND_BASE_URL: z.string().url().optional(),
  PAPIN_MAIL_FROM: z.string().default("Papin <papin@papin.example>"),

  // The local fake of Resend's HTTP API (`npm run mail:fake`, started by `npm run dev`); its --options win over these.
  FAKE_RESEND_PORT: port(3025),
  FAKE_RESEND_HOST: z.string().default("127.0.0.1"),
  FAKE_RESEND_MAILBOX: z.string().default("data/fake-mailbox.jsonl"),
  FAKE_RESEND_API_KEY: z.string().optional(),
  FAKE_RESEND_FAIL_TIMES: z.coerce.number().int().min(0).default(0),

  /**
   * The analyze command writes its peak memory and CPU time to this file on exit (`npm run bench` sets it).
   * Declared here for the record; the command reads it itself, since loading zod would double its start-up time.
   */
  PAPIN_RESOURCE_REPORT: z.string().optional(),
  /** Cycles in the database `npm run bench` serves its HTTP cases from (seeded once per count and schema, then cached); 0 skips those cases. */
  PAPIN_BENCH_CYCLES: z.coerce.number().int().min(0).max(2_000_000).default(100_000),

  // Browser tests (playwright.config.ts): the port of the production server they start, Debian's chromium, CI retries.
  PAPIN_E2E_PORT: port(3111),
  PAPIN_CHROMIUM: z.string().default("/usr/bin/chromium"),
  CI: z.string().optional(),
});

export type Env = z.infer<typeof schema>;

const NAMES = Object.keys(schema.shape);
let lastRead: { raw: string; env: Env } | undefined;

/**
 * The validated configuration; a wrong variable fails loudly with its name. The variables are looked at on every
 * call, so one changed while the process runs — by a test, or by `npm run dev` for the mail fake — is honoured, as
 * the Resend SDK itself reads RESEND_BASE_URL when a client is made; they are validated again only when one of them
 * changed (every database query asks, so validating each time cost a request real time). An empty variable counts as
 * unset. The object returned is shared: read it, never change it.
 */
export function env(): Env {
  const values = NAMES.map((name) => process.env[name] || undefined);
  const raw = values.map((v) => (v === undefined ? "\u0000" : v)).join("\u0001");
  if (lastRead?.raw === raw) return lastRead.env;
  const parsed = schema.safeParse(Object.fromEntries(NAMES.map((name, i) => [name, values[i]])));
  if (!parsed.success) {
    const problems = parsed.error.issues.map((i) => `${i.path.join(".")}: ${i.message}`).join("; ");
    throw new Error(`Papin's configuration is invalid: ${problems}`);
  }
  lastRead = { raw, env: Object.freeze(parsed.data) };
  return lastRead.env;
}

export function demoEnabled(): boolean {
  return env().PAPIN_DEMO !== "0";
}

/** This process's environment, copied for a child process (`npm run dev` passes it to the mail fake and next dev). */
export function environmentForChildProcess(): NodeJS.ProcessEnv {
  return { ...process.env };
}

/**
 * The portal's public base URL, for links that leave the request (e-mail): NEXTAUTH_URL, never a request header, so
 * a forged Host or X-Forwarded-Host cannot choose where a mailed link points. Development without it: this machine.
 */
export function publicBaseUrl(): string {
  const { NEXTAUTH_URL, PORT } = env();
  return (NEXTAUTH_URL ?? `http://localhost:${PORT}`).replace(/\/+$/, "");
}

/** Session cookies carry `Secure` (and the `__Secure-` prefix) when the public URL is https. */
export function secureCookies(): boolean {
  return env().NEXTAUTH_URL?.startsWith("https://") ?? false;
}

/** Why `npm start` must not serve anyone yet, in one plain line; null when the production settings are there. */
export function productionStartRefusal(): string | null {
  const { NEXTAUTH_SECRET, NEXTAUTH_URL } = env();
  const missing = [
    NEXTAUTH_SECRET ? null : "NEXTAUTH_SECRET (a random secret of at least 16 characters)",
    NEXTAUTH_URL ? null : "NEXTAUTH_URL (the portal's public URL, such as https://papin.example.org)",
  ].filter((m) => m !== null);
  if (missing.length === 0) return null;
  return `Papin will not start: set ${missing.join(" and ")} in the environment; see README, Configuration.`;
}

/**
 * next-auth builds its own links from the request's Host header only when AUTH_TRUST_HOST is set. A self-hosted
 * portal is reached under whatever host the site gives it, so that is trusted unless NEXTAUTH_URL pins the origin.
 */
export function trustRequestHostUnlessUrlPinned(): void {
  if (!process.env.NEXTAUTH_URL) process.env.AUTH_TRUST_HOST ??= "1";
}
