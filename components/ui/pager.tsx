import Link from "next/link";

/** Newer / older links around "Page N of M" for a list that shows the newest first; nothing when one page holds it all. */
export function Pager({ page, pages, href }: { page: number; pages: number; href: (page: number) => string }) {
  if (pages <= 1) return null;
  return (
    <nav aria-label="Pages" className="mt-3 flex flex-wrap items-center gap-3 text-sm">
      {page > 1 && (
        <Link className="btn-secondary px-2 py-1" href={href(page - 1)}>
          ← Newer
        </Link>
      )}
      <span className="text-ink-muted">
        Page {page} of {pages}
      </span>
      {page < pages && (
        <Link className="btn-secondary px-2 py-1" href={href(page + 1)}>
          Older →
        </Link>
      )}
    </nav>
  );
}
