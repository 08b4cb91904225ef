import { mkdtempSync, rmSync } from "node:fs";
import { tmpdir } from "node:os";
import path from "node:path";
import { afterAll, describe, expect, it } from "vitest";
import { createClient } from "@libsql/client";
import { getDb, openClient } from "@/db";
import { withBusyRetry } from "@/db/busy-retry";
import { databaseBusy } from "@/lib/errors";

const dir = mkdtempSync(path.join(tmpdir(), "papin-retry-"));
afterAll(() => rmSync(dir, { recursive: true, force: true }));

/** An error shaped as libSQL throws it for a locked file (code SQLITE_BUSY). */
const busyError = () => Object.assign(new Error("SQLITE_BUSY: database is locked"), { code: "SQLITE_BUSY" });

/** An operation that fails `failures` times with `error`, then answers "written"; it counts its calls. */
function failingOperation(failures: number, error: () => Error) {
  const calls = { count: 0 };
  const operation = async () => {
    calls.count++;
    if (calls.count <= failures) throw error();
    return "written";
  };
  return { operation, calls };
}

const noSleep = { sleep: async () => {} };

describe("withBusyRetry: SQLITE_BUSY / SQLITE_LOCKED are retried a few times, then reported", () => {
  it("succeeds when the lock clears before the tries run out", async () => {
    const { operation, calls } = failingOperation(2, busyError);
    await expect(withBusyRetry(operation, noSleep)).resolves.toBe("written");
    expect(calls.count).toBe(3);
  });

  it("retries SQLITE_LOCKED the same way, found in the error's cause as drizzle wraps it", async () => {
    const wrapped = () => Object.assign(new Error("Failed query: insert into …"), { cause: Object.assign(new Error("database table is locked"), { code: "SQLITE_LOCKED" }) });
    const { operation, calls } = failingOperation(1, wrapped);
    await expect(withBusyRetry(operation, noSleep)).resolves.toBe("written");
    expect(calls.count).toBe(2);
  });

  it("gives up after the attempts allowed and throws the busy error, which route() answers with 503", async () => {
    const { operation, calls } = failingOperation(100, busyError);
    const failure = await withBusyRetry(operation, { ...noSleep, attempts: 4 }).catch((error: unknown) => error);
    expect(calls.count).toBe(4);
    expect(databaseBusy(failure)?.status).toBe(503);
  });

  it("never retries any other failure (a constraint is not contention)", async () => {
    const { operation, calls } = failingOperation(1, () => new Error("UNIQUE constraint failed: users.email"));
    await expect(withBusyRetry(operation, noSleep)).rejects.toThrow(/UNIQUE/);
    expect(calls.count).toBe(1);
  });

  it("waits a random share of a doubling back-off before each retry (full jitter)", async () => {
    const waits: number[] = [];
    const { operation } = failingOperation(3, busyError);
    await withBusyRetry(operation, { attempts: 4, baseDelayMs: 20, random: () => 0.5, sleep: async (ms) => void waits.push(ms) });
    // worked by hand: 0.5 × 20 × 2^0, 0.5 × 20 × 2^1, 0.5 × 20 × 2^2
    expect(waits).toEqual([10, 20, 40]);
    const spread: number[] = [];
    await withBusyRetry(failingOperation(1, busyError).operation, { baseDelayMs: 20, random: () => 0.999, sleep: async (ms) => void spread.push(ms) });
    expect(spread[0]).toBeLessThanOrEqual(20);
  });

  it("lets a real write through once another connection releases the file, and commits it (the busy connection is not reused)", async () => {
    const url = `file:${path.join(dir, "retry.db")}`;
    const holder = createClient({ url });
    await holder.execute("CREATE TABLE t (x INTEGER)");
    const writer = openClient(url, undefined, { busyTimeoutMs: 5 });
    const tx = await holder.transaction("write");
    await tx.execute("INSERT INTO t VALUES (1)");
    // The holder commits while the writer is between tries. Without openClient's guard the retry ran on the connection
    // whose failed statement libsql left in progress, and its row stayed uncommitted (libsql-client-ts#352).
    let tries = 0;
    const written = withBusyRetry(
      async () => {
        tries++;
        if (tries === 2) await tx.commit();
        return writer.execute("INSERT INTO t VALUES (2)");
      },
      { sleep: async () => {} },
    );
    await expect(written).resolves.toBeDefined();
    expect(tries).toBeGreaterThanOrEqual(2);
    expect((await holder.execute("SELECT count(*) AS n FROM t")).rows[0].n).toBe(2);
    holder.close();
    writer.close();
  });

  it("is wired into the portal's database: a transaction that met a lock runs again as a whole", async () => {
    process.env.DATABASE_URL = `file:${path.join(dir, "portal.db")}`;
    const db = getDb();
    let runs = 0;
    const result = await db.transaction(async (tx) => {
      runs++;
      await tx.run("CREATE TABLE IF NOT EXISTS u (x INTEGER)");
      if (runs === 1) throw busyError();
      return "committed";
    });
    expect(result).toBe("committed");
    expect(runs).toBe(2);
  });
});
