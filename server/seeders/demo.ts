/**
 * The invented demo workshop: its details and settings, one user per role, the demo price list (invented
 * suppliers and prices, with an older price for history) and labour rates. Idempotent: a second run adds nothing
 * twice. Demo users exist only through this loader, which production runs only with SHELLWRIGHT_DEMO=1.
 * Demo addresses carry postcodes that cannot exist: their last two letters use C, I, K, M, O or V, letters the
 * postal service never puts there. Nothing in the demo data is tagged "(invented)": it would print on a customer's PDF.
 */
import Decimal from 'decimal.js';
import type { Sequelize } from 'sequelize';
import { DEMO_LABOUR_RATES, DEMO_MATERIALS, DEMO_PRICING, DEMO_SAFETY } from '@shared/calc/presets/demo-materials';
import type { Role } from '@shared/schemas/auth';
import type { WorkshopSettings } from '@shared/schemas/workshop';
import { LabourRate, Material, MaterialPack, PackPrice, User, Workshop } from '../models';
import { hashPassword } from '../services/users';
import { DEFAULT_SETTINGS } from './defaults';

export const DEMO_PASSWORD = 'shellwright-demo';

export const DEMO_USERS: { email: string; name: string; role: Role }[] = [
  { email: 'owner@example.com', name: 'Ottilie Marchbank', role: 'owner' },
  { email: 'estimator@example.com', name: 'Ewan Pellow', role: 'estimator' },
  { email: 'sales@example.com', name: 'Saskia Threlfall', role: 'sales' },
  { email: 'workshop@example.com', name: 'Wilf Oakeshott', role: 'workshop' },
];

export const DEMO_SETTINGS: WorkshopSettings = {
  ...DEFAULT_SETTINGS,
  pricing: DEMO_PRICING,
  calendar: {
    workingWeek: [
      { day: 'mon', open: '08:00', close: '16:30' },
      { day: 'tue', open: '08:00', close: '16:30' },
      { day: 'wed', open: '08:00', close: '16:30' },
      { day: 'thu', open: '08:00', close: '16:30' },
      { day: 'fri', open: '08:00', close: '15:00' },
    ],
    closedDates: ['2026-12-24', '2026-12-25', '2026-12-28', '2026-12-29', '2026-12-30', '2026-12-31', '2027-01-01', '2027-04-02', '2027-04-05'],
  },
  // The demo room has extraction good enough for a methylated spirit with some methanol in it.
  safety: { ...DEMO_SAFETY, room: { volumeM3: 120, airChangesPerHour: 16 } },
  dryingRoom: { mode: 'bays', bays: 4, rackAreaM2: 16, temperatureC: 20, humidityPct: 55 },
};

/** Demo prices took effect on this date; an older price a few percent lower shows history. */
const PRICE_DATE = '2026-09-01';
const OLD_PRICE_DATE = '2026-03-01';

async function demoPriceList(sequelize: Sequelize, priceFactor: number): Promise<void> {
  await sequelize.transaction(async (transaction) => {
    for (const m of DEMO_MATERIALS) {
      const [material] = await Material.findOrCreate({ where: { key: m.key }, defaults: { key: m.key, name: m.name, kind: m.kind, unit: m.unit }, transaction });
      for (const p of m.packs) {
        const [pack] = await MaterialPack.findOrCreate({
          where: { materialId: material.id, size: String(p.size) },
          defaults: { materialId: material.id, size: p.size, label: p.label ?? '', supplier: m.supplier, supplierCode: `${m.key}-${p.size}`.toUpperCase(), archived: false },
          transaction,
        });
        if (!pack.supplier) await pack.update({ supplier: m.supplier, supplierCode: `${m.key}-${p.size}`.toUpperCase() }, { transaction });
        const hasDemoPrice = await PackPrice.count({ where: { packId: pack.id, source: 'demo' }, transaction });
        if (hasDemoPrice) continue;
        const price = priceFactor === 1 ? new Decimal(p.price) : new Decimal(p.price).times(priceFactor).toDecimalPlaces(2);
        const old = price.times('0.92').toFixed(2);
        await PackPrice.create({ packId: pack.id, price: old, effectiveFrom: OLD_PRICE_DATE, userId: null, source: 'demo' }, { transaction });
        await PackPrice.create({ packId: pack.id, price: price.toFixed(2), effectiveFrom: PRICE_DATE, userId: null, source: 'demo' }, { transaction });
      }
    }
    for (const demoRate of DEMO_LABOUR_RATES) {
      const rate = { ...demoRate, perHour: new Decimal(demoRate.perHour).times(priceFactor).toDecimalPlaces(2).toFixed(2) };
      const [row, created] = await LabourRate.findOrCreate({ where: { key: rate.key }, defaults: { ...rate }, transaction });
      if (!created && Number(row.perHour) === 0) await row.update({ perHour: rate.perHour }, { transaction });
    }
  });
}

