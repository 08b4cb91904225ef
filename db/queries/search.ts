import "server-only";
import { sql, type SQL, type SQLWrapper } from "drizzle-orm";

/**
 * `column` contains `text` as typed: `%`, `_` and `\` in the search text are literal characters,
 * not LIKE wildcards (a search for "%" must not match every row). Case-insensitive for ASCII, as
 * SQLite's LIKE is.
 */
export function containsText(column: SQLWrapper, text: string): SQL {
  const escaped = text.replace(/[\\%_]/g, (c) => `\\${c}`);
  return sql`${column} LIKE ${`%${escaped}%`} ESCAPE '\\'`;
}
