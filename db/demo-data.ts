import { count, ne, notInArray, notLike } from "drizzle-orm";
import type { Database } from "./index";
import { cycles, sites, users } from "./schema";
import { DEMO_USERS } from "./demo-users";

/** How every cycle the demo (and `db:seed-load`) makes says so: its load description carries "(demo". */
export const DEMO_LOAD_MARK = "(demo";

/** Why the database holds more than the demo site (null when it holds only demo data); `db:seed-load` refuses such a database without --force. */
export async function nonDemoData(db: Database, siteId: string): Promise<string | null> {
  const [{ otherSites }] = await db.select({ otherSites: count() }).from(sites).where(ne(sites.id, siteId));
  if (otherSites > 0) return `it holds ${otherSites} site(s) besides the demo site`;
  const emails = DEMO_USERS.map((u) => u.email);
  const [{ otherUsers }] = await db.select({ otherUsers: count() }).from(users).where(notInArray(users.email, emails));
  if (otherUsers > 0) return `it holds ${otherUsers} user(s) who are not demo users`;
  const [{ otherCycles }] = await db
    .select({ otherCycles: count() })
    .from(cycles)
    .where(notLike(cycles.loadDescription, `%${DEMO_LOAD_MARK}%`));
  if (otherCycles > 0) return `it holds ${otherCycles} cycle(s) that the demo did not make`;
  return null;
}
