import { afterAll, beforeAll, describe, expect, it, vi } from "vitest";
import { useTemporaryDatabase } from "../support/test-db";

const session = vi.hoisted(() => ({ current: null as null | { user: { id: string } } }));
vi.mock("next-auth", async (original) => ({
  ...(await original<typeof import("next-auth")>()),
  getServerSession: async () => session.current,
}));

let ctx: Awaited<ReturnType<typeof useTemporaryDatabase>>;
const ids: Record<string, string> = {};

beforeAll(async () => {
  ctx = await useTemporaryDatabase();
  const { users, sites } = await import("@/db/schema");
  const { hashPassword } = await import("@/lib/auth/password");
  const [site] = await ctx.db.insert(sites).values({ name: "Test site", code: "T" }).returning();
  const passwordHash = await hashPassword("a test password");
  for (const role of ["technician", "engineer", "auditor", "admin"] as const) {
    const [u] = await ctx.db
      .insert(users)
      .values({ email: `${role}@test.example`, name: role, role, passwordHash, siteId: site.id })
      .returning();
    ids[role] = u.id;
  }
  const [d] = await ctx.db.insert(users).values({ email: "gone@test.example", name: "Gone", role: "engineer", passwordHash, siteId: site.id, disabled: true }).returning();
  ids.disabled = d.id;
});
afterAll(() => ctx.cleanup());

async function asUser(key: string | null) {
  session.current = key ? { user: { id: ids[key] } } : null;
  return import("@/lib/auth/guards");
}

describe("requireUser / requireRole on the server", () => {
  it("refuses an anonymous request with 401", async () => {
    const { requireUser } = await asUser(null);
    await expect(requireUser()).rejects.toMatchObject({ status: 401 });
  });

  it("technician: may create cycles, may not manage users (403)", async () => {
    const { requireRole } = await asUser("technician");
    await expect(requireRole("cycle:create")).resolves.toMatchObject({ role: "technician" });
    await expect(requireRole("users:manage")).rejects.toMatchObject({ status: 403 });
  });

  it("engineer: may sign, may not manage users", async () => {
    const { requireRole } = await asUser("engineer");
    await expect(requireRole("cycle:sign")).resolves.toMatchObject({ role: "engineer" });
    await expect(requireRole("users:manage")).rejects.toMatchObject({ status: 403 });
  });

  it("auditor: may read the ledger, may not submit", async () => {
    const { requireRole } = await asUser("auditor");
    await expect(requireRole("audit:read")).resolves.toMatchObject({ role: "auditor" });
    await expect(requireRole("cycle:submit")).rejects.toMatchObject({ status: 403 });
  });

  it("admin: may manage users, may not sign", async () => {
    const { requireRole } = await asUser("admin");
    await expect(requireRole("users:manage")).resolves.toMatchObject({ role: "admin" });
    await expect(requireRole("cycle:sign")).rejects.toMatchObject({ status: 403 });
  });

  it("treats a disabled account's still-valid session as signed out", async () => {
    const { requireUser } = await asUser("disabled");
    await expect(requireUser()).rejects.toMatchObject({ status: 401 });
  });

  it("uses the role in the database, not the one in the cookie", async () => {
    const { users } = await import("@/db/schema");
    const { eq } = await import("drizzle-orm");
    await ctx.db.update(users).set({ role: "auditor" }).where(eq(users.id, ids.technician));
    const { requireRole } = await asUser("technician");
    await expect(requireRole("cycle:create")).rejects.toMatchObject({ status: 403 });
  });
});
