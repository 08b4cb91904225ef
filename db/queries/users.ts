import "server-only";
import { asc, eq, sql } from "drizzle-orm";
import { getDb } from "@/db";
import { users, sites, type Role, type User } from "@/db/schema";
import { appendAuditEvent } from "./audit";
import { hashPassword } from "@/lib/auth/password";
import { AppError } from "@/lib/errors";
import type { Actor } from "@/lib/domain";

export type { Actor };

export async function getUserByEmail({ email }: { email: string }): Promise<User | undefined> {
  const [row] = await getDb()
    .select()
    .from(users)
    .where(eq(sql`lower(${users.email})`, email.trim().toLowerCase()))
    .limit(1);
  return row;
}

export async function getUserById({ id }: { id: string }): Promise<User | undefined> {
  const [row] = await getDb().select().from(users).where(eq(users.id, id)).limit(1);
  return row;
}

export async function listUsers() {
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
    .orderBy(asc(users.name));
}

export async function createUser({
  actor,
  email,
  name,
  role,
  password,
  siteId,
}: {
  actor: Actor;
  email: string;
  name: string;
  role: Role;
  password: string;
  siteId: string | null;
}) {
  if (await getUserByEmail({ email })) throw new AppError(409, `A user with the e-mail ${email} already exists.`, "email");
  const passwordHash = await hashPassword(password);
  return getDb().transaction(async (tx) => {
    const [created] = await tx
      .insert(users)
      .values({ email: email.trim().toLowerCase(), name, role, passwordHash, siteId })
      .returning({ id: users.id });
    await appendAuditEvent(tx, {
      actorId: actor.id,
      actorEmail: actor.email,
      siteId,
      action: "user.create",
      entityType: "user",
      entityId: created.id,
      newValue: { email, name, role, siteId },
    });
    return created;
  });
}

export async function updateUser({
  actor,
  id,
  changes,
  reason,
}: {
  actor: Actor;
  id: string;
  changes: { role?: Role; disabled?: boolean; name?: string; password?: string };
  reason?: string;
}) {
  const before = await getUserById({ id });
  if (!before) throw new AppError(404, "That user was not found.");
  if (before.id === actor.id && (changes.disabled === true || (changes.role && changes.role !== "admin"))) {
    throw new AppError(409, "You cannot disable yourself or remove your own administrator role.");
  }
  const values: Partial<User> = { updatedAt: new Date().toISOString() };
  if (changes.role) values.role = changes.role;
  if (changes.disabled !== undefined) values.disabled = changes.disabled;
  if (changes.name) values.name = changes.name;
  if (changes.password) {
    values.passwordHash = await hashPassword(changes.password);
    values.failedSigningAttempts = 0;
    values.signingLockedUntil = null;
  }
  await getDb().transaction(async (tx) => {
    await tx.update(users).set(values).where(eq(users.id, id));
    const oldValue: Record<string, unknown> = {};
    const newValue: Record<string, unknown> = {};
    for (const key of ["role", "disabled", "name"] as const) {
      if (changes[key] !== undefined && changes[key] !== before[key]) {
        oldValue[key] = before[key];
        newValue[key] = changes[key];
      }
    }
    if (changes.password) newValue.password = "reset";
    await appendAuditEvent(tx, {
      actorId: actor.id,
      actorEmail: actor.email,
      siteId: before.siteId,
      action: changes.password ? "user.password-reset" : "user.update",
      entityType: "user",
      entityId: id,
      oldValue,
      newValue,
      reason: reason ?? null,
    });
  });
}

export async function markSignedIn({ id }: { id: string }) {
  await getDb().update(users).set({ lastSignInAt: new Date().toISOString() }).where(eq(users.id, id));
}
