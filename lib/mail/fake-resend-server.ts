/**
 * A local stand-in for Resend's HTTP API, for development and tests: it answers what the Resend
 * SDK sends (`POST /emails` with a bearer key, JSON body, optional Idempotency-Key), keeps every
 * message it accepts (in memory and, when asked, as JSON lines in a file) and lets you read them
 * back. It sends nothing anywhere.
 *
 *   tsx lib/mail/fake-resend-server.ts --port 3025 [--mailbox data/fake-mailbox.jsonl] [--fail-times 2]
 *
 * Control endpoints (not part of Resend's API): `GET /_health`, `POST /_fail?times=2&status=500`,
 * `DELETE /_fail`, `POST /_reset`.
 */
import { randomUUID } from "node:crypto";
import { appendFileSync, existsSync, mkdirSync, readFileSync, writeFileSync } from "node:fs";
import { createServer, type IncomingMessage, type ServerResponse } from "node:http";
import type { AddressInfo } from "node:net";
import path from "node:path";
import { env } from "../env";
import { FAKE_RESEND_SERVICE, type FakeEmail } from "./fake-resend-protocol";

export { FAKE_RESEND_SERVICE, type FakeEmail };

export type FakeResendOptions = {
  /** 0 picks a free port. */
  port?: number;
  host?: string;
  /** Appends each accepted message as one JSON line; existing lines are loaded at start. */
  mailboxFile?: string;
  /** When set, only this bearer key is accepted; otherwise any key that starts with `re_`. */
  apiKey?: string;
  /** The next N sends answer with an error (status `failStatus`, default 500). */
  failTimes?: number;
  failStatus?: number;
  /** Silence the one-line request log of the runnable entry. */
  quiet?: boolean;
};

export type FakeResend = {
  url: string;
  port: number;
  /** Messages accepted so far, oldest first. */
  received(): FakeEmail[];
  /** Makes the next `times` sends fail with `status` (500 unless given). */
  failNext(times: number, status?: number): void;
  /** Forgets every message (and empties the mailbox file) and clears the failure switch. */
  reset(): void;
  close(): Promise<void>;
};

type ErrorName =
  | "missing_api_key"
  | "invalid_api_key"
  | "validation_error"
  | "missing_required_field"
  | "invalid_idempotency_key"
  | "invalid_idempotent_request"
  | "not_found"
  | "method_not_allowed"
  | "rate_limit_exceeded"
  | "internal_server_error"
  | "application_error";

const FAILURE_NAMES: Record<number, ErrorName> = { 429: "rate_limit_exceeded", 500: "internal_server_error" };
const MAX_BODY_BYTES = 10 * 1024 * 1024;
const MAX_RECIPIENTS = 50;
const ADDRESS = /^[^\s@<>]+@[^\s@<>]+\.[^\s@<>]+$/;

class HttpProblem extends Error {
  constructor(
    readonly status: number,
    readonly errorName: ErrorName,
    message: string,
  ) {
    super(message);
  }
}

function send(res: ServerResponse, status: number, body: unknown) {
  const json = JSON.stringify(body);
  res.writeHead(status, { "Content-Type": "application/json; charset=utf-8", "Content-Length": Buffer.byteLength(json) });
  res.end(json);
}

function sendProblem(res: ServerResponse, problem: HttpProblem) {
  send(res, problem.status, { statusCode: problem.status, name: problem.errorName, message: problem.message });
}

async function readBody(req: IncomingMessage): Promise<string> {
  const chunks: Buffer[] = [];
  let size = 0;
  for await (const chunk of req) {
    size += (chunk as Buffer).length;
    if (size > MAX_BODY_BYTES) throw new HttpProblem(413, "validation_error", "The request body is larger than 10 MB.");
    chunks.push(chunk as Buffer);
  }
  return Buffer.concat(chunks).toString("utf8");
}

/** "Name <a@b.example>" or "a@b.example" → the bare address, or null when it is not one. */
function bareAddress(value: string): string | null {
  const angled = /<([^<>]+)>\s*$/.exec(value);
  const address = (angled ? angled[1] : value).trim();
  return ADDRESS.test(address) ? address : null;
}

