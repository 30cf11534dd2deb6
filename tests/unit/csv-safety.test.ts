/**
 * CSV exports are safe to open in a spreadsheet: whatever text goes in, no cell reads back starting with a character
 * that makes a spreadsheet evaluate it (= + - @, or a tab or carriage return some programs skip first), and every
 * cell reads back as written apart from the one apostrophe that neutralises it. Read back with csv-parse, an
 * independent RFC 4180 reader.
 */
import { parse } from 'csv-parse/sync';
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { csvDecimal, safeCell, toCsv } from '../../shared/csv';

const DANGER = ['=', '+', '-', '@', '\t', '\r'];
/** Text weighted toward the dangerous starts, quotes, commas and line breaks. */
const nasty = fc.oneof(
  fc.string({ unit: 'grapheme-composite', maxLength: 30 }),
  fc.tuple(fc.constantFrom(...DANGER), fc.string({ maxLength: 20 })).map(([a, b]) => a + b),
  fc.constantFrom('=HYPERLINK("http://example.com","x")', '+1+1', '-2+3', '@SUM(A1:A2)', '\t=1', '\r=1', '"quoted, with comma"', 'line\nbreak', '', "'already"),
);

function readBack(csv: string): string[][] {
  return parse(csv.replace(/^\ufeff/, ''), { relax_column_count: false, bom: true }) as string[][];
}

describe('CSV cells', () => {
  it('never start a formula, and read back as written apart from the neutralising apostrophe', () => {
    fc.assert(
      fc.property(fc.array(fc.array(nasty, { minLength: 1, maxLength: 5 }), { minLength: 1, maxLength: 8 }), (rows) => {
        const width = Math.max(...rows.map((r) => r.length));
        const padded = rows.map((r) => [...r, ...Array.from({ length: width - r.length }, () => '')]);
        const header = Array.from({ length: width }, (_, i) => `Column ${i + 1}`);
        const back = readBack(toCsv(header, padded));
        expect(back[0]).toEqual(header);
        expect(back).toHaveLength(padded.length + 1);
        padded.forEach((row, i) =>
          row.forEach((cell, j) => {
            const read = back[i + 1]![j]!;
            expect(DANGER.some((d) => read.startsWith(d))).toBe(false);
            expect(read).toBe(DANGER.some((d) => cell.startsWith(d)) ? `'${cell}` : cell);
          }),
        );
      }),
      { numRuns: 300 },
    );
  });

  it('keeps numbers the product writes as numbers, negative ones included', () => {
    fc.assert(
      fc.property(fc.double({ noNaN: true, noDefaultInfinity: true, min: -1e9, max: 1e9 }), (n) => {
        expect(safeCell(n)).toBe(String(n));
      }),
    );
    expect(safeCell(null)).toBe('');
    expect(safeCell(undefined)).toBe('');
  });
});

describe('decimal amounts', () => {
  it('are written exactly, negative ones too, and anything else in their place is neutralised text', () => {
    fc.assert(
      fc.property(fc.bigInt({ min: -(10n ** 12n), max: 10n ** 12n }), (cents) => {
        const text = `${cents < 0n ? '-' : ''}${(cents < 0n ? -cents : cents) / 100n}.${String((cents < 0n ? -cents : cents) % 100n).padStart(2, '0')}`;
        expect(safeCell(csvDecimal(text))).toBe(text);
      }),
    );
    fc.assert(
      fc.property(nasty, (text) => {
        const cell = safeCell(csvDecimal(text));
        if (!/^-?\d{1,15}(\.\d{1,4})?$/.test(text)) expect(cell).toBe(safeCell(text));
      }),
    );
    expect(safeCell(csvDecimal('-1+2'))).toBe("'-1+2");
    expect(safeCell(csvDecimal('=1'))).toBe("'=1");
    expect(safeCell(csvDecimal(null))).toBe('');
  });
});
