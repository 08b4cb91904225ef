import "server-only";
import { and, asc, eq, sql } from "drizzle-orm";
import { getDb } from "@/db";
import { users, sites, type NewUser, type Role, type User } from "@/db/schema";
import { appendAuditEvent, type AuditInput } from "@/db/ledger";

export type Actor = { id: string; email: string; siteId: string | null; role: Role; name: string };

/** Across every site: e-mail addresses are unique in the whole portal, and sign-in has no site yet. */
export async function getUserByEmail({ email }: { email: string }): Promise<User | undefined> {
  const [row] = await getDb()
    .select()
    .from(users)
    .where(eq(sql`lower(${users.email})`, email.trim().toLowerCase()))
    .limit(1);
  return row;
}

/** Across every site: the session names the user; guards re-read the account with it. */
export async function getUserById({ id }: { id: string }): Promise<User | undefined> {
  const [row] = await getDb().select().from(users).where(eq(users.id, id)).limit(1);
  return row;
}

export async function getUserOnSite({ siteId, id }: { siteId: string; id: string }): Promise<User | undefined> {
  const [row] = await getDb()
    .select()
    .from(users)
    .where(and(eq(users.id, id), eq(users.siteId, siteId)))
    .limit(1);
  return row;
}

export async function listUsersOfSite({ siteId }: { siteId: string }) {
  return getDb()
    .select({
      id: users.id,
      email: users.email,
      name: users.name,
      role: users.role,
      disabled: users.disabled,
      lastSignInAt: users.lastSignInAt,
      siteName: sites.name,
      createdAt: users.createdAt,
    })
    .from(users)
    .leftJoin(sites, eq(users.siteId, sites.id))
    .where(eq(users.siteId, siteId))
    .orderBy(asc(users.name));
}

type AuditWithoutEntity = Omit<AuditInput, "entityType" | "entityId">;

export async function insertUser({ values, audit }: { values: NewUser; audit: AuditWithoutEntity }) {
  return getDb().transaction(async (tx) => {
    const [created] = await tx.insert(users).values(values).returning({ id: users.id });
    await appendAuditEvent(tx, { ...audit, entityType: "user", entityId: created.id });
    return created;
  });
}

/** Changes one account of the site; the WHERE holds the site, so another site's account is never touched. */
export async function updateUserOnSite({ siteId, id, values, audit }: { siteId: string; id: string; values: Partial<NewUser>; audit: AuditWithoutEntity }) {
  return getDb().transaction(async (tx) => {
    const changed = await tx
      .update(users)
      .set(values)
      .where(and(eq(users.id, id), eq(users.siteId, siteId)))
      .returning({ id: users.id });
    if (changed.length === 0) return false;
    await appendAuditEvent(tx, { ...audit, entityType: "user", entityId: id });
    return true;
  });
}

export async function markSignedIn({ id }: { id: string }) {
  await getDb().update(users).set({ lastSignInAt: new Date().toISOString() }).where(eq(users.id, id));
}
