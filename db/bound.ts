import { sql, type SQL } from "drizzle-orm";

/**
 * A bound value the query planner does not look at: `+?` in hand-written SQL text (`bound()`), or a
 * drizzle value or placeholder behind a unary plus (`bound(value)`). The same value and the same
 * results (a unary plus changes neither a value nor its type), only planned once.
 *
 * Why: the SQLite that better-sqlite3 builds has STAT4. When a bare `?` is compared with the first
 * column of an index that ANALYZE sampled (sqlite_stat4), or stands in LIMIT/OFFSET, the planner reads
 * its bound value, and then marks the statement to be prepared again every time that placeholder is
 * bound: each run of a statement we keep prepared (perConnection and db/client.ts's cache, the
 * registry's statementFor) parsed and planned it afresh. With `+?` the planner sees an expression
 * whose value it does not read, and the statement keeps its first plan.
 *
 * Only where the plan cannot depend on the value: a lookup by a unique key (one row whatever the
 * value), the few rows of one person or one piece in their own index, a search whose plan is fixed by
 * its shape (lib/pieces/registry-sql.ts: it starts from the full-text index). Where the plan may rightly
 * follow the value (how many rows a studio has: read its index or scan, sort or not; how many rows a
 * LIMIT asks for) keep `?`, and check with EXPLAIN QUERY PLAN, values bound, that the plan is the same.
 * Measured with callgrind on the 100,000-piece bench seed (instructions inside sqlite3_step a call):
 * the session lookup every signed-in request makes 155 k -> 12 k, its memberships read 337 k -> 5 k.
 */
export function bound(): string;
export function bound(value: unknown): SQL;
export function bound(...value: [] | [unknown]): string | SQL {
  return value.length ? sql`+${value[0]}` : "+?";
}
