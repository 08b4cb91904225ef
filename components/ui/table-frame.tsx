import type { ReactNode } from "react";

/**
 * The one frame for a wide table: on a narrow screen the table scrolls sideways inside it, never the
 * page, and its first (key) column stays pinned (`.table-frame` in app/globals.css). The frame can
 * take the focus so a keyboard can scroll it; its label names it for a screen reader.
 */
export function TableFrame({ label, className = "", children }: { label: string; className?: string; children: ReactNode }) {
  return (
    <div role="region" aria-label={label} tabIndex={0} className={`table-frame ${className}`}>
      {children}
    </div>
  );
}
