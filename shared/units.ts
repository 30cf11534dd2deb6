/**
 * Lengths written as text, parsed exactly with mathjs units into millimetres, and display formatting of
 * areas, volumes, masses and lengths in metric or imperial units.
 *
 * Inside the engine lengths are millimetres, areas square metres, volumes litres and masses grams.
 */
import { unit } from 'mathjs';

import type { LengthUnit, UnitSystem, VolumeMeasure } from './unit-names';

export { LENGTH_UNITS, UNIT_SYSTEMS, VOLUME_MEASURES } from './unit-names';
export type { LengthUnit, UnitSystem, VolumeMeasure } from './unit-names';

/** The largest length the estimator accepts: nothing in a workshop is longer than 100 m. */
export const MAX_LENGTH_MM = 100_000;

const EXPECTED =
  'a positive length such as "190 cm", "1.9 m", "1900 mm", "75 in", "6 ft 3 in" or "6\' 3\\"", or a bare number in the default unit';

/** Thrown when a length cannot be read; carries the offending text and what was expected. */
export class UnitParseError extends Error {
  readonly text: string;
  readonly expected: string;
  constructor(text: string, reason: string, expected: string = EXPECTED) {
    super(`Cannot read "${text}" as a length: ${reason}; expected ${expected}`);
    this.name = 'UnitParseError';
    this.text = text;
    this.expected = expected;
  }
}

const UNIT_ALIASES: Readonly<Record<string, LengthUnit>> = {
  mm: 'mm', millimetre: 'mm', millimetres: 'mm', millimeter: 'mm', millimeters: 'mm',
  cm: 'cm', centimetre: 'cm', centimetres: 'cm', centimeter: 'cm', centimeters: 'cm',
  m: 'm', metre: 'm', metres: 'm', meter: 'm', meters: 'm',
  in: 'in', inch: 'in', inches: 'in',
  ft: 'ft', foot: 'ft', feet: 'ft',
};

/** mathjs spells the units the same way as LENGTH_UNITS, so the mapping is the identity. */
const MATHJS_NAME: Readonly<Record<LengthUnit, string>> = { mm: 'mm', cm: 'cm', m: 'm', in: 'in', ft: 'ft' };

/**
 * Rounds away binary floating-point noise (75 in is 1905.0000000000002 mm in IEEE doubles) at one nanometre,
 * far below any workshop measurement.
 */
function roundNano(mm: number): number {
  return Math.round(mm * 1e6) / 1e6;
}

/**
 * Metres per unit, as mathjs defines them (unit value × prefix value: 1 in = 0.0254 m, 1 ft = 0.3048 m, 1 cm =
 * 1 × 0.01 m, 1 mm = 1 × 0.001 m), so that the conversion below does the very floating-point operations mathjs's
 * `unit(value, from).toNumber('mm')` does (value × metres per unit ÷ metres per mm) and gives the same double
 * without building mathjs units on every call. tests/unit/calc/units-exact.test.ts checks the equality with mathjs
 * itself, by property.
 */
const METRES_PER: Readonly<Record<LengthUnit, number>> = { mm: 1 * 0.001, cm: 1 * 0.01, m: 1 * 1, in: 0.0254 * 1, ft: 0.3048 * 1 };
const METRES_PER_MM = METRES_PER.mm;

/**
 * Converts a value in a length unit to millimetres (exact definitions: 1 in = 25.4 mm), as mathjs units convert it.
 *
 * @example toMillimetres(75, 'in') // 1905
 */
export function toMillimetres(value: number, from: LengthUnit): number {
  if (from === 'mm') return value;
  return roundNano((value * METRES_PER[from]) / METRES_PER_MM);
}

/**
 * Converts millimetres to another length unit.
 *
 * @example fromMillimetres(1905, 'ft') // 6.25
 */
export function fromMillimetres(mm: number, to: LengthUnit): number {
  return unit(mm, 'mm').toNumber(MATHJS_NAME[to]);
}

function checkMagnitude(mm: number, text: string, allowZero: boolean): number {
  if (!Number.isFinite(mm)) throw new UnitParseError(text, 'it is not a finite number');
  if (mm < 0) throw new UnitParseError(text, 'a length cannot be negative');
  if (mm === 0 && !allowZero) throw new UnitParseError(text, 'a length must be more than zero');
  if (mm > MAX_LENGTH_MM) throw new UnitParseError(text, 'it is longer than 100 m');
  return mm;
}

const NUMBER = String.raw`(?:\d+(?:\.\d*)?|\.\d+)(?:e[+-]?\d+)?`;
const PLAIN_MM = /^\s*(\d{1,9}(?:\.\d{1,9})?)\s*mm\s*$/;
/**
 * One amount and its unit: a number ("75", "75.5"), a mixed number as workshops write it ("3 1/2", "3-1/2"), or
 * a fraction alone ("1/2"); then an optional unit word.
 */
const TOKEN = new RegExp(
  String.raw`\s*(?:(\d+)\s*/\s*(\d+)|(${NUMBER})(?:(?:\s+|\s*-\s*)(\d+)\s*/\s*(\d+))?)\s*([a-z]+)?\s*`,
  'y',
);

