/**
 * compareRevisions(): what changed between two revisions of an estimate — the inputs the finisher typed, the
 * totals, the hours per stage, the materials and the price. Pure: no I/O, never mutates its arguments.
 */
import { formatAmount, money } from './money';
import type { EstimateResult } from './schemas/calc';
import type { Revision } from './schemas/estimates';

/** The part of a revision a comparison reads. */
export type ComparableRevision = Pick<Revision, 'number' | 'input' | 'result'>;

/** One input that differs. Values are shown as text; null when the input is absent on that side. */
export interface InputChange {
  /** Dotted path; list items are named by their id or key when they have one ("piece.parts.lid-top.count"). */
  path: string;
  /** The path in words ("Lid, top › count"). */
  label: string;
  kind: 'added' | 'removed' | 'changed';
  before: string | null;
  after: string | null;
}

/** A figure that may have changed, with its unit and the change (after − before). */
export interface FigureChange {
  key: string;
  label: string;
  unit: string;
  before: number;
  after: number;
  delta: number;
}

/** A money amount that may have changed; decimal strings, never floats. */
export interface MoneyChange {
  key: string;
  label: string;
  /** Each revision's own wording of the line (a labour line names its own hours and rate); null when absent. */
  labelBefore: string | null;
  labelAfter: string | null;
  before: string | null;
  after: string | null;
  delta: string;
}

export interface StageChange {
  key: string;
  /** What the stage is (strip, fill, body…): stages are matched by what they are, never by position. */
  stageKind: string;
  name: string;
  /** The earlier revision's name when it differs (a stage renamed, or matched by its kind under another key). */
  nameBefore: string | null;
  kind: 'added' | 'removed' | 'changed' | 'same';
  coats: { before: number; after: number };
  sessions: { before: number; after: number };
  hours: { before: number; after: number; delta: number };
}

export interface MaterialChange {
  key: string;
  name: string;
  unit: string;
  kind: 'added' | 'removed' | 'changed' | 'same';
  /** Quantities in `unit`; a side without the material has null and counts as 0 in the delta. */
  need: { before: number | null; after: number | null; delta: number };
  charge: MoneyChange;
}

export interface RevisionComparison {
  from: number;
  to: number;
  inputs: InputChange[];
  totals: FigureChange[];
  stages: StageChange[];
  materials: MaterialChange[];
  price: MoneyChange[];
  currency: string;
  /** True when neither the inputs nor any figure changed. */
  same: boolean;
}

type Json = string | number | boolean | null | Json[] | { [key: string]: Json };

const WORDS: Readonly<Record<string, string>> = {
  piece: 'Piece',
  template: 'template',
  dimensions: 'dimensions',
  parts: 'parts',
  species: 'species',
  veneered: 'veneered',
  system: 'Finishing system',
  stages: 'Stages',
  climate: 'Climate',
  temperatureC: 'temperature (°C)',
  humidityPct: 'humidity (% RH)',
  startDate: 'Start date',
  discountPct: 'Discount (%)',
  units: 'Display units',
  defaultLengthUnit: 'Default length unit',
  rimHeight: 'rim height',
  shape: 'shape',
  kind: 'kind',
  faces: 'faces',
  edges: 'edges',
  thickness: 'thickness',
  count: 'count',
  cutOuts: 'cut-outs',
  complexity: 'complexity',
  show: 'show face',
  name: 'name',
  points: 'outline',
  topDiameter: 'top diameter',
  bottomDiameter: 'bottom diameter',
  topSide: 'top side',
  bottomSide: 'bottom side',
  outline: 'outline length',
  enabled: 'used',
  sessions: 'sessions',
  coatsPerSession: 'coats per session',
  cutLb: 'cut (lb)',
  polishMlPerM2PerCoat: 'polish (mL/m² per coat)',
  spiritMlPerM2PerSession: 'spirit (mL/m² per session)',
  labourMinPerM2PerCoat: 'labour (min/m² per coat)',
  setupMinPerSession: 'set-up (min per session)',
  restHours: 'rest (h)',
  appliesTo: 'applies to',
  materials: 'materials',
  perM2: 'per m²',
};