function addressList(body: Record<string, unknown>, field: string, required: boolean): string[] | null {
  const value = body[field];
  if (value === undefined || value === null) {
    if (required) throw new HttpProblem(422, "missing_required_field", `Missing \`${field}\` field.`);
    return null;
  }
  const list = typeof value === "string" ? [value] : value;
  if (!Array.isArray(list) || list.some((v) => typeof v !== "string")) {
    throw new HttpProblem(422, "validation_error", `The \`${field}\` field must be a string or an array of strings.`);
  }
  if (required && list.length === 0) throw new HttpProblem(422, "missing_required_field", `Missing \`${field}\` field.`);
  if (list.length > MAX_RECIPIENTS) throw new HttpProblem(422, "validation_error", `The \`${field}\` field accepts at most ${MAX_RECIPIENTS} addresses.`);
  for (const item of list as string[]) {
    if (!bareAddress(item)) {
      throw new HttpProblem(422, "validation_error", `Invalid \`${field}\` field. The email address needs to follow the \`email@example.com\` or \`Name <email@example.com>\` format.`);
    }
  }
  return list as string[];
}

function optionalString(body: Record<string, unknown>, field: string): string | null {
  const value = body[field];
  if (value === undefined || value === null) return null;
  if (typeof value !== "string") throw new HttpProblem(422, "validation_error", `The \`${field}\` field must be a string.`);
  return value;
}

/** Checks a send request the way Resend documents it and returns the message to store. */
export function validateSendRequest(body: unknown): Omit<FakeEmail, "id" | "created_at" | "idempotency_key"> {
  if (!body || typeof body !== "object" || Array.isArray(body)) {
    throw new HttpProblem(422, "validation_error", "The request body must be a JSON object.");
  }
  const b = body as Record<string, unknown>;
  const from = optionalString(b, "from");
  if (!from) throw new HttpProblem(422, "missing_required_field", "Missing `from` field.");
  if (!bareAddress(from)) {
    throw new HttpProblem(422, "validation_error", "Invalid `from` field. The email address needs to follow the `email@example.com` or `Name <email@example.com>` format.");
  }
  const to = addressList(b, "to", true)!;
  const subject = optionalString(b, "subject");
  if (!subject) throw new HttpProblem(422, "missing_required_field", "Missing `subject` field.");
  const html = optionalString(b, "html");
  const text = optionalString(b, "text");
  if (html === null && text === null && b.template === undefined) {
    throw new HttpProblem(422, "missing_required_field", "Missing `html` or `text` field.");
  }
  let headers: Record<string, string> | null = null;
  if (b.headers !== undefined && b.headers !== null) {
    if (typeof b.headers !== "object" || Array.isArray(b.headers) || Object.values(b.headers).some((v) => typeof v !== "string")) {
      throw new HttpProblem(422, "validation_error", "The `headers` field must be an object of strings.");
    }
    headers = b.headers as Record<string, string>;
  }
  let tags: FakeEmail["tags"] = null;
  if (b.tags !== undefined && b.tags !== null) {
    const ok = Array.isArray(b.tags) && b.tags.every((t) => t && typeof t === "object" && typeof t.name === "string" && typeof t.value === "string");
    if (!ok) throw new HttpProblem(422, "validation_error", "The `tags` field must be an array of `{ name, value }` strings.");
    tags = b.tags as FakeEmail["tags"];
  }
  return {
    object: "email",
    from,
    to,
    cc: addressList(b, "cc", false),
    bcc: addressList(b, "bcc", false),
    reply_to: addressList(b, "reply_to", false),
    subject,
    html,
    text,
    headers,
    tags,
    scheduled_at: optionalString(b, "scheduled_at"),
    last_event: "delivered",
  };
}

function loadMailbox(file: string): FakeEmail[] {
  if (!existsSync(file)) return [];
  const messages: FakeEmail[] = [];
  for (const line of readFileSync(file, "utf8").split("\n")) {
    if (!line.trim()) continue;
    try {
      messages.push(JSON.parse(line) as FakeEmail);
    } catch {
      // A half-written last line (the process was killed mid-append) is skipped, not fatal.
    }
  }
  return messages;
}

