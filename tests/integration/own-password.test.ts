import { afterAll, beforeAll, describe, expect, it, vi } from "vitest";
import { useTemporaryDatabase } from "../support/test-db";

const session = vi.hoisted(() => ({ current: null as null | { user: { id: string; sessionVersion?: number } } }));
vi.mock("next-auth", async (original) => ({ ...(await original<typeof import("next-auth")>()), getServerSession: async () => session.current }));

let ctx: Awaited<ReturnType<typeof useTemporaryDatabase>>;
type Person = { id: string; email: string; name: string; role: "engineer" | "admin"; siteId: string };
let admin: Person;

beforeAll(async () => {
  ctx = await useTemporaryDatabase();
  const { users, sites } = await import("@/db/schema");
  const { hashPassword } = await import("@/lib/auth/password");
  const [site] = await ctx.db.insert(sites).values({ name: "Test site", code: "T" }).returning();
  const [u] = await ctx.db
    .insert(users)
    .values({ email: "admin@test.example", name: "Admin", role: "admin", passwordHash: await hashPassword("admin password for tests"), siteId: site.id })
    .returning();
  admin = { id: u.id, email: u.email, name: u.name, role: "admin", siteId: site.id };
});
afterAll(() => ctx.cleanup());

async function userRow(id: string) {
  const { users } = await import("@/db/schema");
  const { eq } = await import("drizzle-orm");
  const [row] = await ctx.db.select().from(users).where(eq(users.id, id));
  return row;
}
const as = async (id: string) => (session.current = { user: { id, sessionVersion: (await userRow(id)).sessionVersion } });

describe("one-time passwords and the forced change", () => {
  it("a new account gets a one-time password; until it chooses its own, pages redirect and everything else answers 403", async () => {
    const { createUser } = await import("@/lib/services/users");
    const created = await createUser({ actor: admin, input: { email: "ngozi.adeyemi@test.example", name: "Ngozi Adeyemi", role: "engineer" } });
    expect((await userRow(created.id)).mustChangePassword).toBe(true);
    const { signInWithPassword } = await import("@/lib/services/sign-in");
    expect(await signInWithPassword({ email: "ngozi.adeyemi@test.example", password: created.oneTimePassword })).toMatchObject({ ok: true });

    await as(created.id);
    const { requireRole, requireUser } = await import("@/lib/auth/guards");
    await expect(requireRole("cycle:read")).rejects.toMatchObject({ status: 403, message: expect.stringMatching(/^Choose your own password first/) });
    await expect(requireUser()).rejects.toMatchObject({ status: 403 });
    await expect(requireRole("account:own-password")).resolves.toMatchObject({ id: created.id });
    const { requirePageActor } = await import("@/lib/auth/page-guard");
    await expect(requirePageActor("cycle:read")).rejects.toMatchObject({ digest: expect.stringContaining("/account/password") });

    const { changeOwnPassword } = await import("@/lib/services/account");
    const actor = { id: created.id, email: "ngozi.adeyemi@test.example", name: "Ngozi Adeyemi", role: "engineer" as const, siteId: admin.siteId };
    await expect(changeOwnPassword({ actor, currentPassword: "not it", newPassword: "a lilac river at dawn" })).rejects.toMatchObject({ status: 422, field: "currentPassword" });
    await expect(changeOwnPassword({ actor, currentPassword: created.oneTimePassword, newPassword: created.oneTimePassword })).rejects.toMatchObject({
      status: 422,
      message: "The password must differ from your last 5 passwords.",
    });
    await changeOwnPassword({ actor, currentPassword: created.oneTimePassword, newPassword: "a lilac river at dawn" });
    const after = await userRow(created.id);
    expect(after.mustChangePassword).toBe(false);
    // The session that changed the password has ended too; a new one may work.
    await expect(requireRole("cycle:read")).rejects.toMatchObject({ status: 401 });
    await as(created.id);
    await expect(requireRole("cycle:read")).resolves.toMatchObject({ id: created.id });
    const { auditEvents } = await import("@/db/schema");
    const log = (await ctx.db.select().from(auditEvents)).filter((e) => e.entityId === created.id).map((e) => e.action);
    expect(log).toEqual(["user.create", "auth.sign-in", "user.password-change"]);
  });

  it("each rule is refused with its sentence; the last 5 own passwords cannot come back, the sixth can", async () => {
    const { createUser } = await import("@/lib/services/users");
    const { changeOwnPassword } = await import("@/lib/services/account");
    const created = await createUser({ actor: admin, input: { email: "tomas.reid@test.example", name: "Tomás Reid", role: "engineer" } });
    const actor = { id: created.id, email: "tomas.reid@test.example", name: "Tomás Reid", role: "engineer" as const, siteId: admin.siteId };
    let current = created.oneTimePassword;
    const refused = (newPassword: string) =>
      changeOwnPassword({ actor, currentPassword: current, newPassword }).then(
        () => "accepted",
        (e: Error) => e.message,
      );
    expect(await refused("short one")).toBe("The password must have at least 12 characters.");
    expect(await refused("letmein123456")).toBe("That password is on a list of commonly used passwords; choose another."); // "letmein" + digits (zxcvbn-ts list)
    expect(await refused("TomAs.Reid is me")).toBe("The password must not contain the name part of your e-mail address.");
    const mine = ["copper kettle one", "copper kettle two", "copper kettle three", "copper kettle four", "copper kettle five", "copper kettle six"];
    for (const p of mine) {
      expect(await refused(p)).toBe("accepted");
      current = p;
    }
    // The last five are kettles two to six; kettle one was six changes ago.
    for (const p of mine.slice(1)) expect(await refused(p)).toBe("The password must differ from your last 5 passwords.");
    expect(await refused("copper kettle one")).toBe("accepted");
  });

  it("an administrator's reset gives a new one-time password that must be replaced again", async () => {
    const { createUser, resetPassword } = await import("@/lib/services/users");
    const created = await createUser({ actor: admin, input: { email: "helen.varga@test.example", name: "Helen Varga", role: "engineer" } });
    const { changeOwnPassword } = await import("@/lib/services/account");
    const actor = { id: created.id, email: "helen.varga@test.example", name: "Helen Varga", role: "engineer" as const, siteId: admin.siteId };
    await changeOwnPassword({ actor, currentPassword: created.oneTimePassword, newPassword: "brass gauge at noon" });
    const { oneTimePassword } = await resetPassword({ actor: admin, id: created.id, reason: "forgotten" });
    const row = await userRow(created.id);
    expect(row.mustChangePassword).toBe(true);
    const { verifyPassword } = await import("@/lib/auth/password");
    expect(await verifyPassword(row.passwordHash, oneTimePassword)).toBe(true);
    expect(await verifyPassword(row.passwordHash, "brass gauge at noon")).toBe(false);
  });
});