function isRecord(v: unknown): v is Record<string, unknown> {
  return v !== null && typeof v === 'object' && !Array.isArray(v);
}

/** An item's name in a list: its id or key when it has one, else its position. */
function itemKey(item: unknown, index: number): string {
  if (isRecord(item)) {
    if (typeof item.id === 'string' && item.id !== '') return item.id;
    if (typeof item.key === 'string' && item.key !== '') return item.key;
    if (typeof item.material === 'string') return item.material;
  }
  return String(index + 1);
}

/** Text for a leaf value; a list of plain values (an outline's points) becomes one summary. */
function show(value: unknown): string {
  if (value === undefined || value === null) return '—';
  if (typeof value === 'boolean') return value ? 'yes' : 'no';
  if (Array.isArray(value)) {
    if (value.length > 0 && value.every((v) => Array.isArray(v))) return `${value.length} points`;
    return value.map((v) => show(v)).join(', ');
  }
  if (isRecord(value)) {
    const name = typeof value.name === 'string' ? value.name : undefined;
    return name ?? JSON.stringify(value);
  }
  return String(value);
}

interface Leaf {
  label: string[];
  value: unknown;
}

/**
 * Flattens an input into leaves keyed by path. Lists of objects are keyed by item id/key (so reordering or adding a
 * part does not shift every later part); lists of plain values are single leaves.
 */
function flatten(value: unknown, path: string[], label: string[], out: Map<string, Leaf>): void {
  if (Array.isArray(value) && value.some((v) => isRecord(v))) {
    value.forEach((item, i) => {
      const key = itemKey(item, i);
      const name = isRecord(item) && typeof item.name === 'string' ? item.name : isRecord(item) && typeof item.material === 'string' ? item.material : `#${key}`;
      // A whole item is one leaf when it appears on one side only; see diffLeaves.
      out.set([...path, key].join('.'), { label: [...label, name], value: item });
      flatten(item, [...path, key], [...label, name], out);
    });
    return;
  }
  if (isRecord(value)) {
    for (const [k, v] of Object.entries(value)) {
      if (v === undefined) continue;
      flatten(v, [...path, k], [...label, WORDS[k] ?? k], out);
    }
    return;
  }
  out.set(path.join('.'), { label, value });
}

function isContainer(v: unknown): boolean {
  return isRecord(v) || (Array.isArray(v) && v.some((x) => isRecord(x)));
}

function same(a: unknown, b: unknown): boolean {
  return JSON.stringify(a) === JSON.stringify(b);
}

/** Differences in the inputs, in the order of the newer revision then what was removed. */
function diffInputs(a: unknown, b: unknown): InputChange[] {
  const before = new Map<string, Leaf>();
  const after = new Map<string, Leaf>();
  flatten(a, [], [], before);
  flatten(b, [], [], after);
  const changes: InputChange[] = [];
  /** Paths below an item or object that was added or removed whole: reported once, at the top. */
  const covered: string[] = [];
  const under = (path: string): boolean => covered.some((c) => path.startsWith(`${c}.`));
  const label = (l: string[]): string => l.join(' › ');
  for (const [path, leaf] of after) {
    if (under(path)) continue;
    const old = before.get(path);
    if (!old) {
      changes.push({ path, label: label(leaf.label), kind: 'added', before: null, after: show(leaf.value) });
      if (isContainer(leaf.value)) covered.push(path);
      continue;
    }
    if (isContainer(leaf.value) || isContainer(old.value)) continue;
    if (!same(old.value, leaf.value)) {
      const was = show(old.value);
      const now = show(leaf.value);
      // An outline with as many points as before but moved: say so rather than show the same text twice.
      changes.push({ path, label: label(leaf.label), kind: 'changed', before: was, after: was === now ? `${now}, reshaped` : now });
    }
  }
  for (const [path, leaf] of before) {
    if (after.has(path) || under(path)) continue;
    changes.push({ path, label: label(leaf.label), kind: 'removed', before: show(leaf.value), after: null });
    if (isContainer(leaf.value)) covered.push(path);
  }
  return changes;
}

