/**
 * Default factors and settings that are not prices (seeded, owner-editable).
 */
import type { Factors, ShellacSettings } from '../../schemas/catalog';

/**
 * Complexity multiplies labour and material (common practice, from memory): mouldings take longer to rub and
 * hold more polish in their quirks; carving is rubbed with small pads and brushes; fretwork has many edges and
 * little face. Veneer: careful stripping, preparing and cutting back (veneerCare stages only).
 */
export const DEFAULT_FACTORS: Factors = {
  complexity: {
    flat: { labour: 1, material: 1 },
    moulded: { labour: 1.3, material: 1.1 },
    carved: { labour: 2, material: 1.3 },
    fretwork: { labour: 2.5, material: 1.2 },
  },
  veneerLabour: 1.2,
};

/**
 * Shellac settings. Apparent density 1.2 g/cm³ reproduces the Fine Woodworking dilution chart (2 lb in 1 gal
 * make about 1.2 gal); the solid resin itself is about 1.14 (Ure).
 */
export const DEFAULT_SHELLAC: ShellacSettings = {
  flakesMaterial: 'shellac-flakes',
  spiritMaterial: 'spirit',
  apparentDensity: 1.2,
  gallon: 'us',
};
