"use client";

import { getSession } from "next-auth/react";
import { usePathname } from "next/navigation";
import { useEffect, useRef } from "react";

const REFRESH_MS = 60_000;

/**
 * Tells the server the person is active: on navigation, a click or a key, at most once a minute, next-auth's
 * session endpoint is asked, which moves the session's last-activity time forward (the idle timeout counts from
 * it). Server-rendered pages cannot write the cookie themselves. Renders nothing.
 */
export function SessionActivity() {
  const pathname = usePathname();
  const last = useRef(0);
  useEffect(() => {
    const touch = () => {
      const now = Date.now();
      if (now - last.current < REFRESH_MS) return;
      last.current = now;
      void getSession();
    };
    touch();
    window.addEventListener("pointerdown", touch);
    window.addEventListener("keydown", touch);
    return () => {
      window.removeEventListener("pointerdown", touch);
      window.removeEventListener("keydown", touch);
    };
  }, [pathname]);
  return null;
}
