import type { Role } from "@/db/schema";
import "next-auth";
import "next-auth/jwt";

declare module "next-auth" {
  interface Session {
    user: { id: string; email: string; name: string; role: Role; siteId: string | null };
  }
  interface User {
    id: string;
    email: string;
    name: string;
    role: Role;
    siteId: string | null;
  }
}

declare module "next-auth/jwt" {
  interface JWT {
    uid?: string;
    role?: Role;
    siteId?: string | null;
  }
}
