"use client";

import Link from "next/link";
import { usePathname } from "next/navigation";

/** The main links; `large` gives them finger-sized rows for the phone menu. */
export function NavLinks({ items, large = false }: { items: Array<{ href: string; label: string }>; large?: boolean }) {
  const pathname = usePathname();
  return (
    <nav aria-label="Main" className="flex flex-col gap-0.5">
      {items.map((item) => {
        const active = item.href === "/" ? pathname === "/" : pathname === item.href || pathname.startsWith(`${item.href}/`);
        const exact = item.href === "/cycles" && pathname.startsWith("/cycles/new");
        const on = active && !exact;
        return (
          <Link
            key={item.href}
            href={item.href}
            aria-current={on ? "page" : undefined}
            className={`rounded-md px-3 ${large ? "py-2.5" : "py-1.5"} text-sm ${on ? "bg-steam-50 font-medium text-steam-700" : "text-ink-soft hover:bg-paper-sunk"}`}
          >
            {item.label}
          </Link>
        );
      })}
    </nav>
  );
}
