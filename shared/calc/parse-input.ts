/**
 * The estimator's input check with parts remembered by their object. The editor calls the engine on every keystroke
 * and keeps the objects of the parts that did not change, so a 200-part piece would otherwise have its 200 parts
 * checked by zod again on every call (about half of that call's time).
 *
 * What is remembered: for a part object that passed a whole check, a deep copy of it as it was (its snapshot), zod's
 * output for it and the default length units its lengths passed under. A part is taken from memory only when it is
 * still equal to its snapshot (so a part changed in place is checked again) and passed under the input's unit.
 *
 * Why the output is the same: zod checks a part on its own (the parts list's element schema sees only the part), so
 * its output for a part equal to an earlier one is equal to the earlier output; the input's own refinement reads a
 * part's lengths against the default unit only, which the remembered units cover. The rest of the input is checked
 * by zod as always, with the parts list standing for one plain part; the list's length limits are checked here.
 * Whenever anything is not as expected (a part not remembered or changed, the rest of the input has a problem, an
 * object that is not plain data) the whole input goes through zod as before, so every problem is reported exactly
 * as zod reports it.
 *
 * An input without a parts list (a template piece) is remembered whole, under the same rule: see parseWithoutParts.
 */
import { EstimateInputSchema, MAX_PARTS } from '../schemas/calc';
import { DATE_RULES } from '../schemas/dates';
import type { DateRule } from '../schemas/dates';
import type { EstimateInput, ParsedEstimateInput, Part } from '../schemas/calc';

interface Remembered {
  snapshot: unknown;
  parsed: Part;
  units: string[];
}

const remembered = new WeakMap<object, Remembered>();
/** zod's outputs that are remembered (and so come back, the same objects, while their parts do not change). */
const rememberedOutputs = new WeakSet<Part>();

/** Is this parsed part one that parseEstimateInput remembers (and so may give again for an unchanged part)? */
export function isRememberedPart(part: Part): boolean {
  return rememberedOutputs.has(part);
}

/** Stands for the parts list while the rest of the input is checked; valid under every default length unit. */
const STAND_IN: Readonly<Record<string, unknown>> = Object.freeze({ name: 'part', shape: Object.freeze({ kind: 'rectangle', length: 1, width: 1 }) });

const hasOwn = Object.prototype.hasOwnProperty;

/** A plain object (the kind JSON and the editor make): zod reads nothing from its prototype. */
function isPlainObject(x: unknown): x is Record<string, unknown> {
  if (typeof x !== 'object' || x === null || Array.isArray(x)) return false;
  const proto: unknown = Object.getPrototypeOf(x);
  return proto === Object.prototype || proto === null;
}

function isPlainArray(x: unknown): x is unknown[] {
  return Array.isArray(x) && Object.getPrototypeOf(x) === Array.prototype;
}

/** Is `value` the same data as `snapshot` (a deep copy of plain objects, arrays and primitives)? */
function sameData(value: unknown, snapshot: unknown): boolean {
  if (Object.is(value, snapshot)) return true;
  if (typeof value !== 'object' || value === null || typeof snapshot !== 'object' || snapshot === null) return false;
  if (Array.isArray(snapshot)) {
    if (!isPlainArray(value) || value.length !== snapshot.length) return false;
    for (let i = 0; i < value.length; i++) {
      if (!(i in value) || !sameData(value[i], snapshot[i])) return false;
    }
    return true;
  }
  if (!isPlainObject(value)) return false;
  const s = snapshot as Record<string, unknown>;
  let count = 0;
  for (const key in value) {
    if (!hasOwn.call(value, key)) return false;
    if (!hasOwn.call(s, key) || !sameData(value[key], s[key])) return false;
    count++;
  }
  return count === Object.keys(s).length;
}

const NOT_PLAIN: unique symbol = Symbol('not plain data');

/**
 * A deep copy of plain data (plain objects whose own properties are all enumerable, dense plain arrays, strings,
 * numbers, booleans, null, undefined), or NOT_PLAIN for anything else (the part is then not remembered).
 */
