import { describe, expect, it } from 'vitest';
import { estimate } from '../../shared/calc';
import { templateParts } from '../../shared/calc/templates';
import { compareRevisions, type ComparableRevision } from '../../shared/compare';
import { money } from '../../shared/money';
import type { EstimateInput } from '../../shared/schemas/calc';
import { DEMO_CATALOG } from '../fixtures/catalog';

const GRAND: EstimateInput = { piece: { template: 'grand', dimensions: { length: '190 cm' } }, system: 'full-repolish', startDate: '2026-03-02' };

function revision(number: number, input: EstimateInput): ComparableRevision {
  return { number, input, result: estimate(input, DEMO_CATALOG) };
}

function deepFreeze<T>(value: T): T {
  if (value && typeof value === 'object') {
    Object.freeze(value);
    for (const v of Object.values(value)) deepFreeze(v);
  }
  return value;
}

describe('compareRevisions', () => {
  it('reports nothing changed for two revisions with the same input', () => {
    const diff = compareRevisions(revision(1, GRAND), revision(2, structuredClone(GRAND)));
    expect(diff.same).toBe(true);
    expect(diff.inputs).toEqual([]);
    expect(diff.totals.every((t) => t.delta === 0)).toBe(true);
    expect(diff.from).toBe(1);
    expect(diff.to).toBe(2);
  });

  it('names a changed dimension with its before and after text', () => {
    const longer: EstimateInput = { ...GRAND, piece: { template: 'grand', dimensions: { length: '210 cm' } } };
    const diff = compareRevisions(revision(1, GRAND), revision(2, longer));
    expect(diff.same).toBe(false);
    expect(diff.inputs).toEqual([
      { path: 'piece.dimensions.length', label: 'Piece › dimensions › length', kind: 'changed', before: '190 cm', after: '210 cm' },
    ]);
  });

  it('a longer grand costs more hours, more material and more money, with deltas after − before', () => {
    const longer: EstimateInput = { ...GRAND, piece: { template: 'grand', dimensions: { length: '210 cm' } } };
    const a = revision(1, GRAND);
    const b = revision(2, longer);
    const diff = compareRevisions(a, b);
    const hours = diff.totals.find((t) => t.key === 'labourHours')!;
    expect(hours.unit).toBe('h');
    expect(hours.before).toBe(a.result.totals.labourHours);
    expect(hours.after).toBe(b.result.totals.labourHours);
    expect(hours.delta).toBeGreaterThan(0);
    expect(hours.delta).toBeCloseTo(hours.after - hours.before, 3);
    const flakes = diff.materials.find((m) => m.key === 'shellac-flakes')!;
    expect(flakes.need.delta).toBeGreaterThan(0);
    const total = diff.price.find((p) => p.key === 'total')!;
    expect(total.before).toBe(a.result.price.total);
    expect(total.after).toBe(b.result.price.total);
    expect(total.delta).toBe(money(b.result.price.total).minus(a.result.price.total).toFixed(2));
    expect(diff.currency).toBe('GBP');
  });

  it('gives money deltas as two-decimal strings, negative when the price falls', () => {
    const discounted: EstimateInput = { ...GRAND, discountPct: 10 };
    const diff = compareRevisions(revision(1, GRAND), revision(2, discounted));
    const total = diff.price.find((p) => p.key === 'total')!;
    expect(total.delta).toMatch(/^-\d+\.\d{2}$/);
    expect(diff.inputs).toEqual([{ path: 'discountPct', label: 'Discount (%)', kind: 'added', before: null, after: '10' }]);
  });

  it('matches parts by id, so one changed part is one change, and names the part', () => {
    const parts = templateParts('grand', { length: '190 cm' });
    const edited = parts.map((p) => (p.id === 'legs' ? { ...p, count: 4 } : p));
    const a = revision(1, { ...GRAND, piece: { parts } });
    const b = revision(2, { ...GRAND, piece: { parts: edited } });
    const diff = compareRevisions(a, b);
    expect(diff.inputs).toEqual([{ path: 'piece.parts.legs.count', label: 'Piece › parts › Legs › count', kind: 'changed', before: '3', after: '4' }]);
  });

  it('reports an added or a removed part once, by name, not field by field', () => {
    const parts = templateParts('grand', { length: '190 cm' });
    const stool = { id: 'stool', name: 'Piano stool', shape: { kind: 'rectangle' as const, length: '50 cm', width: '35 cm' } };
    const a = revision(1, { ...GRAND, piece: { parts } });
    const b = revision(2, { ...GRAND, piece: { parts: [...parts.filter((p) => p.id !== 'lyre'), stool] } });
    const diff = compareRevisions(a, b);
    expect(diff.inputs).toEqual([
      { path: 'piece.parts.stool', label: 'Piece › parts › Piano stool', kind: 'added', before: null, after: 'Piano stool' },
      { path: 'piece.parts.lyre', label: 'Piece › parts › Lyre', kind: 'removed', before: 'Lyre', after: null },
    ]);
  });

  it('summarises a reshaped outline instead of listing every point', () => {
    const small = templateParts('grand', { length: '190 cm' });
    const large = templateParts('grand', { length: '200 cm' });
    const diff = compareRevisions(revision(1, { ...GRAND, piece: { parts: small } }), revision(2, { ...GRAND, piece: { parts: large } }));
    const outline = diff.inputs.find((c) => c.path === 'piece.parts.lid-top.shape.points')!;
    expect(outline.before).toMatch(/^\d+ points$/);
    expect(outline.after).toMatch(/points, reshaped$/);
    expect(diff.inputs.filter((c) => c.path.includes('points'))).toHaveLength(2);
  });

  it('lists stages added or removed and the change of hours per stage', () => {
    const system = DEMO_CATALOG.systems.find((s) => s.key === 'full-repolish')!;
    const stages = system.stages.map((s) => ({ ...s }));
    const fewer = stages.map((s) => (s.kind === 'body' ? { ...s, sessions: s.sessions - 2 } : s));
    const diff = compareRevisions(revision(1, { ...GRAND, stages }), revision(2, { ...GRAND, stages: fewer }));
    const body = diff.stages.find((s) => s.key === 'body')!;
    expect(body.kind).toBe('changed');
    expect(body.sessions.after).toBe(body.sessions.before - 2);
    expect(body.hours.delta).toBeLessThan(0);
    expect(diff.stages.filter((s) => s.kind !== 'same').map((s) => s.key)).toContain('body');
    expect(diff.inputs.find((c) => c.path === 'stages.body.sessions')).toMatchObject({ label: 'Stages › Bodying with the rubber › sessions', kind: 'changed' });

    const noStrip = stages.filter((s) => s.kind !== 'strip');
    const removed = compareRevisions(revision(1, { ...GRAND, stages }), revision(2, { ...GRAND, stages: noStrip }));
    expect(removed.stages.find((s) => s.key === 'strip')).toMatchObject({ kind: 'removed', hours: { after: 0 } });
  });

  it('does not mutate its arguments', () => {
    const a = deepFreeze(revision(1, GRAND));
    const b = deepFreeze(revision(2, { ...GRAND, discountPct: 5 }));
    expect(() => compareRevisions(a, b)).not.toThrow();
  });

  it('matches stages by what they are, not by position: a stage put in front shifts nothing', () => {
    const system = DEMO_CATALOG.systems.find((s) => s.key === 'full-repolish')!;
    const stages = system.stages.map((s) => ({ ...s }));
    const extra = { ...stages.find((s) => s.kind === 'body')!, key: 'extra-body', name: 'A first bodying' };
    const before = revision(1, { ...GRAND, stages });
    const diff = compareRevisions(before, revision(2, { ...GRAND, stages: [extra, ...stages] }));
    const changed = diff.stages.filter((s) => s.kind !== 'same');
    expect(changed.map((s) => [s.key, s.kind])).toEqual([['extra-body', 'added']]);
    expect(diff.stages).toHaveLength(before.result.stages.length + 1);
  });

  it('a stage under a new key is the same stage when its kind and name agree, and a renamed one of a lone kind is paired too', () => {
    const system = DEMO_CATALOG.systems.find((s) => s.key === 'full-repolish')!;
    const stages = system.stages.map((s) => ({ ...s }));
    const rekeyed = stages.map((s) => ({ ...s, key: `my-${s.key}` }));
    const before = revision(1, { ...GRAND, stages });
    const diff = compareRevisions(before, revision(2, { ...GRAND, stages: rekeyed }));
    expect(diff.stages).toHaveLength(before.result.stages.length);
    expect(diff.stages.every((s) => s.kind === 'same')).toBe(true);

    const strip = stages.find((s) => s.kind === 'strip')!;
    const renamed = stages.map((s) => (s === strip ? { ...s, key: 'take-off', name: 'Taking off the old finish' } : s));
    const diff2 = compareRevisions(revision(1, { ...GRAND, stages }), revision(2, { ...GRAND, stages: renamed }));
    const paired = diff2.stages.find((s) => s.key === 'take-off')!;
    expect(paired).toMatchObject({ kind: 'changed', stageKind: 'strip', nameBefore: strip.name, name: 'Taking off the old finish' });
    expect(paired.hours.delta).toBe(0);
    expect(diff2.stages.some((s) => s.kind === 'added' || s.kind === 'removed')).toBe(false);
  });

  it('lists materials by name with their quantities and unit, and none on the side without them', () => {
    const system = DEMO_CATALOG.systems.find((s) => s.key === 'full-repolish')!;
    const stages = system.stages.map((s) => ({ ...s }));
    const noStrip = stages.filter((s) => s.kind !== 'strip');
    const a = revision(1, { ...GRAND, stages });
    const b = revision(2, { ...GRAND, stages: noStrip });
    const diff = compareRevisions(a, b);
    for (const m of diff.materials) {
      const known = [...a.result.materials, ...b.result.materials].find((x) => x.key === m.key)!;
      expect(m.name).toBe(known.name);
      expect(m.unit).toBe(known.unit);
    }
    const gone = diff.materials.filter((m) => m.kind === 'removed');
    expect(gone.length).toBeGreaterThan(0);
    for (const m of gone) {
      expect(m.need.after).toBeNull();
      expect(m.need.before).toBe(a.result.materials.find((x) => x.key === m.key)!.need);
      expect(m.need.delta).toBe(-m.need.before!);
    }
  });

  it('puts each revision\u2019s own labour line beside its own price', () => {
    const longer: EstimateInput = { ...GRAND, piece: { template: 'grand', dimensions: { length: '230 cm' } } };
    const a = revision(1, GRAND);
    const b = revision(2, longer);
    const labour = compareRevisions(a, b).price.find((p) => p.key === 'labour')!;
    const own = (r: ComparableRevision) => r.result.price.lines.find((l) => l.code === 'labour')!;
    expect(labour.label).toBe('Labour');
    expect(labour.labelBefore).toBe(own(a).label);
    expect(labour.before).toBe(own(a).amount);
    expect(labour.labelAfter).toBe(own(b).label);
    expect(labour.after).toBe(own(b).amount);
    expect(labour.labelBefore).not.toBe(labour.labelAfter);
  });
});
