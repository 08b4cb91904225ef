/**
 * A small libSQL server for tests: Hrana 2 over HTTP, the protocol that @libsql/client 0.18 speaks to
 * an `http://` / `https://` / `libsql://` URL, backed by one SQLite file through the `libsql` native
 * package (the engine @libsql/client embeds).
 *
 * What the client sends, read from node_modules/@libsql/hrana-client/lib-esm/http/stream.js: it opens
 * the HTTP client with protocol version 2, so it never probes a version and only ever calls
 * `POST /v2/pipeline` with `{ baton, requests: [...] }` (JSON), the requests being `execute`, `batch`
 * (steps with `ok` / `not` / `and` conditions), `sequence`, `store_sql`, `close_sql` and `close`.
 * Every reply carries a new baton until the stream is closed; a stream owns one connection, so an
 * interactive transaction (BEGIN IMMEDIATE … COMMIT across several HTTP requests) stays on it.
 *
 * Served like sqld does: integers as decimal strings, floats as JSON numbers, blobs as base64, errors
 * as `{ message, code }` with SQLite's primary code names (SQLITE_CONSTRAINT…), foreign keys on (the
 * libsql engine's default), WAL, a stream expiring after 10 s without a request, a fresh connection
 * per stream. Anything else — Hrana 3 (`/v3…`, cursors, `get_autocommit`, `is_autocommit`),
 * `describe`, an unknown request or value type — is answered with HTTP 400 and a Hrana error, so a gap
 * shows up as a failing test rather than a silent pass.
 *
 * Run it by hand: `npx tsx tests/support/hrana-server.ts --file data/remote.db --token secret --port 8081`.
 */
import Database from "libsql";
import { createHmac, randomBytes, timingSafeEqual } from "node:crypto";
import { createServer, type IncomingMessage, type Server, type ServerResponse } from "node:http";
import type { AddressInfo } from "node:net";
import { pathToFileURL } from "node:url";

type Connection = InstanceType<typeof Database>;

export type HranaServerOptions = {
  /** The SQLite file behind the server (created when missing). */
  file: string;
  /** The bearer token every pipeline request must carry. */
  authToken: string;
  host?: string;
  /** 0 (the default) picks a free port. */
  port?: number;
  /** How long a stream may sit without a request before it is expired and its transaction rolled back. */
  streamExpiryMs?: number;
  /** How long a statement waits, asynchronously, for another stream's write lock before SQLITE_BUSY. */
  busyTimeoutMs?: number;
};

export type HranaStats = {
  httpRequests: number;
  pipelines: number;
  refusedAuth: number;
  /** HTTP 400 answers: protocol errors and unimplemented features, with their messages. */
  rejected: Array<{ code: string; message: string }>;
  requests: Record<string, number>;
  statements: number;
  statementErrors: Array<{ code: string; message: string }>;
  streamsOpened: number;
  /** Streams used by more than one HTTP request, i.e. carried by a baton. */
  streamsResumed: number;
  transactions: number;
  longestTransactionMs: number;
  /** The longest pause between two HTTP requests of a stream while it held an open transaction. */
  longestIdleInTransactionMs: number;
  busyRetries: number;
  /** Statements that gave up waiting for another stream's lock and answered SQLITE_BUSY. */
  busyGiveUps: number;
  expiredStreams: number;
  conditionsEvaluated: Record<string, number>;
};

export type HranaServer = {
  url: string;
  port: number;
  stats: HranaStats;
  /** Streams currently open. */
  openStreams: () => number;
  /** Accept another token from now on (as when a token is rotated or revoked). */
  setAuthToken: (token: string) => void;
  close: () => Promise<void>;
};

// ---------------------------------------------------------------------------------------------------
// Errors

/** Answered as HTTP 400 with a Hrana error body; the stream is dropped (its transaction rolled back). */
class RequestRefused extends Error {
  constructor(
    readonly code: "PROTOCOL_ERROR" | "NOT_IMPLEMENTED" | "BATON_INVALID" | "BATON_REUSED" | "STREAM_EXPIRED",
    message: string,
  ) {
    super(message);
  }
}
const protocol = (message: string) => new RequestRefused("PROTOCOL_ERROR", message);
const unimplemented = (what: string) => new RequestRefused("NOT_IMPLEMENTED", `${what} is not implemented by this test server (it speaks Hrana 2 over HTTP only).`);

/** A failed statement: reported in the stream result (or batch step), the stream goes on. */
class StmtError extends Error {
  constructor(
    readonly code: string,
    message: string,
  ) {
    super(message);
  }
}

