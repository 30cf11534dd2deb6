/**
 * A piece's year as people give it: exact ("1890"), approximate ("c. 1830", "circa 1830", "about 1900") or a decade
 * ("1890s"). The text is kept as written; a whole-number year is the sortable best guess (a decade counts as its
 * middle year, 1890s → 1895).
 */
export const YEAR_MIN = 1600;
export const YEAR_MAX = 2100;

export const YEAR_HINT = 'must be a year such as 1890, c. 1830, about 1900 or 1890s';

const APPROX = /^(?:circa|approximately|approx\.?|about|around|ca\.?|c\.?)\s*/i;

export interface PieceYear {
  /** The sortable best guess. */
  year: number;
  /** The year as written, with its spacing tidied. */
  text: string;
}

/** Reads a year as written, or null when it is not a year in one of the forms above (or outside 1600–2100). */
export function parsePieceYear(written: string): PieceYear | null {
  const text = written.trim().replace(/\s+/g, ' ');
  if (text.length === 0 || text.length > 40) return null;
  const rest = text.replace(APPROX, '');
  let year: number;
  const decade = /^(\d{3})0['’]?s$/.exec(rest);
  if (decade) {
    year = Number(decade[1]) * 10 + 5;
    if (year - 5 < YEAR_MIN || year - 5 > YEAR_MAX) return null;
  } else if (/^\d{4}$/.test(rest)) {
    year = Number(rest);
    if (year < YEAR_MIN || year > YEAR_MAX) return null;
  } else {
    return null;
  }
  return { year, text };
}
