import { mkdtempSync, rmSync } from "node:fs";
import { tmpdir } from "node:os";
import path from "node:path";
import { afterAll, describe, expect, it } from "vitest";
import { createClient } from "@libsql/client";
import { route } from "@/lib/http";
import { databaseBusy } from "@/lib/errors";

const dir = mkdtempSync(path.join(tmpdir(), "papin-busy-"));
afterAll(() => rmSync(dir, { recursive: true, force: true }));

describe("a locked database answers 503 with a plain sentence, never 500", () => {
  it("maps libSQL's real SQLITE_BUSY from a second writer on the same file", async () => {
    const url = `file:${path.join(dir, "busy.db")}`;
    const holder = createClient({ url });
    const other = createClient({ url });
    await holder.execute("CREATE TABLE t (x INTEGER)");
    const tx = await holder.transaction("write");
    await tx.execute("INSERT INTO t VALUES (1)");
    let caught: unknown;
    try {
      await other.execute("INSERT INTO t VALUES (2)");
    } catch (error) {
      caught = error;
    }
    await tx.rollback();
    holder.close();
    other.close();
    expect(caught).toBeDefined();
    const mapped = databaseBusy(caught);
    expect(mapped?.status).toBe(503);

    const handler = route(async () => {
      throw caught;
    });
    const response = await handler(new Request("http://papin.test/api/cycles"), undefined);
    expect(response.status).toBe(503);
    expect((await response.json()).error).toMatch(/busy.*try again/i);
  });

  it("leaves other failures alone", () => {
    expect(databaseBusy(new Error("UNIQUE constraint failed: users.email"))).toBeNull();
    expect(databaseBusy(undefined)).toBeNull();
  });
});
