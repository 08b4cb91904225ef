import "server-only";
import { sql, type SQL } from "drizzle-orm";

// A confirmed cycle outcome: approved with a verdict, or failure-confirmed (a fail). The texts repeat migration 0019's
// partial index cycles_outcome_idx word for word, on the alias `c`: SQLite uses an expression or partial index only for
// the same expression, with constants rather than bound values.
export const CYCLE_CONFIRMED = sql.raw(`(c.status = 'failure-confirmed' or (c.status = 'approved' and c.verdict in ('pass', 'fail')))`);
export const CYCLE_RESULT = sql.raw(`(case when c.status = 'failure-confirmed' then 'fail' else c.verdict end)`);
export const CYCLE_AT = sql.raw(`coalesce(c.started_at, c.created_at)`);

/** The start (or creation) of the sterilizer's latest confirmed cycle of this kind and result on the site, one index lookup (null if none). */
export function latestConfirmedCycleAt({ sterilizerId, kind, result, siteId, also }: { sterilizerId: SQL; kind: SQL; result: "pass" | "fail"; siteId: string; also?: SQL }): SQL<string | null> {
  return sql<string | null>`(select ${CYCLE_AT} from cycles c
     where c.sterilizer_id = ${sterilizerId} and c.test_kind = ${kind} and ${CYCLE_CONFIRMED} and ${CYCLE_RESULT} = ${sql.raw(`'${result}'`)} and c.site_id = ${siteId} ${also ? sql`and ${also}` : sql``}
     order by ${CYCLE_AT} desc limit 1)`;
}