// Primary result codes, named as sqld names them (libsql-server hrana/stmt.rs, sqlite_error_code).
const SQLITE_CODES: Record<number, string> = {
  1: "SQLITE_ERROR",
  2: "SQLITE_INTERNAL",
  3: "SQLITE_PERM",
  4: "SQLITE_ABORT",
  5: "SQLITE_BUSY",
  6: "SQLITE_LOCKED",
  7: "SQLITE_NOMEM",
  8: "SQLITE_READONLY",
  9: "SQLITE_INTERRUPT",
  10: "SQLITE_IOERR",
  11: "SQLITE_CORRUPT",
  12: "SQLITE_NOTFOUND",
  13: "SQLITE_FULL",
  14: "SQLITE_CANTOPEN",
  15: "SQLITE_PROTOCOL",
  17: "SQLITE_SCHEMA",
  18: "SQLITE_TOOBIG",
  19: "SQLITE_CONSTRAINT",
  20: "SQLITE_MISMATCH",
  21: "SQLITE_MISUSE",
  22: "SQLITE_NOLFS",
  23: "SQLITE_AUTH",
  25: "SQLITE_RANGE",
  26: "SQLITE_NOTADB",
};

function stmtErrorFrom(error: unknown): StmtError {
  if (error instanceof StmtError) return error;
  if (error instanceof Database.SqliteError) {
    const raw = (error as { rawCode?: number }).rawCode;
    const code = raw === undefined ? "SQLITE_UNKNOWN" : (SQLITE_CODES[raw & 0xff] ?? "SQLITE_UNKNOWN");
    return new StmtError(code, `SQLite error: ${error.message}`);
  }
  // Anything else (a binding the engine refuses, say) is a bug to see, not a database answer.
  throw error;
}

const SQLITE_BUSY = 5;
const SQLITE_BUSY_SNAPSHOT = 517; // retrying cannot help: the transaction's snapshot is stale
function isBusy(error: unknown): boolean {
  if (!(error instanceof Database.SqliteError)) return false;
  const raw = (error as { rawCode?: number }).rawCode ?? 0;
  return (raw & 0xff) === SQLITE_BUSY && raw !== SQLITE_BUSY_SNAPSHOT;
}

// ---------------------------------------------------------------------------------------------------
// SQL text: statement boundaries (SQLite's own sqlite3_complete() state machine, so that the
// semicolons inside CREATE TRIGGER … BEGIN … END do not split it) and the parameters it names.

type Token = "SEMI" | "WS" | "OTHER" | "EXPLAIN" | "CREATE" | "TEMP" | "TRIGGER" | "END";
const TOKEN_COLUMN: Record<Token, number> = { SEMI: 0, WS: 1, OTHER: 2, EXPLAIN: 3, CREATE: 4, TEMP: 5, TRIGGER: 6, END: 7 };
// Rows: states INVALID, START, NORMAL, EXPLAIN, CREATE, TRIGGER, SEMI, END (sqlite/src/complete.c).
const TRANSITIONS = [
  [1, 0, 2, 3, 4, 2, 2, 2],
  [1, 1, 2, 3, 4, 2, 2, 2],
  [1, 2, 2, 2, 2, 2, 2, 2],
  [1, 3, 3, 2, 4, 2, 2, 2],
  [1, 4, 2, 2, 2, 4, 5, 2],
  [6, 5, 5, 5, 5, 5, 5, 5],
  [6, 6, 5, 5, 5, 5, 5, 7],
  [1, 7, 5, 5, 5, 5, 5, 5],
];
const KEYWORDS: Record<string, Token> = { explain: "EXPLAIN", create: "CREATE", temp: "TEMP", temporary: "TEMP", trigger: "TRIGGER", end: "END" };

export type SqlStatement = {
  text: string;
  /** Highest parameter index (what sqlite3_bind_parameter_count() would say). */
  parameterCount: number;
  /** True when a bare `?` appears: such a parameter can only be bound by position. */
  hasNamelessParameter: boolean;
};