/** Unicode vulgar fractions workshops type or paste ("3½"). */
const VULGAR: Readonly<Record<string, string>> = {
  '½': '1/2', '⅓': '1/3', '⅔': '2/3', '¼': '1/4', '¾': '3/4', '⅕': '1/5', '⅖': '2/5', '⅗': '3/5', '⅘': '4/5',
  '⅙': '1/6', '⅚': '5/6', '⅛': '1/8', '⅜': '3/8', '⅝': '5/8', '⅞': '7/8', '⅟': '1/',
};

/** The amount of a token: a number, a mixed number (its whole part a whole number) or a fraction. */
function readAmount(value: string, match: RegExpExecArray): number {
  const [, fracNum, fracDen, number, mixedNum, mixedDen] = match;
  const fraction = (num: string, den: string): number => {
    if (Number(den) === 0) throw new UnitParseError(value, 'a fraction cannot have 0 below the line');
    return Number(num) / Number(den);
  };
  if (number === undefined) return fraction(fracNum as string, fracDen as string);
  if (mixedNum === undefined) return Number(number);
  if (!/^\d+$/.test(number)) throw new UnitParseError(value, 'a whole number goes before a fraction, as in "3 1/2"');
  return Number(number) + fraction(mixedNum, mixedDen as string);
}

/** Options for {@link parseLength}. */
export interface ParseLengthOptions {
  /** Accept zero (for example a thickness that may be absent). Default false. */
  allowZero?: boolean;
}

/**
 * Reads a length written as text (or a bare number) and returns millimetres.
 *
 * Accepts a number with a unit ("190 cm", "1.9 m", "1900 mm", "75 in", "75.5in"), a sum of feet and inches
 * ("6 ft 3 in", "6ft3in", "6' 3\"", "6 ft"), fractions as workshops write them ("6 ft 3½ in", "6 ft 3 1/2 in",
 * "75 1/2 in", "6' 3-1/2\""), or a bare number (number or numeric string) in `defaultUnit`. A comma between feet
 * and inches ("6 ft, 3 in") and a decimal comma ("75,5 in") are refused, each with its own message.
 * Throws {@link UnitParseError} for anything else, for negatives, zero (unless allowed), NaN, Infinity and
 * lengths over 100 m.
 *
 * @example parseLength('6 ft 3 in') // 1905
 * @example parseLength(75, 'in') // 1905
 */
export function parseLength(value: string | number, defaultUnit: LengthUnit = 'mm', options: ParseLengthOptions = {}): number {
  const allowZero = options.allowZero ?? false;
  if (typeof value !== 'string') return readLengthValue(value, defaultUnit, allowZero);
  // Texts come back on every keystroke (the editor and the server read the same parts again and again): what a text
  // reads as is remembered, bounded. Errors are not remembered: a bad text throws from the reader every time.
  const key = `${defaultUnit}${allowZero ? '+' : '-'}${value}`;
  const known = readTexts.get(key);
  if (known !== undefined) return known;
  const mm = readLengthValue(value, defaultUnit, allowZero);
  if (readTexts.size >= READ_TEXTS_MAX) readTexts.clear();
  readTexts.set(key, mm);
  return mm;
}

/** Texts already read, by default unit, zero rule and text (see parseLength). */
const readTexts = new Map<string, number>();
const READ_TEXTS_MAX = 4096;

