/** A piece's year as people write it: exact, approximate or a decade, with a sortable best guess beside the text. */
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import '../../shared/schemas/error-map';
import { parsePieceYear } from '../../shared/piece-year';
import { PieceInputSchema } from '../../shared/schemas/customers';

describe('parsePieceYear', () => {
  it.each([
    ['1890', 1890, '1890'],
    ['c. 1830', 1830, 'c. 1830'],
    ['c.1830', 1830, 'c.1830'],
    ['circa 1830', 1830, 'circa 1830'],
    ['ca. 1830', 1830, 'ca. 1830'],
    ['about 1900', 1900, 'about 1900'],
    ['  About   1900 ', 1900, 'About 1900'],
    ['1890s', 1895, '1890s'],
    ["1890's", 1895, "1890's"],
    ['c. 1890s', 1895, 'c. 1890s'],
    ['1600', 1600, '1600'],
    ['2100', 2100, '2100'],
  ])('reads %j as %i', (written, year, text) => {
    expect(parsePieceYear(written)).toEqual({ year, text });
  });

  it.each(['', 'old', '189', '18900', '1599', '2101', '1590s', '1830-1840', 'c.', 'nineteenth century', '1890 or so'])('refuses %j', (written) => {
    expect(parsePieceYear(written)).toBeNull();
  });

  it('a written whole year reads back as itself, with or without "c."', () => {
    fc.assert(
      fc.property(fc.integer({ min: 1600, max: 2100 }), fc.constantFrom('', 'c. ', 'circa ', 'about '), (y, prefix) => {
        expect(parsePieceYear(`${prefix}${y}`)).toEqual({ year: y, text: `${prefix}${y}`.trim() });
      }),
    );
  });

  it('a decade sorts at its middle, inside the decade', () => {
    fc.assert(
      fc.property(fc.integer({ min: 160, max: 210 }), (d) => {
        const parsed = parsePieceYear(`${d}0s`)!;
        expect(parsed.year).toBe(d * 10 + 5);
        expect(Math.floor(parsed.year / 10)).toBe(d);
      }),
    );
  });

  it('the piece schema takes the written forms and refuses others with a plain message', () => {
    const base = { customerId: 1, kind: 'grand', description: 'Grand' };
    for (const year of ['c. 1830', '1890s', '1890', 'about 1900', 1898, null, '']) expect(PieceInputSchema.safeParse({ ...base, year }).success).toBe(true);
    const bad = PieceInputSchema.safeParse({ ...base, year: 'the old days' });
    expect(bad.success).toBe(false);
    expect(bad.error!.issues[0]!.path).toEqual(['year']);
    expect(bad.error!.issues[0]!.message).toBe('must be a year such as 1890, c. 1830, about 1900 or 1890s');
  });
});
