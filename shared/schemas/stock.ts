/**
 * Stock, purchase orders and job costing: requests and responses. Quantities of stock are in the material's own
 * unit (g, mL, sheet, each); people enter them in packs, the units the workshop buys in. Money is a decimal string.
 */
import { z } from 'zod';
import { IdSchema } from './customers';
import { dateSchema } from './dates';

export const MOVEMENT_KINDS = ['use', 'receive', 'count', 'set'] as const;
export type MovementKind = (typeof MOVEMENT_KINDS)[number];
export const MOVEMENT_LABELS: Record<MovementKind, string> = { use: 'Used in a session', receive: 'Order received', count: 'Stock count', set: 'Set by hand' };

export const PURCHASE_ORDER_STATES = ['draft', 'sent', 'received', 'cancelled'] as const;
export type PurchaseOrderState = (typeof PURCHASE_ORDER_STATES)[number];
export const PURCHASE_ORDER_STATE_LABELS: Record<PurchaseOrderState, string> = { draft: 'Not sent', sent: 'Sent to supplier', received: 'Received', cancelled: 'Cancelled' };

const packCount = z.number({ message: 'must be a number of packs' }).min(0, { message: 'must be 0 or more' }).max(100_000, { message: 'must be at most 100000' });
/** A price of one pack: a decimal amount, up to four places. */
export const PackPriceSchema = z.string({ message: 'must be a decimal amount like "12.50"' }).regex(/^\d{1,8}(\.\d{1,4})?$/, { message: 'must be a decimal amount like "12.50"' });
const orderDate = dateSchema({ min: { daysFromToday: -366 }, max: { daysFromToday: 366 }, example: '2026-12-14' });

/** One material used in a session, in packs of one of its packs (a quarter of a 1 L tin is 0.25). */
export const MaterialUseSchema = z
  .object({ materialId: IdSchema, packId: IdSchema, packs: packCount })
  .strict();
export type MaterialUseInput = z.output<typeof MaterialUseSchema>;
export const MaterialsUsedSchema = z.array(MaterialUseSchema).max(60, { message: 'must list at most 60 materials' });

/** A stock count: what is on the shelf, in packs of one pack, and why it differs when it does. */
export const StockCountSchema = z
  .object({
    materialId: IdSchema,
    packId: IdSchema,
    counted: packCount,
    reason: z.string({ message: 'is required' }).trim().min(1, { message: 'is required: say why the shelf differs (spilt, dried out, miscounted)' }).max(500, { message: 'must be at most 500 characters' }),
  })
  .strict();
export type StockCountInput = z.output<typeof StockCountSchema>;

export const MovementsQuerySchema = z
  .object({
    materialId: IdSchema.optional(),
    kind: z.enum(MOVEMENT_KINDS).optional(),
    page: z.coerce.number().int().min(1).max(10_000).default(1),
    pageSize: z.coerce.number().int().min(1).max(200).default(50),
  })
  .strict();

export const LowStockQuerySchema = z.object({ weeks: z.coerce.number().int().min(1, { message: 'must be at least 1' }).max(26, { message: 'must be at most 26' }).default(4) }).strict();

export const OrdersFromForecastSchema = z.object({ weeks: z.number().int().min(1, { message: 'must be at least 1' }).max(26, { message: 'must be at most 26' }).default(4) }).strict();

export const OrderListQuerySchema = z
  .object({
    state: z.enum([...PURCHASE_ORDER_STATES, 'open', 'all']).default('all'),
    page: z.coerce.number().int().min(1).max(10_000).default(1),
    pageSize: z.coerce.number().int().min(1).max(100).default(25),
  })
  .strict();

export const SendOrderSchema = z
  .object({
    to: z.email({ message: 'must be an e-mail address' }),
    expectedOn: orderDate,
    message: z.string().trim().max(4000, { message: 'must be at most 4000 characters' }).default(''),
  })
  .strict();
export type SendOrderInput = z.output<typeof SendOrderSchema>;

export const ReceiveOrderSchema = z
  .object({
    receivedOn: orderDate,
    /** Record each price paid as the pack's new price from the day received. */
    recordPrices: z.boolean().default(true),
    lines: z
      .array(z.object({ lineId: IdSchema, packs: z.number({ message: 'must be a number of packs' }).int({ message: 'must be whole packs' }).min(0).max(100_000), paidPrice: PackPriceSchema.optional() }).strict())
      .min(1, { message: 'must list what came in' })
      .max(200),
  })
  .strict();
export type ReceiveOrderInput = z.output<typeof ReceiveOrderSchema>;


