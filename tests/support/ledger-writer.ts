/**
 * Writes to the database DATABASE_URL names the way the portal does, from a process of its own (the backup test
 * needs the file free of the test's own connection): `site <name>` migrates, then creates or renames the one site,
 * audited; `hold` keeps the database open until killed, as a running portal would.
 */
import { eq } from "drizzle-orm";
import { getDb } from "@/db";
import { appendAuditEvent } from "@/db/ledger";
import { migrateDatabase } from "@/db/migrate";
import { sites } from "@/db/schema";

const [command, name] = process.argv.slice(2);
const db = getDb();
if (command === "site") {
  await migrateDatabase(db);
  await db.transaction(async (tx) => {
    const [site] = await tx.select().from(sites).limit(1);
    if (site) await tx.update(sites).set({ name }).where(eq(sites.id, site.id));
    else await tx.insert(sites).values({ id: "site-1", name, code: "S1" });
    await appendAuditEvent(tx, {
      siteId: "site-1",
      action: site ? "site.update" : "site.create",
      entityType: "site",
      entityId: "site-1",
      oldValue: site ? { name: site.name } : null,
      newValue: { name },
    });
  });
} else if (command === "hold") {
  await db.select().from(sites).limit(1);
  console.log("holding");
  setInterval(() => undefined, 60_000);
} else {
  throw new Error(`Unknown command ${command}`);
}