function readLengthValue(value: string | number, defaultUnit: LengthUnit, allowZero: boolean): number {
  if (typeof value === 'number') {
    const shown = String(value);
    if (!Number.isFinite(value)) throw new UnitParseError(shown, 'it is not a finite number');
    if (value < 0) throw new UnitParseError(shown, 'a length cannot be negative');
    if (value > MAX_LENGTH_MM) throw new UnitParseError(shown, 'it is longer than 100 m');
    return checkMagnitude(toMillimetres(value, defaultUnit), shown, allowZero);
  }
  if (typeof value !== 'string') throw new UnitParseError(String(value), 'it is neither text nor a number');
  // Fast path for the plain millimetre text the templates write ("1905 mm"): no conversion is involved.
  const plainMm = PLAIN_MM.exec(value);
  if (plainMm) return checkMagnitude(Number(plainMm[1]), value, allowZero);
  const text = value
    .trim()
    .toLowerCase()
    .replace(/''|[″”“"]/g, ' in ')
    .replace(/[′’‘']/g, ' ft ')
    .replace(/\u2044/g, '/')
    .replace(/(\d)?\s*-?\s*([½⅓⅔¼¾⅕⅖⅗⅘⅙⅚⅛⅜⅝⅞])/g, (_m, whole: string | undefined, f: string) => `${whole ?? ''} ${VULGAR[f] ?? f}`)
    .trim();
  if (text === '') throw new UnitParseError(value, 'it is empty');
  if (text.startsWith('-')) throw new UnitParseError(value, 'a length cannot be negative');
  if (/\d,\d/.test(text)) throw new UnitParseError(value, 'use a point, not a comma, for decimals');
  if (text.includes(',')) throw new UnitParseError(value, 'write feet and inches without a comma between them, as "6 ft 3 in"');

  const parts: Array<{ amount: number; unit: LengthUnit | null }> = [];
  TOKEN.lastIndex = 0;
  while (TOKEN.lastIndex < text.length) {
    const at = TOKEN.lastIndex;
    const match = TOKEN.exec(text);
    if (!match || match.index !== at) throw new UnitParseError(value, `unexpected text at "${text.slice(at).trim()}"`);
    const amount = readAmount(value, match);
    const word = match[6];
    let lengthUnit: LengthUnit | null = null;
    if (word !== undefined) {
      const known = UNIT_ALIASES[word];
      if (!known) throw new UnitParseError(value, `"${word}" is not a length unit (use mm, cm, m, in or ft)`);
      lengthUnit = known;
    }
    parts.push({ amount, unit: lengthUnit });
  }
  const first = parts[0];
  if (!first) throw new UnitParseError(value, 'no number found');
  if (parts.length === 1 && first.unit === null) {
    if (first.amount > MAX_LENGTH_MM) throw new UnitParseError(value, 'it is longer than 100 m');
    return checkMagnitude(toMillimetres(first.amount, defaultUnit), value, allowZero);
  }
  let mm = 0;
  for (const part of parts) {
    if (part.unit === null) throw new UnitParseError(value, 'every number in a compound length needs a unit');
    if (!Number.isFinite(part.amount) || part.amount > MAX_LENGTH_MM) throw new UnitParseError(value, 'it is longer than 100 m');
    mm += toMillimetres(part.amount, part.unit);
  }
  return checkMagnitude(roundNano(mm), value, allowZero);
}

/** Exact conversion factors, from mathjs's unit definitions. */
const FT2_PER_M2 = 1 / unit(1, 'ft^2').toNumber('m^2');
const ML_PER_US_FLOZ = unit(1, 'floz').toNumber('mL');
const ML_PER_US_PINT = unit(1, 'pint').toNumber('mL');
/** Imperial pint: an eighth of the imperial gallon of 4.54609 L (UK Weights and Measures Act 1985); 20 fl oz to it. */
const ML_PER_UK_PINT = 4546.09 / 8;
const ML_PER_UK_FLOZ = ML_PER_UK_PINT / 20;
const G_PER_OZ = unit(1, 'oz').toNumber('g');
const G_PER_LB = unit(1, 'lb').toNumber('g');

/** Rounds to a precision that suits the size: 0 dp from 100, 1 dp from 10, else 2 dp. */
function sensible(value: number): string {
  const abs = Math.abs(value);
  const digits = abs >= 100 ? 0 : abs >= 10 ? 1 : 2;
  return value.toFixed(digits);
}

/**
 * Formats an area given in square metres.
 *
 * @example formatArea(1, 'imperial') // "10.8 ft²"
 */
export function formatArea(m2: number, system: UnitSystem): string {
  return system === 'metric' ? `${sensible(m2)} m²` : `${sensible(m2 * FT2_PER_M2)} ft²`;
}

/**
 * Formats a volume given in litres: mL under a litre, else L; imperial in fluid ounces under a pint, else pints,
 * US customary or imperial (UK) as the workshop's convention says, and always named.
 *
 * @example formatVolume(0.25, 'metric') // "250 mL"
 * @example formatVolume(0.56826125, 'imperial', 'uk') // "1.00 imperial pints"
 */
export function formatVolume(litres: number, system: UnitSystem, measure: VolumeMeasure = 'us'): string {
  const ml = litres * 1000;
  if (system === 'metric') return ml < 1000 ? `${sensible(ml)} mL` : `${sensible(litres)} L`;
  if (measure === 'uk') return ml < ML_PER_UK_PINT ? `${sensible(ml / ML_PER_UK_FLOZ)} imperial fl oz` : `${sensible(ml / ML_PER_UK_PINT)} imperial pints`;
  return ml < ML_PER_US_PINT ? `${sensible(ml / ML_PER_US_FLOZ)} US fl oz` : `${sensible(ml / ML_PER_US_PINT)} US pints`;
}

/**
 * Formats a mass given in grams: g or kg; imperial oz or lb.
 *
 * @example formatMass(453.59237, 'imperial') // "1.00 lb"
 */
export function formatMass(grams: number, system: UnitSystem): string {
  if (system === 'metric') return grams < 1000 ? `${sensible(grams)} g` : `${sensible(grams / 1000)} kg`;
  return grams < G_PER_LB ? `${sensible(grams / G_PER_OZ)} oz` : `${sensible(grams / G_PER_LB)} lb`;
}

/**
 * Formats a length given in millimetres: mm, or inches to a tenth.
 *
 * @example formatLength(1905, 'imperial') // "75.0 in"
 */
export function formatLength(mm: number, system: UnitSystem): string {
  return system === 'metric' ? `${Math.round(mm)} mm` : `${fromMillimetres(mm, 'in').toFixed(1)} in`;
}
