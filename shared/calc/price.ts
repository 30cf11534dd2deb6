/**
 * The price: materials at cost plus markup, labour at rate, overhead, margin, discount, tax, rounding and
 * deposit. Decimal money throughout; every line is in cents and the lines add up to the total exactly.
 */
import { formatAmount, money, percentOf, roundToStep, sumMoney, toCents } from '../money';
import type { Money } from '../money';
import type { Pricing } from '../schemas/catalog';
import { centsText, exactDecimal, mulDivHalfUp } from './cents';

/** What the price is built from. */
export interface PriceInput {
  /** Cost of materials as charged (whole packs or used quantity, per the setting), before markup. */
  materialsCost: Money;
  labourHours: number;
  labourCost: Money;
  perHour: string;
  discountPct: number;
  pricing: Pricing;
}

/** A line of the breakdown. */
export interface PriceLineOut {
  code: 'materials' | 'labour' | 'overhead' | 'margin' | 'discount' | 'tax' | 'rounding';
  label: string;
  amount: string;
}

/** The priced breakdown. */
export interface PriceBreakdown {
  currency: string;
  lines: PriceLineOut[];
  net: string;
  tax: string;
  total: string;
  deposit: string;
  balance: string;
  internal: { materialsCost: string; labourCost: string; materialsMarkup: string };
}

function pctLabel(pct: number): string {
  return `${Number(pct.toFixed(2))} %`;
}

/**
 * Builds the price. Lines in order: materials (with markup), labour, overhead (% of materials and labour),
 * margin (% of all that), discount, tax (% of the net), rounding to the step. Each line is rounded to the cent
 * before it is added, so the lines always sum to the total.
 *
 * @example priceEstimate({ materialsCost: money('100'), labourHours: 10, labourCost: money('420'), perHour: '42.00', discountPct: 0, pricing }).total
 */
export function priceEstimate(p: PriceInput): PriceBreakdown {
  const s = p.pricing;
  const materialsCharge = toCents(p.materialsCost.plus(percentOf(p.materialsCost, s.markupPct)));
  const labour = toCents(p.labourCost);
  const overhead = toCents(percentOf(materialsCharge.plus(labour), s.overheadPct));
  const margin = toCents(percentOf(materialsCharge.plus(labour).plus(overhead), s.marginPct));
  const beforeDiscount = sumMoney([materialsCharge, labour, overhead, margin]);
  const discount = toCents(percentOf(beforeDiscount, p.discountPct)).negated();
  const net = beforeDiscount.plus(discount);
  const tax = toCents(percentOf(net, s.taxPct));
  const gross = net.plus(tax);
  const total = roundToStep(gross, s.roundTo);
  const rounding = total.minus(gross);

  const lines: PriceLineOut[] = [
    { code: 'materials', label: 'Materials', amount: formatAmount(materialsCharge) },
    { code: 'labour', label: `Labour, ${p.labourHours.toFixed(2)} h at ${p.perHour} per hour`, amount: formatAmount(labour) },
    { code: 'overhead', label: `Workshop overhead (${pctLabel(s.overheadPct)})`, amount: formatAmount(overhead) },
    { code: 'margin', label: `Margin (${pctLabel(s.marginPct)})`, amount: formatAmount(margin) },
  ];
  if (!discount.isZero()) lines.push({ code: 'discount', label: `Discount (${pctLabel(p.discountPct)})`, amount: formatAmount(discount) });
  lines.push({ code: 'tax', label: `${s.taxLabel} (${pctLabel(s.taxPct)})`, amount: formatAmount(tax) });
  if (!rounding.isZero()) lines.push({ code: 'rounding', label: `Rounding to ${s.roundTo}`, amount: formatAmount(rounding) });

  const deposit = toCents(percentOf(total, s.depositPct));
  return {
    currency: s.currency,
    lines,
    net: formatAmount(net),
    tax: formatAmount(tax),
    total: formatAmount(total),
    deposit: formatAmount(deposit),
    balance: formatAmount(total.minus(deposit)),
    internal: {
      materialsCost: formatAmount(p.materialsCost),
      labourCost: formatAmount(labour),
      materialsMarkup: formatAmount(materialsCharge.minus(toCents(p.materialsCost))),
    },
  };
}

/**
 * Cost of the quantity used, pro rata to the packs bought.
 *
 * @example usedCost('11.00', 1500, 1200).toFixed(2) // "8.80"
 */
export function usedCost(packsCost: string, bought: number, need: number): Money {
  if (bought <= 0) return money(0);
  return toCents(money(packsCost).times(money(need.toFixed(6))).dividedBy(money(bought.toFixed(6))));
}

/** What {@link priceFromCents} builds the price from: the same as {@link PriceInput}, the costs in whole cents. */
export interface CentsPriceInput {
  materialsCents: number;
  labourHours: number;
  labourCents: number;
  perHour: string;
  discountPct: number;
  pricing: Pricing;
}

/** A percentage as decimal money reads it (from its shortest text), as an integer over a power of ten; null if not plain. */
function pctOf(pct: number): { n: number; scale: number } | null {
  return pct >= 0 ? exactDecimal(String(pct)) : null;
}

