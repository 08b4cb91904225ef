import { AsyncLocalStorage } from "node:async_hooks";
import type { Client } from "@libsql/client";
import LibsqlDatabase from "libsql";
import { databaseBusy } from "@/lib/errors";
import type { Database } from "./index";

/** Set while an operation runs under withBusyRetry, so the connection guard below acts for Papin's own client only. */
const retriedScope = new AsyncLocalStorage<true>();

export type BusyRetryOptions = { attempts?: number; baseDelayMs?: number; sleep?: (ms: number) => Promise<void>; random?: () => number };

const pause = (ms: number) => new Promise<void>((resolve) => setTimeout(resolve, ms));

/**
 * Runs a database operation again when SQLite answers SQLITE_BUSY / SQLITE_LOCKED (another writer held the file past
 * the busy timeout): up to `attempts` tries in all, with a short random back-off doubling each time (full jitter, so
 * racing writers do not retry in step). Only a whole statement or a whole transaction is retried, after SQLite rolled
 * it back, so nothing is written twice. The last failure is thrown as it came; route() and formAction() answer 503.
 */
export async function withBusyRetry<T>(operation: () => Promise<T>, { attempts = 4, baseDelayMs = 20, sleep = pause, random = Math.random }: BusyRetryOptions = {}): Promise<T> {
  for (let attempt = 1; ; attempt++) {
    try {
      return await retriedScope.run(true, operation);
    } catch (error) {
      if (attempt >= attempts || !databaseBusy(error)) throw error;
      await sleep(Math.round(random() * baseDelayMs * 2 ** (attempt - 1)));
    }
  }
}

type Connection = InstanceType<typeof LibsqlDatabase>;
type StatementMethods = Record<"run" | "get" | "all", (...args: unknown[]) => unknown>;
const guarded = LibsqlDatabase.prototype as Connection & { papinBusyGuard?: true };

/**
 * The embedded driver (`libsql` 0.5) leaves a statement that failed with SQLITE_BUSY in progress instead of resetting
 * it, so its connection keeps an open transaction: the pool hands the connection out again, and what is written
 * through it next is never committed and holds the write lock until the garbage collector finalizes the statement
 * (tursodatabase/libsql-client-ts#352, fix pending in libsql-js#237/#238). Closing such a connection at once makes
 * the pool drop it (it discards closed connections) — a retry then runs on a sound one. Only inside withBusyRetry's
 * operations (Papin's own client): other users of the driver in the process, such as the test libSQL server, keep
 * their connections and their own handling.
 */
export function closeConnectionsThatMeetBusy() {
  if (guarded.papinBusyGuard) return;
  guarded.papinBusyGuard = true;
  const prepare = guarded.prepare;
  guarded.prepare = function (this: Connection, ...args: Parameters<Connection["prepare"]>) {
    const statement = prepare.apply(this, args);
    const methods = statement as unknown as StatementMethods;
    for (const name of ["run", "get", "all"] as const) {
      const method = methods[name];
      methods[name] = (...callArgs) => {
        try {
          return method.apply(statement, callArgs);
        } catch (error) {
          if (retriedScope.getStore() && databaseBusy(error) && this.open) this.close();
          throw error;
        }
      };
    }
    return statement;
  } as Connection["prepare"];
}

/** The one place writes get their retry: every autocommit statement, batch and transaction of Papin's database. */
export function retryingWhenBusy(client: Client, db: Database): Database {
  const execute = client.execute.bind(client);
  const batch = client.batch.bind(client);
  client.execute = ((...args: Parameters<typeof execute>) => withBusyRetry(() => execute(...args))) as Client["execute"];
  client.batch = ((...args: Parameters<typeof batch>) => withBusyRetry(() => batch(...args))) as Client["batch"];
  const transaction = db.transaction.bind(db);
  db.transaction = ((...args: Parameters<typeof transaction>) => withBusyRetry(() => transaction(...args))) as Database["transaction"];
  return db;
}
