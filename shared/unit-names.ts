/** Unit names and display systems, apart from the parser so that a page can name them without loading mathjs. */

/** Length units a bare number may take. */
export const LENGTH_UNITS = ['mm', 'cm', 'm', 'in', 'ft'] as const;
export type LengthUnit = (typeof LENGTH_UNITS)[number];

/** Display systems a workshop may choose. */
export const UNIT_SYSTEMS = ['metric', 'imperial'] as const;
export type UnitSystem = (typeof UNIT_SYSTEMS)[number];

/** Whose pints and fluid ounces an imperial display shows: US customary or imperial (UK). */
export const VOLUME_MEASURES = ['us', 'uk'] as const;
export type VolumeMeasure = (typeof VOLUME_MEASURES)[number];