/** One invented demo workshop: its row, its people (one per role) and how its prices stand to the demo price list. */
export interface DemoWorkshop {
  name: string;
  email: string;
  phone: string;
  address: string;
  settings: WorkshopSettings;
  users: { email: string; name: string; role: Role }[];
  /** The demo price list and labour rates, times this (1 for the first workshop, as it always was). */
  priceFactor: number;
}

/** The users of a demo workshop, and its price list and labour rates; runs under that workshop. */
export async function loadDemo(sequelize: Sequelize, demo: Pick<DemoWorkshop, 'users' | 'priceFactor'>, log: (m: string) => void = () => {}): Promise<void> {
  const passwordHash = await hashPassword(DEMO_PASSWORD);
  await sequelize.transaction(async (transaction) => {
    // The seeder made the workshop this runs under; only its details are demo data.
    if (!(await Workshop.findOne({ transaction }))) throw new Error('the demo loads under a workshop');
    for (const user of demo.users) {
      const [, created] = await User.findOrCreate({
        where: { email: user.email },
        defaults: { ...user, passwordHash, lastLoginAt: null },
        transaction,
      });
      if (created) log(`user ${user.email} (${user.role}) created`);
    }
    // The demo's drying room was set up with the workshop (its settings above): the checklist counts it as reviewed.
    await sequelize.query('INSERT INTO workshop_setup (drying_room_saved_at, updated_at) VALUES (now(), now()) ON CONFLICT (workshop_id) DO NOTHING', { transaction });
  });
  await demoPriceList(sequelize, demo.priceFactor);
}

/** The first demo workshop's row (created by the seeder before anything else is loaded under it). */
export const DEMO_WORKSHOP: DemoWorkshop = {
  name: 'Larkspur Lane Polishing Workshop',
  email: 'hello@larkspur-polishing.example',
  phone: '01632 960 418',
  address: 'Unit 4, Tannery Yard\nLarkspur Lane\nMiddlecombe MC4 7KV',
  settings: DEMO_SETTINGS,
  users: DEMO_USERS,
  priceFactor: 1,
};

/**
 * The second demo workshop, so that two workshops on one service can be seen kept apart: a smaller piano room that
 * measures in feet and inches and prices differently (no VAT registration, a larger deposit), with its own people.
 */
export const DEMO_USERS_2: { email: string; name: string; role: Role }[] = [
  { email: 'owner@example.net', name: 'Perpetua Hollingdrake', role: 'owner' },
  { email: 'estimator@example.net', name: 'Caspian Wendlebury', role: 'estimator' },
  { email: 'sales@example.net', name: 'Lettice Moorcroft', role: 'sales' },
  { email: 'workshop@example.net', name: 'Absalom Tregarthen', role: 'workshop' },
];

export const DEMO_WORKSHOP_2: DemoWorkshop = {
  name: 'Quernstone Piano Finishers',
  email: 'workshop@quernstone-finishers.example',
  phone: '01632 961 207',
  address: 'The Coach House, Saddler\u2019s Court\nQuernstone Parva QP2 8OI',
  settings: {
    ...DEMO_SETTINGS,
    units: 'imperial',
    imperialVolumes: 'uk',
    defaultLengthUnit: 'in',
    pricing: { ...DEMO_PRICING, markupPct: 20, overheadPct: 10, marginPct: 12, taxPct: 0, taxLabel: 'Tax', depositPct: 40, maxDiscountPct: 10, roundTo: '5' },
    pricesIncludeTax: false,
    quoteValidityDays: 45,
    dryingRoom: { mode: 'bays', bays: 2, rackAreaM2: 8, temperatureC: 21, humidityPct: 50 },
  },
  users: DEMO_USERS_2,
  priceFactor: 1.08,
};

/** Every demo workshop, in the order they are made: the first keeps the lowest id. */
export const DEMO_WORKSHOPS: readonly DemoWorkshop[] = [DEMO_WORKSHOP, DEMO_WORKSHOP_2];