/** amount × pct % to the cent, half up (amount ≥ 0), as toCents(percentOf(amount, pct)) gives it; null if unsafe. */
function pctCents(cents: number, pct: { n: number; scale: number }): number | null {
  return mulDivHalfUp(cents, pct.n, 100 * pct.scale);
}

/**
 * {@link priceEstimate} worked in whole cents held in safe integers: the same lines, figures and texts, without
 * decimal objects. Answers null wherever it cannot be sure of giving exactly what the decimal working gives (a
 * percentage or step that is not a short decimal, a step finer than a cent, figures past the safe integers); the
 * caller then uses priceEstimate. tests/unit/calc/price-cents.test.ts checks the equality by property.
 */
export function priceFromCents(p: CentsPriceInput): PriceBreakdown | null {
  const s = p.pricing;
  const markup = pctOf(s.markupPct);
  const overheadPct = pctOf(s.overheadPct);
  const marginPct = pctOf(s.marginPct);
  const discountPct = pctOf(p.discountPct);
  const taxPct = pctOf(s.taxPct);
  const depositPct = pctOf(s.depositPct);
  const stepText = exactDecimal(s.roundTo);
  if (!markup || !overheadPct || !marginPct || !discountPct || !taxPct || !depositPct || !stepText || stepText.scale > 100) return null;
  // The step in whole cents (a step finer than a cent is left to the decimal working).
  const step = stepText.n * (100 / stepText.scale);
  if (!Number.isSafeInteger(step) || step <= 0) return null;
  const m = p.materialsCents;
  const labour = p.labourCents;
  if (!Number.isSafeInteger(m) || m < 0 || !Number.isSafeInteger(labour) || labour < 0) return null;
  // The materials' cost plus its markup is one decimal sum before it is taken to the cent: exact in decimal money
  // only while the sum, as an integer over the markup's denominator, is a safe integer.
  if (!Number.isSafeInteger(m * 100 * markup.scale + m * markup.n)) return null;

  // materials + markup: m + m × pct ÷ 100, to the cent (the cost is whole cents already).
  const markupCents = pctCents(m, markup);
  if (markupCents === null) return null;
  // toCents(m + m·p/100·scale) = m + round(m·p/(100·scale)) since m is whole cents.
  const materialsCharge = m + markupCents;
  const overhead = pctCents(materialsCharge + labour, overheadPct);
  if (overhead === null) return null;
  const margin = pctCents(materialsCharge + labour + overhead, marginPct);
  if (margin === null) return null;
  const beforeDiscount = materialsCharge + labour + overhead + margin;
  const discountCents = pctCents(beforeDiscount, discountPct);
  if (discountCents === null) return null;
  const net = beforeDiscount - discountCents;
  const tax = pctCents(net, taxPct);
  if (tax === null) return null;
  const gross = net + tax;
  // roundToStep: gross ÷ step to a whole number, half up, times the step.
  const steps = mulDivHalfUp(gross, 1, step);
  if (steps === null) return null;
  const total = steps * step;
  if (!Number.isSafeInteger(total)) return null;
  const rounding = total - gross;
  const deposit = pctCents(total, depositPct);
  if (deposit === null) return null;

  const lines: PriceLineOut[] = [
    { code: 'materials', label: 'Materials', amount: centsText(materialsCharge) },
    { code: 'labour', label: `Labour, ${p.labourHours.toFixed(2)} h at ${p.perHour} per hour`, amount: centsText(labour) },
    { code: 'overhead', label: `Workshop overhead (${pctLabel(s.overheadPct)})`, amount: centsText(overhead) },
    { code: 'margin', label: `Margin (${pctLabel(s.marginPct)})`, amount: centsText(margin) },
  ];
  if (discountCents !== 0) lines.push({ code: 'discount', label: `Discount (${pctLabel(p.discountPct)})`, amount: centsText(-discountCents) });
  lines.push({ code: 'tax', label: `${s.taxLabel} (${pctLabel(s.taxPct)})`, amount: centsText(tax) });
  if (rounding !== 0) lines.push({ code: 'rounding', label: `Rounding to ${s.roundTo}`, amount: centsText(rounding) });

  return {
    currency: s.currency,
    lines,
    net: centsText(net),
    tax: centsText(tax),
    total: centsText(total),
    deposit: centsText(deposit),
    balance: centsText(total - deposit),
    internal: {
      materialsCost: centsText(m),
      labourCost: centsText(labour),
      materialsMarkup: centsText(materialsCharge - m),
    },
  };
}

/**
 * labourCost in whole cents: hours to a hundredth times the rate, to the cent, half up; null where the safe
 * integers cannot be sure (the caller then uses labourCost).
 */
export function labourCentsOf(hundredths: number, perHour: string): number | null {
  const rate = exactDecimal(perHour);
  if (!rate) return null;
  // hundredths/100 h × n/scale per hour = hundredths × n / scale cents.
  return mulDivHalfUp(hundredths, rate.n, rate.scale);
}
