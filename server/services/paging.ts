/** Helpers shared by the server-side paged lists. */

/** An ILIKE pattern that finds `q` anywhere, with the pattern characters in it escaped. */
export function containsPattern(q: string): string {
  return `%${q.replace(/[\\%_]/g, (c) => `\\${c}`)}%`;
}

/** ORDER BY direction with nulls kept at the end of either direction. */
export function direction(dir: 'asc' | 'desc'): string {
  return dir === 'asc' ? 'ASC NULLS LAST' : 'DESC NULLS LAST';
}

export function offset(page: number, pageSize: number): number {
  return (page - 1) * pageSize;
}
