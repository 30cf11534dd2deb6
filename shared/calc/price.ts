/**
 * The price: materials at cost plus markup, labour at rate, overhead, margin, discount, tax, rounding and
 * deposit. Decimal money throughout; every line is in cents and the lines add up to the total exactly.
 */
import { formatAmount, money, percentOf, roundToStep, sumMoney, toCents } from '../money';
import type { Money } from '../money';
import type { Pricing } from '../schemas/catalog';

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
