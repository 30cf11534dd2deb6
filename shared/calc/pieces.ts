/**
 * Things bought and used by the piece (abrasive sheets, cloths, pads): counted in whole pieces. A stage that uses
 * 2.3 sheets opens 3; fractions stay only for what is measured by weight or volume.
 */

/** Material units counted in whole pieces. */
export const PIECE_UNITS: ReadonlySet<string> = new Set(['sheet', 'each']);

/**
 * A stage's quantity of a material in its unit: whole pieces rounded up for piece units (after dropping binary noise
 * below a millionth, so 3.0000000001 sheets is 3), unchanged otherwise.
 *
 * @example wholeForUnit(2.3, 'sheet') // 3
 * @example wholeForUnit(2.3, 'mL') // 2.3
 */
export function wholeForUnit(quantity: number, unit: string): number {
  if (!PIECE_UNITS.has(unit) || quantity <= 0) return quantity;
  return Math.ceil(Math.round(quantity * 1e6) / 1e6);
}

/**
 * The share of a stage's quantity that falls on its k-th session (1-based) of n: whole pieces for piece units,
 * laid as early as possible so the shares add up exactly to the stage's whole quantity; an even share otherwise.
 *
 * @example [1, 2, 3].map((k) => sessionShare(4, 'sheet', 3, k)) // [2, 1, 1]
 */
export function sessionShare(quantity: number, unit: string, sessions: number, k: number): number {
  if (sessions <= 0) return 0;
  if (!PIECE_UNITS.has(unit)) return quantity / sessions;
  const whole = wholeForUnit(quantity, unit);
  return Math.ceil((whole * k) / sessions) - Math.ceil((whole * (k - 1)) / sessions);
}
