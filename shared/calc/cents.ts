/**
 * Whole cents as integers, for the engine's hot path. Decimal money (shared/money) stays the reference: every
 * helper here gives exactly what the decimal working gives, and answers null where it cannot be sure, so the
 * caller falls back to the decimal working.
 */

const AMOUNT = /^(\d+)\.(\d{2})$/;

/** "12.34" as 1234n; null for anything else (negative, more or fewer decimals). */
export function parseCents(amount: string): bigint | null {
  const m = AMOUNT.exec(amount);
  return m ? BigInt(`${m[1]}${m[2]}`) : null;
}

/** 1234n as "12.34", as Decimal's toFixed(2) writes a non-negative amount. */
export function formatCents(cents: bigint): string {
  const s = cents.toString().padStart(3, '0');
  return `${s.slice(0, -2)}.${s.slice(-2)}`;
}

const FIXED6 = /^(\d+)\.(\d{6})$/;
const E17 = 10n ** 17n;
const E19 = 10n ** 19n;
const E20 = 10n ** 20n;

/**
 * usedCost(packsCost, bought, need) in whole cents: packsCost × need.toFixed(6) ÷ bought.toFixed(6), to the cent,
 * half up. Decimal divides to 20 significant digits before rounding to the cent; the exact quotient is used here,
 * and null is returned wherever that first rounding could matter (within 10⁻¹⁹ of the quotient of a half cent),
 * or the product would need more than 20 digits.
 */
export function usedCents(packsCents: bigint, bought: number, need: number): bigint | null {
  if (!(bought > 0) || !(need >= 0)) return null;
  const n = FIXED6.exec(need.toFixed(6));
  const b = FIXED6.exec(bought.toFixed(6));
  if (!n || !b) return null;
  const N = BigInt(`${n[1]}${n[2]}`);
  const B = BigInt(`${b[1]}${b[2]}`);
  if (B === 0n) return null;
  const CN = packsCents * N;
  if (CN >= E20) return null;
  const r = CN % B;
  const off = 2n * r - B;
  // An exact half cent has at most 19 digits here, so Decimal holds it exactly and rounds it up, as below.
  if (off === 0n && CN < E17) return (CN - r) / B + 1n;
  if ((off < 0n ? -off : off) * E19 <= CN) return null;
  return (CN - r) / B + (2n * r >= B ? 1n : 0n);
}
