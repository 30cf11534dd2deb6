/**
 * The estimator engine: pure functions shared by the browser (live, as the user types) and the server (to price
 * and save). No I/O; prices arrive in the catalog.
 */
export { estimate, estimateParsed, EstimateError } from './estimate';
export type { EstimateOptions } from './estimate';
export {
  partArea, resolvePart, resolveShape, shapeArea, shapePerimeter, polygonArea, polygonPerimeter, ellipsePerimeter,
  frustumLateralArea, taperedLegArea, DEFAULT_THICKNESS_MM,
} from './area';
export type { Point, Shape, CutOut, ResolvedPart, PartArea } from './area';
export { templateParts, templateDimensions, grandOutline, GRAND_OUTLINE, TEMPLATE_DEFAULTS, TEMPLATE_WOOD } from './templates';
export type { TemplateOptions } from './templates';
export {
  cutToGramsPerLitre, solutionPerLitreOfSolvent, makeUpPolish, polishLitres, withWaste, GRAMS_PER_LB, LITRES_PER_US_GALLON,
  LITRES_PER_UK_GALLON,
} from './shellac';
export type { MakeUp, PolishDemand } from './shellac';
export { choosePacks } from './packs';
export { PIECE_UNITS, wholeForUnit, sessionShare } from './pieces';
export type { PackChoice, PackCount } from './packs';
export { labourMinutes, stageHours, labourCost, roundHours } from './labour';
export type { LabourDemand } from './labour';
export {
  scheduleSessions, placeSession, compileCalendar, openingWindow, restFactor, climateWarnings, toMinutes, fromMinutes, dayOf,
  CalendarError,
} from './calendar';
export type { CompiledCalendar, SessionRequest, ScheduledSession, Segment, ClimateWarning } from './calendar';
export { priceEstimate, usedCost } from './price';
export type { PriceInput, PriceBreakdown, PriceLineOut } from './price';
export {
  SOLVENTS, MOLAR_VOLUME_L, ML_PER_US_PINT, M3H_PER_CFM, dilutionFlowCfm, dilutionFlowM3h, vapourM3h, mixtureLel,
  ventilation, cautions, customerCautions, CUSTOMER_VENTILATION_TEXT,
} from './safety';
export type {
  SolventData, SolventKey, SessionSpirit, Ventilation, VentilationComponent, UncoveredStage, DilutionImperial, DilutionMetric,
} from './safety';
export { DEFAULT_SPECIES } from './presets/species';
export { DEFAULT_SYSTEMS, FULL_REPOLISH, RE_BODY, REVIVE, NEW_WORK } from './presets/systems';
export { DEFAULT_FACTORS, DEFAULT_SHELLAC } from './presets/settings';
