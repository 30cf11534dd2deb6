/**
 * DEMO DATA — invented materials, suppliers, pack sizes and GBP prices, labour rates, pricing settings, working
 * week and finishing room for the demo workshop. None of it is a real supplier or a real price; the server's demo
 * loader seeds it and the tests use it through tests/fixtures/catalog.ts.
 */
import type { LabourRate, Material, Pricing, SafetySettings, WorkingCalendar } from '../../schemas/catalog';

/** Invented demo materials with packs and prices (GBP, before VAT). */
export const DEMO_MATERIALS: readonly Material[] = [
  {
    key: 'shellac-flakes', name: 'Shellac flakes, blonde dewaxed', kind: 'shellac', unit: 'g', supplier: 'Quillby Finishing Supplies',
    packs: [{ size: 250, price: '11.40' }, { size: 500, price: '19.80' }, { size: 1000, price: '34.50' }],
  },
  {
    key: 'spirit', name: 'Finishing spirit (methylated)', kind: 'spirit', unit: 'mL', supplier: 'Marrowhaze Trade Spirits',
    packs: [{ size: 1000, price: '6.20' }, { size: 2500, price: '12.90' }, { size: 5000, price: '22.50' }],
  },
  {
    key: 'pumice', name: 'Pumice powder, fine', kind: 'pumice', unit: 'g', supplier: 'Quillby Finishing Supplies',
    packs: [{ size: 250, price: '5.60' }, { size: 1000, price: '15.00' }],
  },
  {
    key: 'polishing-oil', name: 'Rubber oil, light', kind: 'oil', unit: 'mL', supplier: 'Quillby Finishing Supplies',
    packs: [{ size: 250, price: '4.80' }, { size: 500, price: '7.90' }],
  },
  {
    key: 'abrasive-sheet', name: 'Abrasive sheets, assorted fine grits', kind: 'abrasive', unit: 'sheet', supplier: 'Grindlewick Abrasives',
    packs: [{ size: 10, price: '7.50' }, { size: 50, price: '29.00' }],
  },
  {
    key: 'wax', name: 'Finishing wax, clear', kind: 'wax', unit: 'g', supplier: 'Quillby Finishing Supplies',
    packs: [{ size: 200, price: '9.20' }, { size: 400, price: '15.60' }],
  },
  {
    key: 'stripper', name: 'Finish stripper, gel', kind: 'stripper', unit: 'mL', supplier: 'Marrowhaze Trade Spirits',
    packs: [{ size: 1000, price: '16.40' }, { size: 5000, price: '58.00' }],
  },
  {
    key: 'wadding', name: 'Cotton wadding for rubbers', kind: 'wadding', unit: 'g', supplier: 'Thimbledown Textiles',
    packs: [{ size: 100, price: '3.10' }, { size: 500, price: '11.50' }],
  },
  {
    key: 'polishing-cloth', name: 'Lint-free cloth squares', kind: 'cloth', unit: 'each', supplier: 'Thimbledown Textiles',
    packs: [{ size: 5, price: '4.25' }, { size: 20, price: '13.60' }],
  },
  {
    key: 'spirit-stain', name: 'Spirit stain, brown', kind: 'stain', unit: 'mL', supplier: 'Quillby Finishing Supplies',
    packs: [{ size: 250, price: '8.90' }, { size: 1000, price: '26.00' }],
  },
  {
    key: 'burnishing-cream', name: 'Burnishing cream', kind: 'other', unit: 'mL', supplier: 'Grindlewick Abrasives',
    packs: [{ size: 250, price: '9.75' }, { size: 500, price: '16.80' }],
  },
  {
    key: 'reviver', name: 'Finish reviver', kind: 'other', unit: 'mL', supplier: 'Marrowhaze Trade Spirits',
    packs: [{ size: 250, price: '7.40' }, { size: 1000, price: '21.00' }],
  },
];

/** Invented demo labour rates (GBP per hour). */
export const DEMO_LABOUR_RATES: readonly LabourRate[] = [
  { key: 'polisher', name: 'French polisher', perHour: '42.00' },
  { key: 'apprentice', name: 'Apprentice', perHour: '24.00' },
];

/** Demo pricing settings: UK VAT 20 % (HMRC; the rate is a setting), the rest invented. */
export const DEMO_PRICING: Pricing = {
  currency: 'GBP',
  polisherRate: 'polisher',
  markupPct: 25,
  materialsCharge: 'whole-packs',
  overheadPct: 12,
  marginPct: 15,
  taxPct: 20,
  taxLabel: 'VAT',
  roundTo: '1',
  depositPct: 30,
  wastePct: 10,
  maxDiscountPct: 15,
};

/** Demo working week: Monday to Friday 08:00–17:00, Saturday morning; closed on three holidays. */
export const DEMO_CALENDAR: WorkingCalendar = {
  workingWeek: [
    { day: 'mon', open: '08:00', close: '17:00' },
    { day: 'tue', open: '08:00', close: '17:00' },
    { day: 'wed', open: '08:00', close: '17:00' },
    { day: 'thu', open: '08:00', close: '17:00' },
    { day: 'fri', open: '08:00', close: '17:00' },
    { day: 'sat', open: '08:00', close: '12:00' },
  ],
  closedDates: ['2025-12-25', '2025-12-26', '2026-01-01'],
};

/** Demo finishing room and spirit: 120 m³ with extraction at 6 air changes an hour; methylated spirit 95 % ethanol, 5 % methanol. */
export const DEMO_SAFETY: SafetySettings = {
  room: { volumeM3: 120, airChangesPerHour: 6 },
  mixingFactor: 3,
  spirit: { ethanol: 0.95, methanol: 0.05, isopropanol: 0 },
};