const round = (x: number, dp = 3): number => Math.round(x * 10 ** dp) / 10 ** dp;

function figure(key: string, label: string, unit: string, before: number, after: number): FigureChange {
  return { key, label, unit, before, after, delta: round(after - before) };
}

function moneyChange(key: string, label: string, before: string | null, after: string | null, labels?: { before: string | null; after: string | null }): MoneyChange {
  return {
    key,
    label,
    labelBefore: labels ? labels.before : before === null ? null : label,
    labelAfter: labels ? labels.after : after === null ? null : label,
    before,
    after,
    delta: formatAmount(money(after ?? '0').minus(money(before ?? '0'))),
  };
}

function totals(a: EstimateResult, b: EstimateResult): FigureChange[] {
  return [
    figure('areaM2', 'Surface area', 'm²', a.totals.areaM2, b.totals.areaM2),
    figure('coats', 'Shellac coats', 'coats', a.totals.coats, b.totals.coats),
    figure('labourHours', 'Labour', 'h', a.totals.labourHours, b.totals.labourHours),
    figure('flakesG', 'Shellac flakes', 'g', a.totals.flakesG, b.totals.flakesG),
    figure('spiritL', 'Spirit', 'L', a.totals.spiritL, b.totals.spiritL),
    figure('calendarDays', 'Calendar', 'days', a.totals.calendarDays, b.totals.calendarDays),
  ];
}

function keyedUnion<T>(a: readonly T[], b: readonly T[], key: (t: T) => string): Array<{ key: string; a?: T; b?: T }> {
  const order: string[] = [];
  const byA = new Map(a.map((x) => [key(x), x]));
  const byB = new Map(b.map((x) => [key(x), x]));
  for (const x of b) order.push(key(x));
  for (const x of a) if (!byB.has(key(x))) order.push(key(x));
  return order.map((k) => ({ key: k, a: byA.get(k), b: byB.get(k) }));
}

function kindOf(hasA: boolean, hasB: boolean, changed: boolean): 'added' | 'removed' | 'changed' | 'same' {
  if (!hasA) return 'added';
  if (!hasB) return 'removed';
  return changed ? 'changed' : 'same';
}

type Stage = EstimateResult['stages'][number];

/**
 * Pairs the stages of two revisions by what they are: the same key first, then the same kind and name, then the same
 * kind when each side has just one such stage left. Never by position, so a stage added in front shifts nothing.
 * Order: the later revision's stages, then those only the earlier one had.
 */
export function pairStages(a: readonly Stage[], b: readonly Stage[]): Array<{ key: string; a?: Stage; b?: Stage }> {
  const matchOf = new Map<Stage, Stage>(); // b stage -> a stage
  const used = new Set<Stage>();
  const tryMatch = (ok: (x: Stage, y: Stage) => boolean, unique = false): void => {
    for (const sb of b) {
      if (matchOf.has(sb)) continue;
      const left = a.filter((sa) => !used.has(sa) && ok(sa, sb));
      if (left.length === 0) continue;
      if (unique) {
        const rivals = b.filter((y) => !matchOf.has(y) && ok(left[0]!, y));
        if (left.length !== 1 || rivals.length !== 1) continue;
      }
      matchOf.set(sb, left[0]!);
      used.add(left[0]!);
    }
  };
  tryMatch((x, y) => x.key === y.key);
  tryMatch((x, y) => x.kind === y.kind && x.name.trim().toLowerCase() === y.name.trim().toLowerCase());
  tryMatch((x, y) => x.kind === y.kind, true);
  const keys = new Set(b.map((s) => s.key));
  return [
    ...b.map((sb) => ({ key: sb.key, a: matchOf.get(sb), b: sb })),
    // A stage only the earlier revision had keeps its key unless the later one uses it for another stage.
    ...a.filter((sa) => !used.has(sa)).map((sa) => ({ key: keys.has(sa.key) ? `${sa.key}~before` : sa.key, a: sa })),
  ];
}

