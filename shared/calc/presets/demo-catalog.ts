/**
 * DEMO DATA — the complete demo catalog: preset species, systems and factors with the invented demo materials,
 * rates and settings of demo-materials.ts. The server's demo loader may seed from it.
 */
import type { CatalogInput } from '../../schemas/catalog';
import { DEFAULT_SPECIES } from './species';
import { DEFAULT_SYSTEMS } from './systems';
import { DEFAULT_FACTORS, DEFAULT_SHELLAC } from './settings';
import { DEMO_CALENDAR, DEMO_LABOUR_RATES, DEMO_MATERIALS, DEMO_PRICING, DEMO_SAFETY } from './demo-materials';

/** The demo catalog before validation (parse it with CatalogSchema). */
export function demoCatalogInput(): CatalogInput {
  return structuredClone({
    version: 'demo-1',
    species: DEFAULT_SPECIES,
    systems: DEFAULT_SYSTEMS,
    materials: DEMO_MATERIALS,
    labourRates: DEMO_LABOUR_RATES,
    pricing: DEMO_PRICING,
    factors: DEFAULT_FACTORS,
    calendar: DEMO_CALENDAR,
    shellac: DEFAULT_SHELLAC,
    safety: DEMO_SAFETY,
  }) as CatalogInput;
}
