/**
 * Packs: the cheapest combination of a material's pack sizes that covers a need, and what is left over.
 */
import { formatAmount, money, toMinorUnits } from '../money';
import type { Pack } from '../schemas/catalog';

/** How many of one pack size to buy. */
export interface PackCount {
  size: number;
  price: string;
  label?: string;
  count: number;
}

/** The chosen packs. */
export interface PackChoice {
  need: number;
  packs: PackCount[];
  bought: number;
  leftover: number;
  /** Total price of the packs, decimal string to the cent. */
  cost: string;
}

/** Above this many units (after dividing by the sizes' common divisor) the search first fills with the best-value pack. */
const EXACT_LIMIT = 200_000;

function decimals(x: number): number {
  const s = String(x);
  const dot = s.indexOf('.');
  return dot < 0 ? 0 : s.length - dot - 1;
}

function gcd(a: number, b: number): number {
  while (b) [a, b] = [b, a % b];
  return a;
}

interface PreparedPacks {
  sorted: ReadonlyArray<{ pack: Pack; minor: number }>;
  scale: number;
  g: number;
  sizes: readonly number[];
  prices: readonly number[];
  maxSize: number;
}

/** The sorted sizes and integer prices of a pack list, worked out once per list (the catalog's lists do not change in place). */
const prepared = new WeakMap<readonly Pack[], PreparedPacks>();

function prepare(packs: readonly Pack[]): PreparedPacks {
  let p = prepared.get(packs);
  if (p) return p;
  const sorted = packs
    .map((pack) => ({ pack, minor: toMinorUnits(pack.price) }))
    .sort((a, b) => b.pack.size - a.pack.size || a.minor - b.minor);
  const scale = 10 ** Math.min(6, Math.max(...sorted.map((x) => decimals(x.pack.size))));
  const intSizes = sorted.map((x) => Math.round(x.pack.size * scale));
  const g = intSizes.reduce(gcd);
  const sizes = intSizes.map((x) => x / g);
  p = { sorted, scale, g, sizes, prices: sorted.map((x) => x.minor), maxSize: Math.max(...sizes) };
  prepared.set(packs, p);
  return p;
}

/**
 * A non-negative whole number of ten-thousandths as an amount to the cent, rounded half up, as
 * formatAmount(money(minor).dividedBy(10_000)) gives it; null where plain integers cannot be trusted.
 */
function minorToAmount(minor: number): string | null {
  if (!Number.isSafeInteger(minor) || minor < 0) return null;
  const r = minor % 100;
  const cents = (minor - r) / 100 + (r >= 50 ? 1 : 0);
  const c = cents % 100;
  return `${(cents - c) / 100}.${c < 10 ? '0' : ''}${c}`;
}

/**
 * The cheapest packs covering `need` (in the material's unit). Exact by dynamic programming over multiples of the
 * sizes' greatest common divisor. Ties go to fewer packs, then to less left over, then to larger packs.
 *
 * @example choosePacks(1200, [{ size: 500, price: '4' }, { size: 1000, price: '7' }]).packs
 * // 1 × 1000 + 1 × 500 (cost 11), not 3 × 500 (cost 12)
 */
export function choosePacks(need: number, packs: readonly Pack[]): PackChoice {
  if (packs.length === 0) throw new Error('A material needs at least one pack size');
  const { sorted, scale, g, sizes, prices, maxSize } = prepare(packs);
  const clean = Math.round(Math.max(0, need) * 1e9) / 1e9;
  if (clean === 0) return { need: 0, packs: [], bought: 0, leftover: 0, cost: '0.00' };

  let target = Math.ceil((clean * scale) / g - 1e-9);

  // Very large needs: fill with the best-value pack until the rest fits the exact search.
  const counts = new Array<number>(sorted.length).fill(0);
  if (target + maxSize > EXACT_LIMIT) {
    let best = 0;
    for (let i = 1; i < sizes.length; i++) {
      if ((prices[i] as number) * (sizes[best] as number) < (prices[best] as number) * (sizes[i] as number)) best = i;
    }
    const bestSize = sizes[best] as number;
    const fill = Math.ceil((target + maxSize - EXACT_LIMIT / 2) / bestSize);
    counts[best] = fill;
    target -= fill * bestSize;
  }

  const span = Math.max(0, target) + maxSize;
  const cost = new Float64Array(span).fill(Infinity);
  const num = new Int32Array(span);
  const pick = new Int16Array(span).fill(-1);
  cost[0] = 0;
  for (let q = 1; q < span; q++) {
    for (let i = 0; i < sizes.length; i++) {
      const from = q - (sizes[i] as number);
      if (from < 0) continue;
      const c = (cost[from] as number) + (prices[i] as number);
      const n = (num[from] as number) + 1;
      if (c < (cost[q] as number) || (c === cost[q] && n < (num[q] as number))) {
        cost[q] = c;
        num[q] = n;
        pick[q] = i;
      }
    }
  }
  let bestQ = -1;
  for (let q = Math.max(0, target); q < span; q++) {
    if (cost[q] === Infinity) continue;
    if (bestQ < 0 || (cost[q] as number) < (cost[bestQ] as number) || (cost[q] === cost[bestQ] && (num[q] as number) < (num[bestQ] as number))) bestQ = q;
  }
  for (let q = bestQ; q > 0; q -= sizes[pick[q] as number] as number) counts[pick[q] as number] = (counts[pick[q] as number] as number) + 1;

  const chosen: PackCount[] = [];
  let minorTotal = 0;
  let bought = 0;
  sorted.forEach(({ pack, minor }, i) => {
    const count = counts[i] as number;
    if (count === 0) return;
    chosen.push({ size: pack.size, price: pack.price, ...(pack.label === undefined ? {} : { label: pack.label }), count });
    minorTotal += minor * count;
    bought += pack.size * count;
  });
  bought = Math.round(bought * scale) / scale;
  // Prices are whole ten-thousandths, so the integer sum is exact; one division turns it into money.
  const totalCost = minorToAmount(minorTotal) ?? formatAmount(money(minorTotal).dividedBy(10_000));
  return { need: clean, packs: chosen, bought, leftover: Math.round((bought - clean) * 1e9) / 1e9, cost: totalCost };
}
