import type { Role } from "@/db/schema";
import "next-auth";
import "next-auth/jwt";

declare module "next-auth" {
  interface Session {
    user: { id: string; email: string; name: string; role: Role; siteId: string | null; sessionVersion?: number };
  }
  interface User {
    id: string;
    email: string;
    name: string;
    role: Role;
    siteId: string | null;
    sessionVersion: number;
  }
}

declare module "next-auth/jwt" {
  interface JWT {
    uid?: string;
    role?: Role;
    siteId?: string | null;
    /** the user's session version when the session began; a bumped version ends the session */
    sv?: number;
    /** sign-in time and last activity, epoch milliseconds (absolute lifetime and idle timeout) */
    authAt?: number;
    seenAt?: number;
  }
}
