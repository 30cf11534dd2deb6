/**
 * Labour: minutes of rubbing per part and stage, hours per stage, and their cost at the polisher's rate.
 */
import Decimal from 'decimal.js';
import { money, toCents } from '../money';
import type { Money, MoneyInput } from '../money';

/** What decides the labour one part takes in one stage. */
export interface LabourDemand {
  areaM2: number;
  minPerM2PerCoat: number;
  /** Coats over the whole stage (sessions × coats per session). */
  coats: number;
  /** Complexity labour factor. */
  complexityFactor: number;
  /** Veneer labour factor when the stage takes veneer care and the part is veneered, else 1. */
  veneerFactor: number;
}

/**
 * Minutes of work on one part in one stage: area × minutes per m² per coat × coats × factors.
 *
 * @example labourMinutes({ areaM2: 2, minPerM2PerCoat: 7, coats: 3, complexityFactor: 1.3, veneerFactor: 1 }) // 54.6
 */
export function labourMinutes(d: LabourDemand): number {
  return d.areaM2 * d.minPerM2PerCoat * d.coats * d.complexityFactor * d.veneerFactor;
}

/**
 * Hours a stage takes: the parts' minutes plus set-up for every session.
 *
 * @example stageHours(600, 15, 4) // 11
 */
export function stageHours(partMinutes: number, setupMinPerSession: number, sessions: number): number {
  return (partMinutes + setupMinPerSession * sessions) / 60;
}

/**
 * Cost of labour at an hourly rate, to the cent. Hours are taken to a hundredth of an hour first, as written on
 * the quote.
 *
 * @example labourCost(70.256, '42.00').toFixed(2) // "2950.92" (70.26 h × 42)
 */
export function labourCost(hours: number, perHour: MoneyInput): Money {
  return toCents(money(roundHours(hours).toFixed(2)).times(money(perHour)));
}

/**
 * Hours to a hundredth, half up, in decimal arithmetic: 1.005 h is 1.01 h (binary floating point would make it
 * 1.00, since 1.005 is stored as 1.00499999…). Noise below a billionth of an hour from summing minutes is dropped
 * first.
 *
 * @example roundHours(70.256) // 70.26
 * @example roundHours(1.005) // 1.01
 */
export function roundHours(hours: number): number {
  return new Decimal(hours).toDecimalPlaces(9, Decimal.ROUND_HALF_UP).toDecimalPlaces(2, Decimal.ROUND_HALF_UP).toNumber();
}
