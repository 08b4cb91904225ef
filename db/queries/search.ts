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

/** The trigram index finds a text of at least this many characters; a shorter one has no trigram to look up. */
export const INDEXED_SEARCH_MIN_CHARS = 3;

/** Whether `text` can be looked up in a trigram index (counted in characters, not UTF-16 units). */
export const isIndexedSearch = (text: string) => [...text].length >= INDEXED_SEARCH_MIN_CHARS;

/**
 * The ids of the cycles whose number, load description or sterilizer name contains `text` as typed, from the
 * FTS5 trigram index (migration 0018): the whole text is one quoted phrase, so `%`, `_`, `*`, `"`, `-` and
 * the words OR/NOT are characters, never query syntax; case and accents are ignored. Needs
 * INDEXED_SEARCH_MIN_CHARS characters (shorter text matches nothing here). Every site's cycles: the caller scopes.
 */
export function cycleIdsContaining(text: string): SQL {
  const phrase = `"${text.replace(/"/g, '""')}"`;
  return sql`(SELECT k.cycle_id FROM cycle_search_rows k WHERE k.row IN (SELECT rowid FROM cycles_search WHERE cycles_search MATCH ${phrase}))`;
}