function snapshotOf(x: unknown, depth = 0): unknown {
  if (x === null || x === undefined) return x;
  const t = typeof x;
  if (t === 'string' || t === 'number' || t === 'boolean') return x;
  if (depth > 8) return NOT_PLAIN;
  if (isPlainArray(x)) {
    const out: unknown[] = [];
    for (let i = 0; i < x.length; i++) {
      if (!(i in x)) return NOT_PLAIN;
      const v = snapshotOf(x[i], depth + 1);
      if (v === NOT_PLAIN) return NOT_PLAIN;
      out.push(v);
    }
    return out;
  }
  if (isPlainObject(x)) {
    const out: Record<string, unknown> = {};
    const keys = Object.keys(x);
    // A property zod could read but a copy would miss (not enumerable) keeps the part from being remembered.
    if (Object.getOwnPropertyNames(x).length !== keys.length) return NOT_PLAIN;
    for (const key of keys) {
      const v = snapshotOf(x[key], depth + 1);
      if (v === NOT_PLAIN) return NOT_PLAIN;
      out[key] = v;
    }
    return out;
  }
  return NOT_PLAIN;
}

/** Where the input's parts list is, when it has exactly one, as a plain array of plain data. */
function partsListOf(raw: unknown): { list: unknown[]; inPiece: boolean } | null {
  if (!isPlainObject(raw)) return null;
  const piece = raw.piece;
  const top = raw.parts;
  if (piece !== undefined) {
    if (top !== undefined || !isPlainObject(piece) || !isPlainArray(piece.parts)) return null;
    return { list: piece.parts, inPiece: true };
  }
  return isPlainArray(top) ? { list: top, inPiece: false } : null;
}

/** Remembers each part of an input zod accepted whole, under the unit it was checked against. */
function remember(rawList: unknown[], parsedList: readonly Part[], unit: string): void {
  for (let i = 0; i < rawList.length; i++) {
    const raw = rawList[i];
    if (typeof raw !== 'object' || raw === null) continue;
    const known = remembered.get(raw);
    if (known && sameData(raw, known.snapshot)) {
      if (!known.units.includes(unit)) known.units.push(unit);
      continue;
    }
    const snapshot = snapshotOf(raw);
    if (snapshot === NOT_PLAIN) continue;
    const parsed = parsedList[i] as Part;
    remembered.set(raw, { snapshot, parsed, units: [unit] });
    rememberedOutputs.add(parsed);
  }
}

interface Recalled {
  /** What is remembered of each part (null for a part zod must check). */
  known: Array<Remembered | null>;
  /** The parts zod must check, in order. */
  fresh: unknown[];
}

/**
 * What is remembered of each part of the list, for the unit given; null when the list must go to zod whole (out of
 * its length limits, a hole, or not one part remembered).
 */
function recall(list: unknown[], unit: string): Recalled | null {
  if (list.length < 1 || list.length > MAX_PARTS) return null;
  const known: Array<Remembered | null> = [];
  const fresh: unknown[] = [];
  for (let i = 0; i < list.length; i++) {
    if (!(i in list)) return null;
    const raw = list[i];
    const k = typeof raw === 'object' && raw !== null ? remembered.get(raw) : undefined;
    if (k && k.units.includes(unit) && sameData(raw, k.snapshot)) {
      known.push(k);
    } else {
      known.push(null);
      fresh.push(raw);
    }
  }
  return fresh.length < list.length ? { known, fresh } : null;
}

/**
 * `EstimateInputSchema.parse(raw)`: the same output, the same ZodError for bad input; parts unchanged since an
 * earlier call are not checked by zod again. The input goes to zod with its parts list cut down to the parts that
 * are not remembered (or one plain stand-in part when all are); when that passes, the remembered parts' outputs are
 * put back in their places. When it does not, the whole input goes to zod, for the problems as zod reports them.
 */
