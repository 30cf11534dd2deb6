/**
 * Shellac polish: pound cut to grams per litre, the volume a solution takes up, and the flakes and spirit to
 * make up a volume of polish.
 *
 * A "pound cut" is pounds of flakes dissolved in one US gallon of alcohol (Woodcraft, "Scaling Down
 * Pound-Cuts"). Dissolved solids take up room: 2 lb in 1 gal make about 1.2 gal (Fine Woodworking dilution
 * chart), which an apparent solids density of about 1.2 g/cm³ reproduces.
 */
import { unit } from 'mathjs';

/** Grams in a pound (1959 international yard and pound agreement), from mathjs's exact definition. */
export const GRAMS_PER_LB = unit(1, 'lb').toNumber('g');
/** Litres in a US gallon (NIST Handbook 44), from mathjs's exact definition. */
export const LITRES_PER_US_GALLON = unit(1, 'gal').toNumber('L');
/** Litres in a UK gallon (Weights and Measures Act 1985). */
export const LITRES_PER_UK_GALLON = 4.54609;

/**
 * Grams of flakes per litre of solvent for a pound cut.
 *
 * @example cutToGramsPerLitre(1) // 119.826… (1 lb per US gallon)
 * @example cutToGramsPerLitre(1, 'uk') // 99.776… (1 lb per UK gallon)
 */
export function cutToGramsPerLitre(cutLb: number, gallon: 'us' | 'uk' = 'us'): number {
  return (cutLb * GRAMS_PER_LB) / (gallon === 'us' ? LITRES_PER_US_GALLON : LITRES_PER_UK_GALLON);
}

/**
 * Litres of solution one litre of solvent makes at a cut: 1 + the flakes' volume at their apparent density.
 *
 * @example solutionPerLitreOfSolvent(2, 1.2) // ≈ 1.2 (Fine Woodworking: 2 lb in 1 gal → about 1.2 gal)
 */
export function solutionPerLitreOfSolvent(cutLb: number, apparentDensity: number, gallon: 'us' | 'uk' = 'us'): number {
  return 1 + cutToGramsPerLitre(cutLb, gallon) / (apparentDensity * 1000);
}

/** Flakes and solvent that make up a volume of polish. */
export interface MakeUp {
  /** Litres of polish made. */
  polishL: number;
  flakesG: number;
  solventL: number;
}

/**
 * Flakes and spirit to make up a volume of polish at a cut, counting the volume the dissolved shellac takes up.
 *
 * @example makeUpPolish(1.2, 2, 1.2) // ≈ { solventL: 1, flakesG: 239.65 }
 */
export function makeUpPolish(polishL: number, cutLb: number, apparentDensity: number, gallon: 'us' | 'uk' = 'us'): MakeUp {
  if (polishL <= 0) return { polishL: 0, flakesG: 0, solventL: 0 };
  const solventL = polishL / solutionPerLitreOfSolvent(cutLb, apparentDensity, gallon);
  return { polishL, flakesG: solventL * cutToGramsPerLitre(cutLb, gallon), solventL };
}

/** What decides how much polish a part takes in one stage. */
export interface PolishDemand {
  areaM2: number;
  mlPerM2PerCoat: number;
  coats: number;
  /** Species absorbency when the stage lays the first coats, else 1. */
  absorbency: number;
  /** Complexity material factor. */
  materialFactor: number;
}

/**
 * Litres of polish: area × rate × coats × absorbency × complexity material factor.
 *
 * @example polishLitres({ areaM2: 2, mlPerM2PerCoat: 12, coats: 3, absorbency: 1, materialFactor: 1 }) // 0.072
 */
export function polishLitres(d: PolishDemand): number {
  return (d.areaM2 * d.mlPerM2PerCoat * d.coats * d.absorbency * d.materialFactor) / 1000;
}

/**
 * Adds a waste allowance.
 *
 * @example withWaste(1, 10) // 1.1
 */
export function withWaste(quantity: number, wastePct: number): number {
  return quantity * (1 + wastePct / 100);
}
