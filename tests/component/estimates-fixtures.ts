/** A calc catalog, settings and saved estimates for component tests, from the demo catalog and the real engine. */
import { estimate } from '../../shared/calc';
import type { EstimateInput } from '../../shared/schemas/calc';
import type { EstimateDetail, Revision } from '../../shared/schemas/estimates';
import type { WorkshopSettings } from '../../shared/schemas/workshop';
import type { Piece } from '../../shared/schemas/customers';
import type { CalcCatalog } from '../../src/lib/catalog';
import { DEMO_CATALOG } from '../fixtures/catalog';

export const SETTINGS: WorkshopSettings = {
  units: 'metric',
  imperialVolumes: 'us',
  defaultLengthUnit: 'mm',
  pricing: DEMO_CATALOG.pricing,
  pricesIncludeTax: true,
  factors: DEMO_CATALOG.factors,
  calendar: DEMO_CATALOG.calendar,
  shellac: DEMO_CATALOG.shellac,
  safety: DEMO_CATALOG.safety,
  dryingRoom: { mode: 'bays', bays: 4, rackAreaM2: 16, temperatureC: 20, humidityPct: 55 },
  quoteValidityDays: 30,
  paperSize: 'A4',
};

export const CALC: CalcCatalog = { catalog: DEMO_CATALOG, settings: SETTINGS, warnings: [] };

export const ME = { user: { id: 2, email: 'estimator@example.com', name: 'Ewan Pellow', role: 'estimator', active: true, lastLoginAt: null, createdAt: '2026-01-01T00:00:00Z' } };

export const PIECE: Piece = {
  id: 7,
  customerId: 3,
  customerName: 'Hester Quillfeather',
  yearText: null,
  kind: 'grand',
  description: 'Rosewood grand, about 1895',
  maker: null,
  year: 1895,
  serial: null,
  dimensions: { length: '190 cm' },
  conditionNotes: null,
  photos: [],
  archived: false,
  createdAt: '2026-11-01T10:00:00Z',
  updatedAt: '2026-11-01T10:00:00Z',
};

export const GRAND_INPUT: EstimateInput = {
  piece: { template: 'grand', dimensions: { length: '190 cm' }, species: 'rosewood', veneered: true },
  system: 'full-repolish',
  startDate: '2026-03-02',
  climate: { temperatureC: 20, humidityPct: 55 },
  discountPct: 0,
  units: 'metric',
  defaultLengthUnit: 'mm',
};

export function revision(number: number, input: EstimateInput): Revision {
  const result = estimate(input, DEMO_CATALOG);
  return {
    id: 100 + number,
    number,
    total: result.totals.price,
    labourHours: result.totals.labourHours,
    catalogVersion: DEMO_CATALOG.version,
    note: number === 1 ? '' : 'Longer than measured at first',
    createdBy: { id: 2, name: 'Ewan Pellow' },
    createdAt: `2026-11-0${number}T10:00:00Z`,
    input,
    result,
  };
}

export function detail(revisions: Revision[]): EstimateDetail {
  const current = revisions[revisions.length - 1]!;
  return {
    id: 1,
    number: 'E-0001',
    title: 'Full repolish',
    state: 'draft',
    customer: { id: 3, name: 'Hester Quillfeather' },
    piece: { id: 7, description: 'Rosewood grand, about 1895', kind: 'grand' },
    owner: { id: 2, name: 'Ewan Pellow' },
    labourHours: current.labourHours,
    total: current.total,
    currency: 'GBP',
    revisionCount: revisions.length,
    validUntil: '2026-12-31',
    archived: false,
    createdAt: '2026-11-01T10:00:00Z',
    updatedAt: current.createdAt,
    revisions: revisions.map(({ input: _i, result: _r, ...summary }) => summary),
    current,
  };
}