// ------------------------------------------------------------------------------------------- responses

export interface PackOnHand {
  packId: number;
  size: number;
  label: string;
  supplier: string;
  /** Stock on hand counted in this pack. */
  onHandPacks: number;
}

export interface StockLevel {
  materialId: number;
  key: string;
  name: string;
  kind: string;
  unit: string;
  quantity: number;
  packs: PackOnHand[];
  /** What the booked jobs need before the next delivery, and whether the shelf covers it. */
  needBeforeDelivery: number;
  /** The next delivery on an order sent for this material, or null (then the need counts to the window's end). */
  nextDelivery: string | null;
  onOrder: number;
  short: number;
  low: boolean;
  updatedAt: string | null;
}

export interface StockOverview {
  today: string;
  weeks: number;
  /** The end of the window when no delivery is due. */
  until: string;
  rows: StockLevel[];
}

export interface StockMovementDto {
  id: number;
  materialId: number;
  material: string;
  unit: string;
  kind: MovementKind;
  quantity: number;
  packs: number | null;
  pack: string | null;
  balanceAfter: number;
  value: string | null;
  reason: string | null;
  job: { id: number; number: string } | null;
  order: { id: number; number: string } | null;
  by: string | null;
  at: string;
}

export interface StockMovementPage {
  items: StockMovementDto[];
  page: number;
  pageSize: number;
  total: number;
}

/** A material a session is expected to use, with the packs it can be counted in. */
export interface SessionMaterialLine {
  materialId: number;
  key: string;
  name: string;
  unit: string;
  /** The estimate's quantity for the session, in the material's unit. */
  estimated: number;
  /** The suggested pack and the estimate in its packs. */
  packId: number;
  packs: number;
  options: { packId: number; size: number; label: string }[];
}

export interface PurchaseOrderLineDto {
  id: number;
  materialId: number;
  material: string;
  unit: string;
  packId: number;
  packLabel: string;
  packSize: number;
  packs: number;
  packPrice: string;
  amount: string;
  receivedPacks: number | null;
  paidPrice: string | null;
}

export interface PurchaseOrderDto {
  id: number;
  number: string;
  supplier: string;
  state: PurchaseOrderState;
  currency: string;
  total: string;
  expectedOn: string | null;
  note: string;
  sentTo: string | null;
  sentAt: string | null;
  receivedAt: string | null;
  createdAt: string;
  lines: PurchaseOrderLineDto[];
  delivery?: { delivered: boolean; outboxId: number; error: string | null };
}

export interface PurchaseOrderPage {
  items: PurchaseOrderDto[];
  page: number;
  pageSize: number;
  total: number;
}

// ------------------------------------------------------------------------------------------- job costing

export interface JobCosting {
  job: { id: number; number: string; title: string; state: string };
  currency: string;
  taxPct: number;
  /** The price the customer agreed to, tax included, and without the tax. */
  agreedPrice: string;
  agreedNet: string;
  /** Credit notes taken off the agreed price (the job's agreement of one piece only), tax included. */
  credited: string;
  /** The agreement's account: received less refunded, credited, still owed (for the whole agreement when it has several pieces). */
  account: { received: string; credited: string; balance: string; wholeAgreement: boolean } | null;
  /** Extras the customer took when accepting, part of the agreed price. */
  variations: { label: string; amount: string }[];
  labour: { hours: number; perHour: string; cost: string };
  materials: { lines: { material: string; unit: string; quantity: number; packs: number | null; pack: string | null; cost: string }[]; cost: string };
  overhead: { pct: number; cost: string };
  cost: string;
  realisedMargin: string;
  realisedMarginPct: number | null;
  estimated: { net: string; labour: string; materials: string; overhead: string; margin: string; marginPct: number | null; hours: number };
  sessionsDone: number;
  sessionsTotal: number;
}

export interface EstimateAccuracyRow {
  month: string;
  system: string;
  systemName: string;
  pieceKind: string;
  estimatedHours: number;
  actualHours: number;
  /** Actual over estimated; above 1 the estimates fell short. */
  ratio: number | null;
  sessions: number;
  /**
   * Materials of the sessions whose use was recorded (materialSessions of them): the estimate's share at the
   * estimate's cost, against the recorded use at the price paid; their ratio (null with none recorded).
   */
  estimatedMaterials: string;
  actualMaterials: string;
  materialsRatio: number | null;
  materialSessions: number;
  jobs: number;
}

export interface EstimateAccuracy {
  from: string;
  to: string;
  rows: EstimateAccuracyRow[];
}
