"use client";

import Link from "next/link";
import { usePathname } from "next/navigation";
import { useEffect, useId, useRef, useState, type ReactNode } from "react";
import { NavLinks } from "./nav-links";

/**
 * The navigation below the tablet breakpoint: a menu button that opens the links and the account
 * below the header. Escape closes it and gives the focus back to the button; following a link closes it.
 */
export function MobileNav({ items, account }: { items: Array<{ href: string; label: string }>; account: ReactNode }) {
  const [open, setOpen] = useState(false);
  const [openedAt, setOpenedAt] = useState<string | null>(null);
  const button = useRef<HTMLButtonElement>(null);
  const panelId = useId();
  const pathname = usePathname();
  // A link followed from the open menu changes the path: the menu closes with it.
  const shown = open && openedAt === pathname;

  useEffect(() => {
    if (!shown) return;
    const onKey = (e: KeyboardEvent) => {
      if (e.key !== "Escape") return;
      setOpen(false);
      button.current?.focus();
    };
    document.addEventListener("keydown", onKey);
    return () => document.removeEventListener("keydown", onKey);
  }, [shown]);

  return (
    <>
      <button
        ref={button}
        type="button"
        aria-expanded={shown}
        aria-controls={panelId}
        onClick={() => {
          setOpen(!shown);
          setOpenedAt(pathname);
        }}
        className="btn-secondary min-h-10 px-3"
      >
        <svg aria-hidden="true" viewBox="0 0 20 20" className="h-4 w-4" fill="none" stroke="currentColor" strokeWidth="1.8" strokeLinecap="round">
          {shown ? <path d="M5 5l10 10M15 5L5 15" /> : <path d="M3 6h14M3 10h14M3 14h14" />}
        </svg>
        Menu
      </button>
      <div id={panelId} hidden={!shown} className="absolute inset-x-0 top-full z-40 max-h-[calc(100vh-4rem)] overflow-y-auto border-b border-ink-line bg-paper-raised px-gutter py-3 shadow-panel">
        <NavLinks items={items} large />
        <div className="mt-3 border-t border-ink-line px-3 pt-3 text-sm">{account}</div>
      </div>
    </>
  );
}

/** Who is signed in, with the account links: the sidebar's foot and the mobile menu's. */
export function AccountLinks({ name, role, testIds = false, children }: { name: string; role: string; testIds?: boolean; children: ReactNode }) {
  return (
    <>
      <p className="font-medium break-words" data-testid={testIds ? "signed-in-name" : undefined}>
        {name}
      </p>
      <p className="text-xs text-ink-muted" data-testid={testIds ? "signed-in-role" : undefined}>
        {role}
      </p>
      <p className="mt-2 flex flex-wrap items-center gap-x-4 gap-y-2">
        <Link href="/account/password" className="py-1 text-xs font-medium text-steam-700 underline underline-offset-2">
          Change password
        </Link>
        {children}
      </p>
    </>
  );
}
