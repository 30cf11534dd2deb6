/** Helpers shared by the server-side paged lists. */
import { literal } from 'sequelize';

/** An ILIKE pattern that finds `q` anywhere, with the pattern characters in it escaped. */
export function containsPattern(q: string): string {
  return `%${q.replace(/[\\%_]/g, (c) => `\\${c}`)}%`;
}

/**
 * ORDER BY direction. Plain ASC/DESC, so that PostgreSQL can walk the sort column's index (the sorted list columns
 * are NOT NULL; a NULLS clause that differs from the index's order would force a sort of every row).
 */
export function direction(dir: 'asc' | 'desc'): 'ASC' | 'DESC' {
  return dir === 'asc' ? 'ASC' : 'DESC';
}

export function offset(page: number, pageSize: number): number {
  return (page - 1) * pageSize;
}

/**
 * `column = ANY (ARRAY(sub-select))`: PostgreSQL runs the sub-select once and reads `column`'s index with its
 * result, so a search across joined tables can combine each table's own (trigram) index. `column` and `subSelect`
 * are SQL written by the caller; any user text in them must already be escaped.
 */
export function anyOf(column: string, subSelect: string): ReturnType<typeof literal> {
  return literal(`${column} = ANY (ARRAY(${subSelect}))`);
}

/** How far a list counts its matches: ten pages past the one shown (at least 250 rows), never the whole table. */
export function countLimit(page: number, pageSize: number): number {
  return Math.max(250, (page + 9) * pageSize);
}

/**
 * The total a paged list reports. A short page needs no count at all (its end is the end); otherwise `countUpTo`
 * counts at most `countLimit + 1` matches, and if the limit is passed the total is that limit with `totalCapped`,
 * shown as "more than N".
 */
export async function pageTotal(
  shown: number,
  q: { page: number; pageSize: number },
  countUpTo: (limit: number) => Promise<number>,
): Promise<{ total: number; totalCapped?: true }> {
  const skipped = offset(q.page, q.pageSize);
  if (shown > 0 && shown < q.pageSize) return { total: skipped + shown };
  if (shown === 0 && q.page === 1) return { total: 0 };
  const limit = countLimit(q.page, q.pageSize);
  const counted = await countUpTo(limit + 1);
  return counted > limit ? { total: limit, totalCapped: true } : { total: counted };
}