export function parseEstimateInput(raw: EstimateInput): ParsedEstimateInput {
  const where = partsListOf(raw);
  if (!where) return parseWithoutParts(raw);
  const given = (raw as Record<string, unknown>).defaultLengthUnit;
  // The unit the input will have (checked below against zod's output).
  const unit = typeof given === 'string' ? given : 'mm';
  const r = recall(where.list, unit);
  if (!r) return parseWhole(raw, where);
  const rest = raw as Record<string, unknown>;
  const list = r.fresh.length > 0 ? r.fresh : [STAND_IN];
  const cut = where.inPiece ? { ...rest, piece: { ...(rest.piece as Record<string, unknown>), parts: list } } : { ...rest, parts: list };
  const checked = EstimateInputSchema.safeParse(cut);
  if (!checked.success || checked.data.defaultLengthUnit !== unit) return parseWhole(raw, where);
  const out = checked.data;
  const checkedParts = where.inPiece ? out.piece?.parts : out.parts;
  if (!checkedParts || checkedParts.length !== list.length) return parseWhole(raw, where);
  const parts: Part[] = [];
  let j = 0;
  for (const k of r.known) parts.push(k ? k.parsed : (checkedParts[j++] as Part));
  if (r.fresh.length > 0) remember(r.fresh, checkedParts, unit);
  if (where.inPiece) (out.piece as NonNullable<ParsedEstimateInput['piece']>).parts = parts;
  else out.parts = parts;
  return out;
}

/**
 * The parts of the last list zod checked whole. A list none of whose parts was seen before (a piece opened, or every
 * part new, as on a server) is not remembered: remembering costs more than zod's check, and only pays when the parts
 * come again. The editor's second call meets the same parts and remembers them.
 */
let lastWhole: ReadonlySet<unknown> = new Set();

function parseWhole(raw: EstimateInput, where: { list: unknown[]; inPiece: boolean } | null): ParsedEstimateInput {
  const out = EstimateInputSchema.parse(raw);
  if (where) {
    const parsed = where.inPiece ? out.piece?.parts : out.parts;
    const seen = where.list.some((p) => lastWhole.has(p));
    lastWhole = new Set(where.list);
    if (seen && parsed && parsed.length === where.list.length) remember(where.list, parsed, out.defaultLengthUnit);
  }
  return out;
}

/**
 * An input without a parts list (a template piece) remembered whole by its object: a deep copy of it as it was
 * (its snapshot) and zod's output for it. The editor passes the same input object while nothing in it changes, and
 * zod's check of it was about a tenth of an estimate of the default grand.
 *
 * Why the output is the same: zod's output for an input depends only on its data, and the input is taken from
 * memory only while it is still equal to its snapshot (a field changed in place sends it to zod again). The one
 * part of the check that could read the clock is the start date's bounds: while they are fixed dates (as they are),
 * the check reads nothing but the data; were they ever made relative to today, nothing is remembered.
 *
 * What is remembered is zod's output, which the engine only reads (it is never handed to a caller).
 */
const rememberedInputs = new WeakMap<object, { snapshot: unknown; parsed: ParsedEstimateInput }>();

const fixedBound = (b: DateRule['min']): boolean => b === undefined || typeof b === 'string';
const START_RULE: DateRule = DATE_RULES.calcStart;
const INPUT_CHECK_IS_PURE = fixedBound(START_RULE.min) && fixedBound(START_RULE.max);

function parseWithoutParts(raw: EstimateInput): ParsedEstimateInput {
  if (!INPUT_CHECK_IS_PURE || !isPlainObject(raw)) return parseWhole(raw, null);
  const known = rememberedInputs.get(raw);
  if (known && sameData(raw, known.snapshot)) return known.parsed;
  const parsed = parseWhole(raw, null);
  const snapshot = snapshotOf(raw);
  if (snapshot !== NOT_PLAIN) rememberedInputs.set(raw, { snapshot, parsed });
  else rememberedInputs.delete(raw);
  return parsed;
}
