import { or, sql, type SQL, type SQLWrapper } from "drizzle-orm";

/**
 * `column LIKE '%typed%'` over any of `columns`, with what was typed taken literally: % and _ are
 * escaped and the ESCAPE clause names the escape character (SQLite's LIKE has none by default). Case
 * folds for ASCII letters only, as SQLite's LIKE does.
 */
export function containsText(typed: string, ...columns: SQLWrapper[]): SQL {
  const pattern = `%${typed.replace(/[\\%_]/g, (c) => `\\${c}`)}%`;
  return or(...columns.map((c) => sql`${c} LIKE ${pattern} ESCAPE '\\'`))!;
}
