"use client";

import { signOut } from "next-auth/react";

export function SignOutButton() {
  return (
    <button type="button" onClick={() => signOut({ callbackUrl: "/sign-in" })} className="text-xs font-medium text-steam-700 underline underline-offset-2">
      Sign out
    </button>
  );
}
