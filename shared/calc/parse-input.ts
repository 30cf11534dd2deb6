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
 */
import { EstimateInputSchema, MAX_PARTS } from '../schemas/calc';
import type { EstimateInput, ParsedEstimateInput, Part } from '../schemas/calc';

interface Remembered {
  snapshot: unknown;
  parsed: Part;
  units: Set<string>;
}

const remembered = new WeakMap<object, Remembered>();

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

/** Is this plain data throughout (plain objects, dense plain arrays, strings, numbers, booleans, null, undefined)? */
function isPlainData(x: unknown, depth = 0): boolean {
  if (depth > 8) return false;
  if (x === null || x === undefined) return true;
  const t = typeof x;
  if (t === 'string' || t === 'number' || t === 'boolean') return true;
  if (isPlainArray(x)) {
    for (let i = 0; i < x.length; i++) if (!(i in x) || !isPlainData(x[i], depth + 1)) return false;
    return true;
  }
  if (isPlainObject(x)) {
    if (Object.getOwnPropertySymbols(x).length > 0) return false;
    for (const key of Object.getOwnPropertyNames(x)) {
      const d = Object.getOwnPropertyDescriptor(x, key);
      if (!d || !d.enumerable || !('value' in d) || !isPlainData(d.value, depth + 1)) return false;
    }
    return true;
  }
  return false;
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
      known.units.add(unit);
      continue;
    }
    if (!isPlainData(raw)) continue;
    remembered.set(raw, { snapshot: structuredClone(raw), parsed: parsedList[i] as Part, units: new Set([unit]) });
  }
}

/** What is remembered of every part of the list, or null when any part must be checked again. */
function recall(list: unknown[]): Remembered[] | null {
  if (list.length < 1 || list.length > MAX_PARTS) return null;
  const out: Remembered[] = new Array<Remembered>(list.length);
  for (let i = 0; i < list.length; i++) {
    if (!(i in list)) return null;
    const raw = list[i];
    if (typeof raw !== 'object' || raw === null) return null;
    const known = remembered.get(raw);
    if (!known || !sameData(raw, known.snapshot)) return null;
    out[i] = known;
  }
  return out;
}

/**
 * `EstimateInputSchema.parse(raw)`: the same output, the same ZodError for bad input; parts unchanged since an
 * earlier call are not checked by zod again.
 */
export function parseEstimateInput(raw: EstimateInput): ParsedEstimateInput {
  const where = partsListOf(raw);
  if (where) {
    const known = recall(where.list);
    if (known) {
      const rest = raw as Record<string, unknown>;
      const standIn = where.inPiece
        ? { ...rest, piece: { ...(rest.piece as Record<string, unknown>), parts: [STAND_IN] } }
        : { ...rest, parts: [STAND_IN] };
      const checked = EstimateInputSchema.safeParse(standIn);
      if (checked.success) {
        const out = checked.data;
        const unit = out.defaultLengthUnit;
        const parts: Part[] = [];
        for (const k of known) {
          if (!k.units.has(unit)) return parseWhole(raw, where);
          parts.push(k.parsed);
        }
        if (where.inPiece && out.piece) out.piece.parts = parts;
        else if (!where.inPiece) out.parts = parts;
        else return parseWhole(raw, where);
        return out;
      }
    }
  }
  return parseWhole(raw, where);
}

function parseWhole(raw: EstimateInput, where: { list: unknown[]; inPiece: boolean } | null): ParsedEstimateInput {
  const out = EstimateInputSchema.parse(raw);
  if (where) {
    const parsed = where.inPiece ? out.piece?.parts : out.parts;
    if (parsed && parsed.length === where.list.length) remember(where.list, parsed, out.defaultLengthUnit);
  }
  return out;
}
