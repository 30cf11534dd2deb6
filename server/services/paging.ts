/** Helpers shared by the server-side paged lists. */

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
