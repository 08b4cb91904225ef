import "server-only";
import { DEMO_USERS } from "@/db/demo-users";
import { demoEnabled, env } from "@/lib/env";

/** The demo accounts and their shared password, for the sign-in page while the demo is on; null otherwise. */
export function demoSignIn() {
  return demoEnabled() ? { password: env().PAPIN_DEMO_PASSWORD, accounts: DEMO_USERS } : null;
}