export function splitStatements(sql: string): SqlStatement[] {
  const out: SqlStatement[] = [];
  let state = 0;
  let start = 0;
  let hasContent = false;
  let maxIndex = 0;
  let nameless = false;
  const named = new Map<string, number>();
  const finish = (end: number) => {
    if (hasContent) out.push({ text: sql.slice(start, end), parameterCount: maxIndex, hasNamelessParameter: nameless });
    start = end;
    hasContent = false;
    maxIndex = 0;
    nameless = false;
    named.clear();
  };
  const isIdent = (c: string) => /[A-Za-z0-9_$\u0080-\uffff]/.test(c);
  let i = 0;
  while (i < sql.length) {
    const c = sql[i];
    let token: Token;
    let j = i + 1;
    if (c === ";") token = "SEMI";
    else if (/\s/.test(c)) token = "WS";
    else if (c === "-" && sql[i + 1] === "-") {
      while (j < sql.length && sql[j] !== "\n") j++;
      token = "WS";
    } else if (c === "/" && sql[i + 1] === "*") {
      const close = sql.indexOf("*/", i + 2);
      j = close < 0 ? sql.length : close + 2;
      token = "WS";
    } else if (c === "'" || c === '"' || c === "`" || c === "[") {
      const closer = c === "[" ? "]" : c;
      for (;;) {
        const close = sql.indexOf(closer, j);
        if (close < 0) {
          j = sql.length;
          break;
        }
        j = close + 1;
        if (closer !== "]" && sql[j] === closer)
          j++; // a doubled quote stays inside
        else break;
      }
      token = "OTHER";
    } else if (c === "?") {
      while (j < sql.length && /[0-9]/.test(sql[j])) j++;
      if (j === i + 1) {
        nameless = true;
        maxIndex += 1;
      } else maxIndex = Math.max(maxIndex, Number(sql.slice(i + 1, j)));
      token = "OTHER";
    } else if ((c === ":" || c === "@" || c === "$") && j < sql.length && isIdent(sql[j])) {
      while (j < sql.length && isIdent(sql[j])) j++;
      const name = sql.slice(i, j);
      if (!named.has(name)) named.set(name, (maxIndex += 1));
      token = "OTHER";
    } else if (/[A-Za-z_\u0080-\uffff]/.test(c)) {
      while (j < sql.length && isIdent(sql[j])) j++;
      token = KEYWORDS[sql.slice(i, j).toLowerCase()] ?? "OTHER";
    } else token = "OTHER";
    state = TRANSITIONS[state][TOKEN_COLUMN[token]];
    if (token !== "WS" && token !== "SEMI") hasContent = true;
    i = j;
    if (token === "SEMI" && state === 1) finish(i);
  }
  finish(sql.length);
  return out;
}

// ---------------------------------------------------------------------------------------------------
// Wire values (Hrana 2 JSON)

type WireValue = { type: "null" } | { type: "integer"; value: string } | { type: "float"; value: number } | { type: "text"; value: string } | { type: "blob"; base64: string };
type SqlValue = null | bigint | number | string | Buffer;

const I64_MIN = -(2n ** 63n);
const I64_MAX = 2n ** 63n - 1n;

function isObject(v: unknown): v is Record<string, unknown> {
  return typeof v === "object" && v !== null && !Array.isArray(v);
}

function valueIn(v: unknown, where: string): SqlValue {
  if (!isObject(v) || typeof v.type !== "string") throw protocol(`${where}: a value must be an object with a "type".`);
  switch (v.type) {
    case "null":
      return null;
    case "integer": {
      if (typeof v.value !== "string" || !/^-?[0-9]+$/.test(v.value)) throw protocol(`${where}: an integer's "value" must be a decimal string, got ${JSON.stringify(v.value)}.`);
      const n = BigInt(v.value);
      if (n < I64_MIN || n > I64_MAX) throw protocol(`${where}: integer ${v.value} does not fit in 64 bits.`);
      return n;
    }
    case "float":
      if (typeof v.value !== "number" || !Number.isFinite(v.value)) throw protocol(`${where}: a float's "value" must be a finite JSON number.`);
      return v.value;
    case "text":
      if (typeof v.value !== "string") throw protocol(`${where}: a text's "value" must be a string.`);
      return v.value;
    case "blob":
      if (typeof v.base64 !== "string" || !/^[A-Za-z0-9+/]*={0,2}$/.test(v.base64)) throw protocol(`${where}: a blob's "base64" must be base64 text.`);
      return Buffer.from(v.base64, "base64");
    default:
      throw protocol(`${where}: unknown value type ${JSON.stringify(v.type)}.`);
  }
}

function valueOut(v: unknown): WireValue {
  if (v === null) return { type: "null" };
  if (typeof v === "bigint") return { type: "integer", value: v.toString() };
  if (typeof v === "number") {
    if (!Number.isFinite(v)) throw new StmtError("SQLITE_MISMATCH", `The result holds ${v}, which Hrana's JSON encoding cannot carry.`);
    return { type: "float", value: v };
  }
  if (typeof v === "string") return { type: "text", value: v };
  if (Buffer.isBuffer(v)) return { type: "blob", base64: v.toString("base64").replace(/=+$/, "") };
  throw new Error(`The engine returned a value of an unexpected kind: ${typeof v}`);
}

// ---------------------------------------------------------------------------------------------------
// Streams

type Stream = {
  id: Buffer;
  seq: number;
  db: Connection | null;
  sqls: Map<number, string>;
  acquired: boolean;
  httpRequests: number;
  timer?: NodeJS.Timeout;
  releasedAt: number;
  transactionSince: number | null;
  probes: Probes;
  /** Set when a statement gave up waiting for a lock inside a transaction (see runWithBusyRetry). */
  poisoned: boolean;
};
type Probes = { totalChanges: ReturnType<Connection["prepare"]>; after: ReturnType<Connection["prepare"]> };