export async function startFakeResend(options: FakeResendOptions = {}): Promise<FakeResend> {
  const host = options.host ?? "127.0.0.1";
  const mailboxFile = options.mailboxFile ? path.resolve(options.mailboxFile) : undefined;
  if (mailboxFile) mkdirSync(path.dirname(mailboxFile), { recursive: true });
  const messages: FakeEmail[] = mailboxFile ? loadMailbox(mailboxFile) : [];
  // Resend keeps an idempotency key for 24 hours; the fake keeps it while it runs.
  const idempotent = new Map<string, { body: string; id: string }>();
  let failuresLeft = Math.max(0, options.failTimes ?? 0);
  let failStatus = options.failStatus ?? 500;

  function authorize(req: IncomingMessage) {
    const header = req.headers.authorization ?? "";
    const match = /^Bearer\s+(\S+)\s*$/i.exec(header);
    if (!match) throw new HttpProblem(401, "missing_api_key", "Missing API key in the authorization header. Include the following header in the request: Authorization: Bearer YOUR_API_KEY");
    const key = match[1];
    const valid = options.apiKey ? key === options.apiKey : key.startsWith("re_");
    if (!valid) throw new HttpProblem(403, "invalid_api_key", "API key is invalid.");
  }

  async function createEmail(req: IncomingMessage, res: ServerResponse) {
    authorize(req);
    const raw = await readBody(req);
    if (failuresLeft > 0) {
      failuresLeft--;
      throw new HttpProblem(failStatus, FAILURE_NAMES[failStatus] ?? "application_error", `The fake mail service was told to fail this request (${failuresLeft} more to fail).`);
    }
    let body: unknown;
    try {
      body = JSON.parse(raw);
    } catch {
      throw new HttpProblem(422, "validation_error", "The request body is not valid JSON.");
    }
    const keyHeader = req.headers["idempotency-key"];
    const key = Array.isArray(keyHeader) ? keyHeader[0] : keyHeader;
    if (key !== undefined && (key.length < 1 || key.length > 256)) {
      throw new HttpProblem(400, "invalid_idempotency_key", "The key must be between 1-256 chars.");
    }
    if (key) {
      const earlier = idempotent.get(key);
      if (earlier) {
        if (earlier.body !== raw) throw new HttpProblem(409, "invalid_idempotent_request", "Same idempotency key used with a different request payload.");
        return send(res, 200, { id: earlier.id });
      }
    }
    const email: FakeEmail = {
      id: randomUUID(),
      created_at: new Date().toISOString(),
      ...validateSendRequest(body),
      idempotency_key: key ?? null,
    };
    messages.push(email);
    if (key) idempotent.set(key, { body: raw, id: email.id });
    if (mailboxFile) appendFileSync(mailboxFile, JSON.stringify(email) + "\n");
    if (!options.quiet) console.log(`[fake-resend] ${email.id} → ${email.to.join(", ")}: ${email.subject}`);
    send(res, 200, { id: email.id });
  }

  function listEmails(url: URL, res: ServerResponse) {
    const limitParam = url.searchParams.get("limit");
    const limit = limitParam === null ? 20 : Number(limitParam);
    if (!Number.isInteger(limit) || limit < 1 || limit > 100) {
      throw new HttpProblem(422, "validation_error", "The `limit` parameter must be a whole number from 1 to 100.");
    }
    let newestFirst = [...messages].reverse();
    const after = url.searchParams.get("after");
    const before = url.searchParams.get("before");
    if (after) {
      const at = newestFirst.findIndex((m) => m.id === after);
      newestFirst = at === -1 ? [] : newestFirst.slice(at + 1);
    } else if (before) {
      const at = newestFirst.findIndex((m) => m.id === before);
      newestFirst = at === -1 ? [] : newestFirst.slice(Math.max(0, at - limit), at);
    }
    send(res, 200, { object: "list", has_more: newestFirst.length > limit, data: newestFirst.slice(0, limit) });
  }

  const server = createServer(async (req, res) => {
    const url = new URL(req.url ?? "/", `http://${host}`);
    const method = req.method ?? "GET";
    const parts = url.pathname.split("/").filter(Boolean);
    try {
      if (parts[0] === "_health" && method === "GET") {
        return send(res, 200, { ok: true, service: FAKE_RESEND_SERVICE, messages: messages.length, failuresLeft });
      }
      if (parts[0] === "_fail" && parts.length === 1) {
        if (method === "DELETE") {
          failuresLeft = 0;
          return send(res, 200, { failuresLeft });
        }
        if (method === "POST") {
          const times = Number(url.searchParams.get("times") ?? "1");
          const status = Number(url.searchParams.get("status") ?? "500");
          if (!Number.isInteger(times) || times < 0) throw new HttpProblem(422, "validation_error", "`times` must be a whole number, 0 or more.");
          if (!Number.isInteger(status) || status < 400 || status > 599) throw new HttpProblem(422, "validation_error", "`status` must be an HTTP error status from 400 to 599.");
          failuresLeft = times;
          failStatus = status;
          return send(res, 200, { failuresLeft, status });
        }
      }
      if (parts[0] === "_reset" && parts.length === 1 && method === "POST") {
        messages.length = 0;
        idempotent.clear();
        failuresLeft = 0;
        if (mailboxFile) writeFileSync(mailboxFile, "");
        return send(res, 200, { ok: true });
      }
      if (parts[0] === "emails" && parts.length === 1) {
        if (method === "POST") return await createEmail(req, res);
        if (method === "GET") {
          authorize(req);
          return listEmails(url, res);
        }
        throw new HttpProblem(405, "method_not_allowed", `Method ${method} is not allowed on /emails.`);
      }
      if (parts[0] === "emails" && parts.length === 2) {
        if (method !== "GET") throw new HttpProblem(405, "method_not_allowed", `Method ${method} is not allowed on /emails/{id}.`);
        authorize(req);
        const email = messages.find((m) => m.id === parts[1]);
        if (!email) throw new HttpProblem(404, "not_found", "Email not found");
        return send(res, 200, email);
      }
      throw new HttpProblem(404, "not_found", "The requested endpoint does not exist.");
    } catch (error) {
      if (error instanceof HttpProblem) return sendProblem(res, error);
      console.error("[fake-resend] unexpected failure", error);
      return sendProblem(res, new HttpProblem(500, "application_error", "The fake mail service failed unexpectedly."));
    }
  });

  await new Promise<void>((resolve, reject) => {
    server.once("error", reject);
    server.listen(options.port ?? 0, host, () => {
      server.off("error", reject);
      resolve();
    });
  });
  const port = (server.address() as AddressInfo).port;

  return {
    url: `http://${host}:${port}`,
    port,
    received: () => messages.map((m) => ({ ...m })),
    failNext(times, status = 500) {
      failuresLeft = Math.max(0, times);
      failStatus = status;
    },
    reset() {
      messages.length = 0;
      idempotent.clear();
      failuresLeft = 0;
      if (mailboxFile) writeFileSync(mailboxFile, "");
    },
    close: () =>
      new Promise<void>((resolve, reject) => {
        server.close((error) => (error ? reject(error) : resolve()));
        server.closeAllConnections();
      }),
  };
}