function stages(a: EstimateResult, b: EstimateResult): StageChange[] {
  return pairStages(a.stages, b.stages).map(({ key, a: sa, b: sb }) => {
    const hoursA = sa?.labourHours ?? 0;
    const hoursB = sb?.labourHours ?? 0;
    const coats = { before: sa?.coats ?? 0, after: sb?.coats ?? 0 };
    const sessions = { before: sa?.sessions ?? 0, after: sb?.sessions ?? 0 };
    const renamed = sa !== undefined && sb !== undefined && sa.name !== sb.name;
    const changed = hoursA !== hoursB || coats.before !== coats.after || sessions.before !== sessions.after || renamed;
    return {
      key,
      stageKind: (sb ?? sa)!.kind,
      name: (sb ?? sa)!.name,
      nameBefore: renamed ? sa.name : null,
      kind: kindOf(sa !== undefined, sb !== undefined, changed),
      coats,
      sessions,
      hours: { before: hoursA, after: hoursB, delta: round(hoursB - hoursA) },
    };
  });
}

function materials(a: EstimateResult, b: EstimateResult): MaterialChange[] {
  return keyedUnion(a.materials, b.materials, (m) => m.key).map(({ key, a: ma, b: mb }) => {
    const needA = ma?.need ?? 0;
    const needB = mb?.need ?? 0;
    const charge = moneyChange(key, 'Charge', ma?.charge ?? null, mb?.charge ?? null);
    const m = (mb ?? ma)!;
    return {
      key,
      name: m.name,
      unit: m.unit,
      kind: kindOf(ma !== undefined, mb !== undefined, needA !== needB || !money(charge.delta).isZero()),
      need: { before: ma ? needA : null, after: mb ? needB : null, delta: round(needB - needA) },
      charge,
    };
  });
}

/** Short names for the price lines whose wording carries each revision's own figures (hours, rate, percentage). */
const LINE_NAMES: Readonly<Record<string, string>> = {
  labour: 'Labour',
  overhead: 'Workshop overhead',
  margin: 'Margin',
  discount: 'Discount',
  rounding: 'Rounding',
};

function price(a: EstimateResult, b: EstimateResult): MoneyChange[] {
  const lines = keyedUnion(a.price.lines, b.price.lines, (l) => l.code).map(({ key, a: la, b: lb }) =>
    moneyChange(key, LINE_NAMES[key] ?? (lb ?? la)!.label, la?.amount ?? null, lb?.amount ?? null, { before: la?.label ?? null, after: lb?.label ?? null }),
  );
  return [
    ...lines,
    moneyChange('net', 'Net', a.price.net, b.price.net),
    moneyChange('tax', 'Tax', a.price.tax, b.price.tax),
    moneyChange('total', 'Total', a.price.total, b.price.total),
    moneyChange('deposit', 'Deposit', a.price.deposit, b.price.deposit),
  ];
}

/**
 * Compares two revisions of an estimate: `a` is the earlier (before), `b` the later (after).
 *
 * @example
 * const diff = compareRevisions(rev1, rev2);
 * diff.inputs   // [{ path: 'piece.dimensions.length', label: 'Piece › dimensions › length', kind: 'changed', before: '190 cm', after: '200 cm' }]
 * diff.totals   // [{ key: 'labourHours', label: 'Labour', unit: 'h', before: 70.2, after: 73.9, delta: 3.7 }, ...]
 */
export function compareRevisions(a: ComparableRevision, b: ComparableRevision): RevisionComparison {
  const inputs = diffInputs(a.input as Json, b.input as Json);
  const t = totals(a.result, b.result);
  const s = stages(a.result, b.result);
  const m = materials(a.result, b.result);
  const p = price(a.result, b.result);
  const unchanged =
    inputs.length === 0 &&
    t.every((x) => x.delta === 0) &&
    s.every((x) => x.kind === 'same') &&
    m.every((x) => x.kind === 'same') &&
    p.every((x) => money(x.delta).isZero());
  return { from: a.number, to: b.number, inputs, totals: t, stages: s, materials: m, price: p, currency: b.result.price.currency, same: unchanged };
}
