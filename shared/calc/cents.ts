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

// ------------------------------------------------------------------------------------------ safe-integer cents
//
// The price is worked below in whole cents held in ordinary numbers. Every value is a quotient of safe integers
// (below 2⁵³ ≈ 9.007 × 10¹⁵). Decimal money works to 20 significant digits, so a product or sum of such integers is
// exact in it too, and a quotient a ÷ b rounded to 20 digits stays on the same side of every half cent (it is at
// least 1 ÷ 2b from one, the rounding moves it by at most a ÷ b × 5 × 10⁻²⁰, far less while a < 10¹⁹): rounding
// the exact quotient half up gives what the decimal working gives. Wherever a value would leave the safe integers,
// or a figure cannot be read as a short decimal, these helpers answer null and the decimal working is used.

const DECIMAL_TEXT = /^(\d+)(?:\.(\d+))?$/;
const POW10 = [1, 10, 100, 1000, 1e4, 1e5, 1e6, 1e7, 1e8, 1e9, 1e10, 1e11, 1e12, 1e13, 1e14, 1e15];

/** A non-negative exact decimal as an integer over a power of ten: "12.5" → { n: 125, scale: 10 }; null otherwise. */
export function exactDecimal(text: string): { n: number; scale: number } | null {
  const m = DECIMAL_TEXT.exec(text);
  if (!m) return null;
  const frac = m[2] ?? '';
  if (frac.length >= POW10.length) return null;
  const n = Number(`${m[1]}${frac}`);
  if (!Number.isSafeInteger(n)) return null;
  return { n, scale: POW10[frac.length] as number };
}

/** a × b ÷ d rounded half up, for non-negative safe integers; null if a × b is not a safe integer. */
export function mulDivHalfUp(a: number, b: number, d: number): number | null {
  const p = a * b;
  if (!Number.isSafeInteger(p) || !(d > 0)) return null;
  const r = p % d;
  return (p - r) / d + (2 * r >= d ? 1 : 0);
}

/** "12.34" as 1234 (a safe integer); null for anything else. */
export function centsOf(amount: string): number | null {
  const m = AMOUNT.exec(amount);
  if (!m) return null;
  const c = Number(`${m[1]}${m[2]}`);
  return Number.isSafeInteger(c) ? c : null;
}

/** Whole cents (a safe integer, any sign) as an amount to the cent, as Decimal's toFixed(2) writes it. */
export function centsText(cents: number): string {
  const neg = cents < 0;
  const a = neg ? -cents : cents;
  const c = a % 100;
  return `${neg ? '-' : ''}${(a - c) / 100}.${c < 10 ? '0' : ''}${c}`;
}

/**
 * usedCents with safe integers: packsCost × need.toFixed(6) ÷ bought.toFixed(6) to the cent, half up, or null
 * where the product leaves the safe integers (then {@link usedCents} or decimal money answers).
 */
export function usedCentsNumber(packsCents: number, bought: number, need: number): number | null {
  if (!(bought > 0) || !(need >= 0)) return null;
  const n = FIXED6.exec(need.toFixed(6));
  const b = FIXED6.exec(bought.toFixed(6));
  if (!n || !b) return null;
  const N = Number(`${n[1]}${n[2]}`);
  const B = Number(`${b[1]}${b[2]}`);
  if (B === 0 || !Number.isSafeInteger(N) || !Number.isSafeInteger(B)) return null;
  return mulDivHalfUp(packsCents, N, B);
}

/**
 * roundHours (to a hundredth of an hour, after dropping noise below a billionth, both half up in decimal) as whole
 * hundredths; null where the number's decimal text is not plain digits or the figures leave the safe integers.
 */
export function hundredthsOfHours(hours: number): number | null {
  const d = hours >= 0 ? exactDecimalDigits(String(hours)) : null;
  if (!d) return null;
  // To 9 decimals, half up: the digits past the ninth decide.
  const { whole, frac } = d;
  const nine = frac.padEnd(9, '0').slice(0, 9);
  let billionths = Number(`${whole}${nine}`);
  if (!Number.isSafeInteger(billionths)) return null;
  if (frac.length > 9 && frac.charCodeAt(9) >= 53 /* '5' */) billionths += 1;
  const r = billionths % 10_000_000;
  return (billionths - r) / 10_000_000 + (r >= 5_000_000 ? 1 : 0);
}

function exactDecimalDigits(text: string): { whole: string; frac: string } | null {
  const m = DECIMAL_TEXT.exec(text);
  return m ? { whole: m[1] as string, frac: m[2] ?? '' } : null;
}