function argument(args: string[], name: string): string | undefined {
  const at = args.indexOf(`--${name}`);
  if (at !== -1) return args[at + 1];
  const inline = args.find((a) => a.startsWith(`--${name}=`));
  return inline?.slice(name.length + 3);
}

async function main() {
  const args = process.argv.slice(2);
  const config = env();
  const port = Number(argument(args, "port") ?? config.FAKE_RESEND_PORT);
  const mailboxFile = argument(args, "mailbox") ?? config.FAKE_RESEND_MAILBOX;
  const failTimes = Number(argument(args, "fail-times") ?? config.FAKE_RESEND_FAIL_TIMES);
  const host = argument(args, "host") ?? config.FAKE_RESEND_HOST;
  if (!Number.isInteger(port) || port < 0 || port > 65535) {
    console.error(`[fake-resend] --port must be a port number, not "${argument(args, "port")}".`);
    process.exit(2);
  }
  if (!Number.isInteger(failTimes) || failTimes < 0) {
    console.error("[fake-resend] --fail-times must be a whole number, 0 or more.");
    process.exit(2);
  }
  try {
    const fake = await startFakeResend({ port, host, mailboxFile, failTimes, apiKey: config.FAKE_RESEND_API_KEY });
    console.log(`[fake-resend] listening on ${fake.url} (mailbox ${path.resolve(mailboxFile)}); set RESEND_BASE_URL=${fake.url}`);
    const stop = () => void fake.close().finally(() => process.exit(0));
    process.on("SIGINT", stop);
    process.on("SIGTERM", stop);
  } catch (error) {
    const code = (error as NodeJS.ErrnoException).code;
    console.error(code === "EADDRINUSE" ? `[fake-resend] port ${port} is already in use.` : `[fake-resend] could not start: ${(error as Error).message}`);
    process.exit(1);
  }
}

// Runs only as `tsx lib/mail/fake-resend-server.ts`, not when imported by tests or the portal.
if (process.argv[1] && /fake-resend-server\.[cm]?[jt]s$/.test(process.argv[1])) {
  main().catch((error: unknown) => {
    console.error(`[fake-resend] could not start: ${(error as Error).message}`);
    process.exit(1);
  });
}
