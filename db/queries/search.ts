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

/** The search text as one quoted FTS5 phrase: `%`, `_`, `*`, `"`, `-` and OR/NOT are characters, never query syntax. */
const phraseOf = (text: string) => `"${text.replace(/"/g, '""')}"`;

/** The FTS rows (cycle_search_rows.row) whose number, load description or sterilizer name contains `text`. */
const searchRowsMatching = (text: string) => sql`(SELECT rowid FROM cycles_search WHERE cycles_search MATCH ${phraseOf(text)})`;

/**
 * The ids of the cycles whose number, load description or sterilizer name contains `text` as typed, from the
 * FTS5 trigram index (migration 0018), case and accents ignored. Needs INDEXED_SEARCH_MIN_CHARS characters
 * (shorter text matches nothing here). Every site's cycles: the caller scopes.
 */
export function cycleIdsContaining(text: string): SQL {
  return sql`(SELECT k.cycle_id FROM cycle_search_rows k WHERE k.row IN ${searchRowsMatching(text)})`;
}

/**
 * The same test as `cycleId IN cycleIdsContaining(text)`, written so that SQLite cannot start from the matches: it
 * walks the page's own index and checks each row (one trigram lookup each). For a text that matches most cycles,
 * where fetching and sorting every match costs seconds at 100,000 cycles.
 */
export function cycleRowMatches(cycleId: SQLWrapper, text: string): SQL {
  return sql`EXISTS (SELECT 1 FROM cycles_search WHERE cycles_search MATCH ${phraseOf(text)} AND rowid = (SELECT k.row FROM cycle_search_rows k WHERE k.cycle_id = ${cycleId}))`;
}

const PRINTABLE_ASCII = /^[\x20-\x7e]*$/;

/**
 * `cycleRowMatches` made cheap per row for a printable-ASCII text: the row's own columns (what the index holds) are
 * compared with LIKE first. For such a text and a row of printable ASCII, LIKE's ASCII case folding and the trigram
 * index's folding agree, so LIKE decides; only a row with other characters (an accent, "°") that LIKE does not match
 * is looked up in the index, where an accent or a non-ASCII case may still match. Both forms select the same rows.
 */
export function cycleRowMatchesText(cycleId: SQLWrapper, columns: SQLWrapper[], text: string): SQL {
  if (!PRINTABLE_ASCII.test(text)) return cycleRowMatches(cycleId, text);
  const anyLike = sql.join(
    columns.map((c) => containsText(c, text)),
    sql` OR `,
  );
  const joined = sql.join(
    columns.map((c) => sql`coalesce(${c}, '')`),
    sql` || `,
  );
  return sql`(${anyLike} OR (${joined} GLOB '*[^ -~]*' AND ${cycleRowMatches(cycleId, text)}))`;
}

/** How many FTS rows contain `text`, counted no further than `cap` (the trigram lookup stops there). */
export function searchMatchesUpTo(text: string, cap: number): SQL<number> {
  return sql<number>`(SELECT count(*) FROM (SELECT rowid FROM cycles_search WHERE cycles_search MATCH ${phraseOf(text)} LIMIT ${cap}))`;
}
