import { describe, expect, it } from 'vitest';
import { choosePacks } from '../../../shared/calc/packs';
import type { Pack } from '../../../shared/schemas/catalog';

/** Every combination with up to ceil(need/size)+1 of each pack: the reference answer. */
function bruteForce(need: number, packs: readonly Pack[]): { cents: number; count: number; leftover: number } {
  const limits = packs.map((p) => Math.ceil(need / p.size) + 1);
  let best = { cents: Infinity, count: Infinity, leftover: Infinity };
  const counts = packs.map(() => 0);
  const visit = (i: number): void => {
    if (i === packs.length) {
      const size = counts.reduce((t, c, j) => t + c * (packs[j] as Pack).size, 0);
      if (size < need) return;
      const cents = counts.reduce((t, c, j) => t + c * Math.round(Number((packs[j] as Pack).price) * 100), 0);
      const count = counts.reduce((t, c) => t + c, 0);
      const leftover = size - need;
      if (cents < best.cents || (cents === best.cents && (count < best.count || (count === best.count && leftover < best.leftover)))) {
        best = { cents, count, leftover };
      }
      return;
    }
    for (let c = 0; c <= (limits[i] as number); c++) {
      counts[i] = c;
      visit(i + 1);
    }
    counts[i] = 0;
  };
  visit(0);
  return best;
}

/** A small deterministic pseudo-random generator (mulberry32). */
function rng(seed: number): () => number {
  let a = seed;
  return () => {
    a = (a + 0x6d2b79f5) | 0;
    let t = Math.imul(a ^ (a >>> 15), 1 | a);
    t = (t + Math.imul(t ^ (t >>> 7), 61 | t)) ^ t;
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

describe('choosePacks', () => {
  it('buys 1000 + 500 (11.00) rather than 3 × 500 (12.00) for 1200', () => {
    const c = choosePacks(1200, [{ size: 500, price: '4.00' }, { size: 1000, price: '7.00' }]);
    expect(c.cost).toBe('11.00');
    expect(c.packs).toEqual([{ size: 1000, price: '7.00', count: 1 }, { size: 500, price: '4.00', count: 1 }]);
    expect(c.bought).toBe(1500);
    expect(c.leftover).toBe(300);
  });

  it('prefers fewer packs at the same price, then less left over', () => {
    // 2 × 250 at 5.00 each = 10.00 = 1 × 500 at 10.00: one pack wins.
    expect(choosePacks(400, [{ size: 250, price: '5.00' }, { size: 500, price: '10.00' }]).packs).toEqual([{ size: 500, price: '10.00', count: 1 }]);
    // 1 × 600 and 1 × 500 both cost 6.00 and are one pack each: the 500 leaves less over.
    expect(choosePacks(450, [{ size: 600, price: '6.00' }, { size: 500, price: '6.00' }]).packs).toEqual([{ size: 500, price: '6.00', count: 1 }]);
  });

  it('needs nothing for a need of zero', () => {
    expect(choosePacks(0, [{ size: 500, price: '4.00' }])).toEqual({ need: 0, packs: [], bought: 0, leftover: 0, cost: '0.00' });
  });

  it('handles fractional pack sizes', () => {
    const c = choosePacks(1.2, [{ size: 0.5, price: '3.00' }, { size: 2.5, price: '9.00' }]);
    expect(c.cost).toBe('9.00');
    expect(c.bought).toBe(2.5);
  });

  it('is optimal against brute force on 300 small random cases', () => {
    const random = rng(20250303);
    for (let i = 0; i < 300; i++) {
      const n = 1 + Math.floor(random() * 3);
      const packs: Pack[] = Array.from({ length: n }, () => ({
        size: 50 * (1 + Math.floor(random() * 20)),
        price: (1 + Math.floor(random() * 3000) / 100).toFixed(2),
      }));
      const need = 1 + Math.floor(random() * 2500);
      const got = choosePacks(need, packs);
      const want = bruteForce(need, packs);
      const cents = Math.round(Number(got.cost) * 100);
      expect({ cents, count: got.packs.reduce((t, p) => t + p.count, 0), leftover: got.leftover }).toEqual(want);
      expect(got.bought).toBeGreaterThanOrEqual(need);
    }
  });

  it('copes with very large needs quickly and still covers them', () => {
    const t = performance.now();
    const c = choosePacks(123_456_789, [{ size: 3, price: '1.00' }, { size: 7, price: '2.10' }]);
    expect(performance.now() - t).toBeLessThan(500);
    expect(c.bought).toBeGreaterThanOrEqual(123_456_789);
    expect(c.leftover).toBeLessThan(7);
  });
});