type StmtResult = {
  cols: Array<{ name: string | null; decltype: string | null }>;
  rows: WireValue[][];
  affected_row_count: number;
  last_insert_rowid: string | null;
};

function emptyStats(): HranaStats {
  return {
    httpRequests: 0,
    pipelines: 0,
    refusedAuth: 0,
    rejected: [],
    requests: {},
    statements: 0,
    statementErrors: [],
    streamsOpened: 0,
    streamsResumed: 0,
    transactions: 0,
    longestTransactionMs: 0,
    longestIdleInTransactionMs: 0,
    busyRetries: 0,
    busyGiveUps: 0,
    expiredStreams: 0,
    conditionsEvaluated: {},
  };
}

const sleep = (ms: number) => new Promise((resolve) => setTimeout(resolve, ms));
const MAX_BODY_BYTES = 256 * 1024 * 1024;

export async function startHranaServer(options: HranaServerOptions): Promise<HranaServer> {
  const streamExpiryMs = options.streamExpiryMs ?? 10_000; // sqld: hrana/http/stream.rs EXPIRATION
  const busyTimeoutMs = options.busyTimeoutMs ?? 5_000;
  const batonKey = randomBytes(32);
  const streams = new Map<string, Stream>();
  const expired = new Set<string>();
  const stats = emptyStats();
  let authToken = Buffer.from(options.authToken);

  // WAL lets readers on other streams go on while one stream writes, as on sqld.
  {
    const setup = new Database(options.file);
    setup.exec("PRAGMA journal_mode = WAL");
    setup.close();
  }

  const count = (bag: Record<string, number>, key: string) => (bag[key] = (bag[key] ?? 0) + 1);

  function openConnection(): Connection {
    // timeout 0: no busy handler inside the engine, which would block this process's event loop while
    // the stream holding the lock waits for its next HTTP request; runWithBusyRetry waits instead.
    const db = new Database(options.file, { timeout: 0 });
    return db;
  }

  function probesOf(db: Connection): Probes {
    return {
      totalChanges: db.prepare("SELECT total_changes()").raw(true).safeIntegers(true),
      after: db.prepare("SELECT changes(), total_changes(), last_insert_rowid()").raw(true).safeIntegers(true),
    };
  }

  function newStream(): Stream {
    const db = openConnection();
    const stream: Stream = {
      id: randomBytes(12),
      seq: randomBytes(4).readUInt32BE(0),
      db,
      sqls: new Map(),
      acquired: true,
      httpRequests: 0,
      releasedAt: Date.now(),
      transactionSince: null,
      probes: probesOf(db),
      poisoned: false,
    };
    streams.set(stream.id.toString("hex"), stream);
    stats.streamsOpened++;
    return stream;
  }

  function baton(stream: Stream): string {
    const payload = Buffer.alloc(16);
    stream.id.copy(payload, 0);
    payload.writeUInt32BE(stream.seq >>> 0, 12);
    const mac = createHmac("sha256", batonKey).update(payload).digest();
    return Buffer.concat([payload, mac]).toString("base64url");
  }

  function acquire(batonText: unknown): Stream {
    if (typeof batonText !== "string") throw protocol('"baton" must be a string or null.');
    const data = Buffer.from(batonText, "base64url");
    if (data.length !== 48) throw new RequestRefused("BATON_INVALID", "The baton is not one this server issued.");
    const payload = data.subarray(0, 16);
    const mac = createHmac("sha256", batonKey).update(payload).digest();
    if (!timingSafeEqual(mac, data.subarray(16))) throw new RequestRefused("BATON_INVALID", "The baton is not one this server issued.");
    const key = payload.subarray(0, 12).toString("hex");
    const stream = streams.get(key);
    if (!stream) {
      if (expired.has(key)) throw new RequestRefused("STREAM_EXPIRED", "The stream has expired due to inactivity.");
      throw new RequestRefused("BATON_INVALID", "The baton names a stream that is closed.");
    }
    if (stream.acquired) throw new RequestRefused("BATON_REUSED", "The stream is busy with another request: requests on a stream must wait for each other.");
    if (payload.readUInt32BE(12) !== stream.seq >>> 0) throw new RequestRefused("BATON_REUSED", "The baton was already used: each reply's baton is good for one request.");
    clearTimeout(stream.timer);
    stream.acquired = true;
    stream.httpRequests++;
    if (stream.httpRequests === 2) stats.streamsResumed++;
    if (stream.transactionSince !== null) {
      stats.longestIdleInTransactionMs = Math.max(stats.longestIdleInTransactionMs, Date.now() - stream.releasedAt);
    }
    return stream;
  }

  function closeStream(stream: Stream) {
    clearTimeout(stream.timer);
    if (stream.db) {
      if (stream.db.inTransaction) {
        try {
          stream.db.exec("ROLLBACK");
        } catch {
          // closing the connection rolls back anyway
        }
        noteTransactionEnd(stream);
      }
      stream.db.close();
      stream.db = null;
    }
    streams.delete(stream.id.toString("hex"));
  }

  function release(stream: Stream): string | null {
    stream.acquired = false;
    if (!stream.db) return null;
    stream.seq = (stream.seq + 1) >>> 0;
    stream.releasedAt = Date.now();
    stream.timer = setTimeout(() => {
      if (stream.acquired || !stream.db) return;
      stats.expiredStreams++;
      const key = stream.id.toString("hex");
      closeStream(stream);
      expired.add(key);
    }, streamExpiryMs);
    stream.timer.unref();
    return baton(stream);
  }

  function noteTransactionEnd(stream: Stream) {
    if (stream.transactionSince === null) return;
    stats.transactions++;
    stats.longestTransactionMs = Math.max(stats.longestTransactionMs, Date.now() - stream.transactionSince);
    stream.transactionSince = null;
  }

  function trackTransaction(stream: Stream) {
    const inTx = stream.db!.inTransaction;
    if (inTx && stream.transactionSince === null) stream.transactionSince = Date.now();
    else if (!inTx) noteTransactionEnd(stream);
  }

  /**
   * Runs `work` until it gets past SQLITE_BUSY or the busy timeout passes, waiting between tries
   * without blocking the event loop (what sqld's blocking threads do for it).
   *
   * The engine keeps a statement that returned SQLITE_BUSY active until it is stepped again or
   * finalized, and the native package finalizes only on garbage collection: a fresh statement on
   * retry would leave the old one behind and a later COMMIT would fail with "SQL statements in
   * progress". So `work` must retry the same statement object (the package resets it before each
   * run). When the wait is given up, the half-run statement cannot be released: outside a
   * transaction the stream gets a fresh connection (nothing else is lost); inside one the stream
   * is marked poisoned and refuses further statements loudly rather than fail later in a way that
   * would look like the application's fault.
   */
  async function runWithBusyRetry<T>(stream: Stream, work: () => T): Promise<T> {
    const deadline = Date.now() + busyTimeoutMs;
    let delay = 1;
    for (;;) {
      try {
        return work();
      } catch (error) {
        if (!isBusy(error)) throw error;
        if (Date.now() >= deadline) {
          stats.busyGiveUps++;
          const db = stream.db!;
          if (db.inTransaction) stream.poisoned = true;
          else {
            try {
              db.close();
            } catch {
              // a connection with a live statement may refuse to close; it is dropped all the same
            }
            stream.db = openConnection();
            stream.probes = probesOf(stream.db);
          }
          throw error;
        }
        stats.busyRetries++;
        await sleep(delay);
        delay = Math.min(delay * 2, 25);
      }
    }
  }

  function sqlOf(stream: Stream, req: Record<string, unknown>, where: string): string {
    const hasSql = req.sql !== undefined && req.sql !== null;
    const hasId = req.sql_id !== undefined && req.sql_id !== null;
    if (hasSql && hasId) throw protocol(`${where}: give either "sql" or "sql_id", not both.`);
    if (hasSql) {
      if (typeof req.sql !== "string") throw protocol(`${where}: "sql" must be a string.`);
      return req.sql;
    }
    if (hasId) {
      if (!Number.isInteger(req.sql_id)) throw protocol(`${where}: "sql_id" must be an integer.`);
      const text = stream.sqls.get(req.sql_id as number);
      if (text === undefined) throw protocol(`${where}: no SQL text is stored under sql_id ${req.sql_id}.`);
      return text;
    }
    throw protocol(`${where}: a statement needs "sql" or "sql_id".`);
  }

  /** Decodes a Stmt; protocol errors throw RequestRefused, SQL-level refusals throw StmtError (lazily, at run). */
  function decodeStmt(stream: Stream, stmt: unknown, where: string) {
    if (!isObject(stmt)) throw protocol(`${where}: "stmt" must be an object.`);
    const sql = sqlOf(stream, stmt, where);
    const args = stmt.args ?? [];
    const namedArgs = stmt.named_args ?? [];
    if (!Array.isArray(args)) throw protocol(`${where}: "args" must be an array.`);
    if (!Array.isArray(namedArgs)) throw protocol(`${where}: "named_args" must be an array.`);
    if (stmt.want_rows !== undefined && stmt.want_rows !== null && typeof stmt.want_rows !== "boolean") throw protocol(`${where}: "want_rows" must be a boolean.`);
    const positional = args.map((a, i) => valueIn(a, `${where} args[${i}]`));
    const named: Record<string, SqlValue> = {};
    namedArgs.forEach((a, i) => {
      if (!isObject(a) || typeof a.name !== "string") throw protocol(`${where} named_args[${i}]: needs a string "name".`);
      const name = /^[:@$]/.test(a.name) ? a.name.slice(1) : a.name;
      named[name] = valueIn(a.value, `${where} named_args[${i}]`);
    });
    return { sql, positional, named, hasNamed: namedArgs.length > 0, wantRows: stmt.want_rows !== false };
  }

  async function execute(stream: Stream, s: ReturnType<typeof decodeStmt>): Promise<StmtResult> {
    stats.statements++;
    try {
      const parts = splitStatements(s.sql);
      if (parts.length === 0) throw new StmtError("SQL_NO_STATEMENT", "SQL string does not contain any statement");
      if (parts.length > 1) throw new StmtError("SQL_MANY_STATEMENTS", "SQL string contains more than one statement");
      const [part] = parts;
      let bind: SqlValue[] | Record<string, SqlValue>;
      if (s.hasNamed) {
        if (s.positional.length > 0) throw new StmtError("ARGS_BOTH_POSITIONAL_AND_NAMED", "Specifying both positional and named arguments is not supported");
        // The engine can bind a bare `?` only by position (by name it aborts the process).
        if (part.hasNamelessParameter) throw new StmtError("ARGS_INVALID", "Arguments do not match SQL parameters: a bare ? cannot take a named argument");
        bind = s.named;
      } else {
        if (s.positional.length > part.parameterCount) {
          throw new StmtError("ARGS_INVALID", `Arguments do not match SQL parameters: ${s.positional.length} arguments for ${part.parameterCount} parameters`);
        }
        bind = s.positional;
      }
      if (stream.poisoned) throw unimplemented("Going on with a transaction after one of its statements gave up waiting for a lock");
      let prepared: ReturnType<Connection["prepare"]> | undefined;
      const result = await runWithBusyRetry(stream, () => {
        const [before] = stream.probes.totalChanges.all([]) as unknown as [[bigint]];
        prepared ??= stream.db!.prepare(s.sql).safeIntegers(true);
        let cols: StmtResult["cols"] = [];
        let rows: unknown[][] = [];
        if (prepared.reader) {
          prepared.raw(true);
          cols = prepared.columns().map((c) => ({ name: c.name ?? null, decltype: c.type ?? null }));
          rows = prepared.all(bind) as unknown[][];
        } else {
          prepared.run(bind);
        }
        const [[changes, total, rowid]] = stream.probes.after.all([]) as unknown as [[bigint, bigint, bigint]];
        const changed = total !== before[0];
        return {
          cols,
          rows: s.wantRows ? rows.map((row) => row.map(valueOut)) : [],
          affected_row_count: changed ? Number(changes) : 0,
          last_insert_rowid: changed ? rowid.toString() : null,
        };
      });
      return result;
    } catch (error) {
      const e = stmtErrorFrom(error);
      stats.statementErrors.push({ code: e.code, message: e.message });
      throw e;
    } finally {
      trackTransaction(stream);
    }
  }

  function evalCondition(cond: unknown, step: number, outcomes: Array<"ok" | "error" | "skipped">, where: string): boolean {
    if (!isObject(cond) || typeof cond.type !== "string") throw protocol(`${where}: a condition must be an object with a "type".`);
    count(stats.conditionsEvaluated, cond.type);
    const stepRef = () => {
      if (!Number.isInteger(cond.step) || (cond.step as number) < 0 || (cond.step as number) >= step) {
        throw protocol(`${where}: condition "${cond.type}" must name an earlier step, got ${JSON.stringify(cond.step)}.`);
      }
      return outcomes[cond.step as number];
    };
    switch (cond.type) {
      case "ok":
        return stepRef() === "ok";
      case "error":
        return stepRef() === "error";
      case "not":
        return !evalCondition(cond.cond, step, outcomes, where);
      case "and":
      case "or": {
        if (!Array.isArray(cond.conds)) throw protocol(`${where}: condition "${cond.type}" needs "conds".`);
        const values = cond.conds.map((c) => evalCondition(c, step, outcomes, where));
        return cond.type === "and" ? values.every(Boolean) : values.some(Boolean);
      }
      case "is_autocommit":
        throw unimplemented('The "is_autocommit" batch condition (Hrana 3)');
      default:
        throw protocol(`${where}: unknown condition type ${JSON.stringify(cond.type)}.`);
    }
  }

  async function runBatch(stream: Stream, batch: unknown, where: string) {
    if (!isObject(batch) || !Array.isArray(batch.steps)) throw protocol(`${where}: "batch" must hold "steps".`);
    const stepResults: Array<StmtResult | null> = [];
    const stepErrors: Array<{ message: string; code: string } | null> = [];
    const outcomes: Array<"ok" | "error" | "skipped"> = [];
    for (let i = 0; i < batch.steps.length; i++) {
      const step: unknown = batch.steps[i];
      const at = `${where} step ${i}`;
      if (!isObject(step)) throw protocol(`${at}: a step must be an object.`);
      const decoded = decodeStmt(stream, step.stmt, at);
      const run = step.condition === undefined || step.condition === null ? true : evalCondition(step.condition, i, outcomes, at);
      if (!run) {
        stepResults.push(null);
        stepErrors.push(null);
        outcomes.push("skipped");
        continue;
      }
      try {
        stepResults.push(await execute(stream, decoded));
        stepErrors.push(null);
        outcomes.push("ok");
      } catch (error) {
        if (!(error instanceof StmtError)) throw error;
        stepResults.push(null);
        stepErrors.push({ message: error.message, code: error.code });
        outcomes.push("error");
      }
    }
    return { step_results: stepResults, step_errors: stepErrors };
  }

  async function runSequence(stream: Stream, sql: string) {
    for (const part of splitStatements(sql)) {
      stats.statements++;
      try {
        if (stream.poisoned) throw unimplemented("Going on with a transaction after one of its statements gave up waiting for a lock");
        let prepared: ReturnType<Connection["prepare"]> | undefined;
        await runWithBusyRetry(stream, () => (prepared ??= stream.db!.prepare(part.text)).run([]));
      } catch (error) {
        const e = stmtErrorFrom(error);
        stats.statementErrors.push({ code: e.code, message: e.message });
        throw e;
      } finally {
        trackTransaction(stream);
      }
    }
  }

  type StreamResult = { type: "ok"; response: Record<string, unknown> } | { type: "error"; error: { message: string; code: string } };

  async function handleRequest(stream: Stream, req: unknown, index: number): Promise<StreamResult> {
    const where = `requests[${index}]`;
    if (!isObject(req) || typeof req.type !== "string") throw protocol(`${where}: a request must be an object with a "type".`);
    if (!stream.db) throw protocol(`${where}: the stream was closed by an earlier request of this pipeline.`);
    count(stats.requests, req.type);
    const ok = (response: Record<string, unknown>): StreamResult => ({ type: "ok", response: { type: req.type, ...response } });
    const failed = (error: unknown): StreamResult => {
      if (error instanceof StmtError) return { type: "error", error: { message: error.message, code: error.code } };
      throw error;
    };
    switch (req.type) {
      case "close":
        closeStream(stream);
        return ok({});
      case "execute": {
        const stmt = decodeStmt(stream, req.stmt, where);
        try {
          return ok({ result: await execute(stream, stmt) });
        } catch (error) {
          return failed(error);
        }
      }
      case "batch":
        return ok({ result: await runBatch(stream, req.batch, where) });
      case "sequence": {
        const sql = sqlOf(stream, req, where);
        try {
          await runSequence(stream, sql);
          return ok({});
        } catch (error) {
          return failed(error);
        }
      }
      case "store_sql": {
        if (!Number.isInteger(req.sql_id)) throw protocol(`${where}: "sql_id" must be an integer.`);
        if (typeof req.sql !== "string") throw protocol(`${where}: "sql" must be a string.`);
        if (stream.sqls.has(req.sql_id as number)) throw protocol(`${where}: sql_id ${req.sql_id} is already in use on this stream.`);
        stream.sqls.set(req.sql_id as number, req.sql);
        return ok({});
      }
      case "close_sql":
        if (!Number.isInteger(req.sql_id)) throw protocol(`${where}: "sql_id" must be an integer.`);
        stream.sqls.delete(req.sql_id as number);
        return ok({});
      case "describe":
        throw unimplemented('The "describe" request');
      case "get_autocommit":
        throw unimplemented('The "get_autocommit" request (Hrana 3)');
      default:
        throw protocol(`${where}: unknown request type ${JSON.stringify(req.type)}.`);
    }
  }

  async function pipeline(body: unknown) {
    if (!isObject(body) || !Array.isArray(body.requests)) throw protocol('The body must be a JSON object with "requests".');
    stats.pipelines++;
    const stream = body.baton === undefined || body.baton === null ? newStream() : acquire(body.baton);
    try {
      const results: StreamResult[] = [];
      for (let i = 0; i < body.requests.length; i++) results.push(await handleRequest(stream, body.requests[i], i));
      return { baton: release(stream), base_url: null, results };
    } catch (error) {
      // A request that breaks the protocol ends its stream, as on sqld.
      closeStream(stream);
      throw error;
    }
  }

  function send(res: ServerResponse, status: number, body: unknown) {
    const text = JSON.stringify(body);
    // Exactly "application/json": the client reads an error body only for that content type.
    res.writeHead(status, { "content-type": "application/json", "content-length": Buffer.byteLength(text) });
    res.end(text);
  }

  function authorized(req: IncomingMessage): boolean {
    const header = req.headers.authorization ?? "";
    const match = /^Bearer (.+)$/.exec(header);
    if (!match) return false;
    const given = Buffer.from(match[1]);
    return given.length === authToken.length && timingSafeEqual(given, authToken);
  }

  async function readJson(req: IncomingMessage): Promise<unknown> {
    const chunks: Buffer[] = [];
    let size = 0;
    for await (const chunk of req) {
      size += (chunk as Buffer).length;
      if (size > MAX_BODY_BYTES) throw protocol(`The request body is larger than ${MAX_BODY_BYTES} bytes.`);
      chunks.push(chunk as Buffer);
    }
    try {
      return JSON.parse(Buffer.concat(chunks).toString("utf8"));
    } catch {
      throw protocol("The request body is not JSON.");
    }
  }

  async function handle(req: IncomingMessage, res: ServerResponse) {
    stats.httpRequests++;
    const path = new URL(req.url ?? "/", "http://x").pathname.replace(/\/+$/, "") || "/";
    try {
      if (req.method === "GET" && (path === "/v2" || path === "/health")) {
        res.writeHead(200, { "content-type": "text/plain" });
        res.end(path === "/v2" ? "Hrana 2 over HTTP\n" : "ok\n");
        return;
      }
      if (path === "/v2/pipeline") {
        if (req.method !== "POST") return send(res, 405, { message: "Use POST for /v2/pipeline.", code: "PROTOCOL_ERROR" });
        if (!authorized(req)) {
          stats.refusedAuth++;
          req.resume();
          // sqld answers a refused token with 401 and a JSON body without "message".
          return send(res, 401, { error: "Unauthorized: the bearer token is missing or not accepted." });
        }
        const body = await readJson(req);
        return send(res, 200, await pipeline(body));
      }
      req.resume();
      if (path === "/v1" || path.startsWith("/v1/") || path.startsWith("/v3")) throw unimplemented(`${req.method} ${path}`);
      return send(res, 404, { message: `No such endpoint: ${req.method} ${path}.`, code: "NOT_FOUND" });
    } catch (error) {
      if (error instanceof RequestRefused) {
        stats.rejected.push({ code: error.code, message: error.message });
        return send(res, 400, { message: error.message, code: error.code });
      }
      console.error("[hrana-server] internal error", error);
      return send(res, 500, { message: `Internal error in the test server: ${(error as Error).message}`, code: "INTERNAL_ERROR" });
    }
  }

  const server: Server = createServer((req, res) => void handle(req, res));
  await new Promise<void>((resolve, reject) => {
    server.once("error", reject);
    server.listen(options.port ?? 0, options.host ?? "127.0.0.1", () => resolve());
  });
  const { port } = server.address() as AddressInfo;
  const host = options.host ?? "127.0.0.1";

  return {
    url: `http://${host.includes(":") ? `[${host}]` : host}:${port}`,
    port,
    stats,
    openStreams: () => streams.size,
    setAuthToken: (token: string) => {
      authToken = Buffer.from(token);
    },
    close: async () => {
      for (const stream of [...streams.values()]) closeStream(stream);
      server.closeAllConnections();
      await new Promise<void>((resolve) => server.close(() => resolve()));
    },
  };
}

// ---------------------------------------------------------------------------------------------------
// By hand: npx tsx tests/support/hrana-server.ts --file data/remote.db --token secret [--port 8081] [--host 127.0.0.1]

if (process.argv[1] && import.meta.url === pathToFileURL(process.argv[1]).href) {
  const arg = (name: string) => {
    const i = process.argv.indexOf(`--${name}`);
    return i > 0 ? process.argv[i + 1] : undefined;
  };
  const file = arg("file");
  const token = arg("token") ?? process.env.DATABASE_AUTH_TOKEN;
  if (!file || !token) {
    console.error("Usage: tsx tests/support/hrana-server.ts --file <sqlite file> --token <bearer token> [--port 8081] [--host 127.0.0.1]");
    process.exit(2);
  }
  const server = await startHranaServer({ file, authToken: token, port: Number(arg("port") ?? 8081), host: arg("host") });
  console.log(`Hrana 2 test server on ${server.url} (file ${file}). DATABASE_URL=${server.url} DATABASE_AUTH_TOKEN=<your token>`);
  const stop = () => void server.close().then(() => process.exit(0));
  process.on("SIGINT", stop);
  process.on("SIGTERM", stop);
}
