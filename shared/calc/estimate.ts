/**
 * estimate(): the whole estimator in one pure call — parts and areas, stages, shellac and spirit, other
 * materials and packs, labour, the coat calendar, the price, ventilation and cautions.
 */
import { CatalogSchema } from '../schemas/catalog';
import type { Catalog, Material, Species, Stage } from '../schemas/catalog';
import type {
  EstimateInput, EstimateResult, EstimateWarning, MaterialResult, ParsedEstimateInput, Part, PartResult, StageResult, TemplateKey,
} from '../schemas/calc';
import { UnitParseError, formatArea, formatMass, formatVolume } from '../units';
import type { LengthUnit } from '../units';
import { formatAmount, money, sumMoney } from '../money';
import { today as workshopToday } from '../time';
import type { Money } from '../money';
import { partArea, resolvePart } from './area';
import type { PartArea, ResolvedPart } from './area';
import { TEMPLATE_DEFAULTS, TEMPLATE_WOOD, templateDimensions, templateParts, templatePartsMm } from './templates';
import { cutToGramsPerLitre, makeUpPolish, polishLitres, withWaste } from './shellac';
import { choosePacks } from './packs';
import { wholeForUnit } from './pieces';
import { labourCost, labourMinutes, roundHours, stageHours } from './labour';
import {
  CalendarError, climateWarnings, dayOf, fromMinutes, restFactor, scheduleSessions, toMinutes,
} from './calendar';
import type { ScheduledSession, SessionRequest } from './calendar';
import { labourCentsOf, priceEstimate, priceFromCents, usedCost } from './price';
import { cautions, ventilation } from './safety';
import { centsOf, centsText, formatCents, hundredthsOfHours, parseCents, usedCents, usedCentsNumber } from './cents';
import { compiledCalendar, materialMap, rateMap, speciesMap } from './lookups';
import { isRememberedPart, parseEstimateInput } from './parse-input';

/** A problem with the input that only the catalog can reveal (an unknown system or species). */
export class EstimateError extends Error {
  readonly path: Array<string | number>;
  readonly code: string;
  constructor(code: string, path: Array<string | number>, message: string) {
    super(message);
    this.name = 'EstimateError';
    this.code = code;
    this.path = path;
  }
}

/** Options that are not part of the estimate itself. */
export interface EstimateOptions {
  /** Local date used when the input gives no startDate (defaults to today's date). */
  today?: string;
}

const checkedCatalogs = new WeakSet<object>();

/** Kinds of material that give off solvent vapour of their own, which the spirit's ventilation figure does not count. */
const UNCOVERED_KINDS: ReadonlySet<string> = new Set(['stripper', 'stain']);

/** Validates a catalog once per object (the engine is called on every keystroke with the same catalog). */
function checkCatalog(catalog: Catalog): void {
  if (checkedCatalogs.has(catalog)) return;
  CatalogSchema.parse(catalog);
  checkedCatalogs.add(catalog);
}

/** Powers of ten as `10 ** dp` gives them (exact doubles), looked up. */
const POW10: readonly number[] = [1, 10, 100, 1e3, 1e4, 1e5, 1e6, 1e7];

const round = (x: number, dp: number): number => {
  const f = POW10[dp] ?? 10 ** dp;
  return Math.round(x * f) / f;
};

interface PartsSource {
  /** The parts (a template's are generated on first call). */
  parts: () => Part[];
  path: Array<string | number>;
  defaultSpecies: string | undefined;
  /** The unit the parts' bare numbers are in: mm for a template's generated parts, the input's default otherwise. */
  unit: LengthUnit;
  /** A template's parts generated with numbers (see templatePartsMm), not the text the parts list shows. */
  generated: boolean;
}

/**
 * The parts list the input describes: a template's generated parts (with their lengths as numbers of mm, from the
 * template's dimensions already read) or the parts given.
 */
function inputParts(input: ParsedEstimateInput, dims: Record<string, number> | null): PartsSource {
  const piece = input.piece;
  if (piece?.template && dims) {
    const template = piece.template;
    let generated: Part[] | undefined;
    return {
      parts: () => (generated ??= templatePartsMm(template, dims, { species: piece.species, veneered: piece.veneered })),
      path: ['piece'],
      defaultSpecies: piece.species ?? TEMPLATE_WOOD[piece.template].species,
      unit: 'mm',
      generated: true,
    };
  }
  const given = piece?.parts;
  if (given) return { parts: () => given, path: ['piece', 'parts'], defaultSpecies: piece.species, unit: input.defaultLengthUnit, generated: false };
  const top = input.parts ?? [];
  return { parts: () => top, path: ['parts'], defaultSpecies: undefined, unit: input.defaultLengthUnit, generated: false };
}

/**
 * Reads a part into millimetres. A template's generated part may outgrow the limits a part has (a lid edge over
 * 100 m for a grand given as 90 m long): that is the dimensions' fault, and the error names them.
 */
function resolveOrRefuse(p: Part, i: number, input: ParsedEstimateInput, source: PartsSource, defaultSpecies: string): ResolvedPart {
  const path = source.path;
  try {
    return resolvePart(p, source.unit, defaultSpecies, i);
  } catch (error) {
    if (!(error instanceof UnitParseError)) throw error;
    const piece = input.piece;
    if (piece?.template && source.generated) {
      // A generated length out of bounds: read the part as text, as templateParts gives it, so that the error
      // names the length exactly as the parts list shows it.
      const text = templateParts(piece.template, piece.dimensions, input.defaultLengthUnit, { species: piece.species, veneered: piece.veneered })[i] as Part;
      return resolveOrRefuse(text, i, input, { ...source, unit: input.defaultLengthUnit, generated: false }, defaultSpecies);
    }
    if (piece?.template) {
      // The largest dimension given is the one that outgrew the part.
      const given = Object.entries(templateDimensions(piece.template, piece.dimensions, input.defaultLengthUnit))
        .filter(([name]) => piece.dimensions[name] !== undefined)
        .sort((a, b) => b[1] - a[1]);
      const field = given[0] ? ['piece', 'dimensions', given[0][0]] : ['piece', 'template'];
      throw new EstimateError('template-too-large', field, `At these dimensions the template's part "${p.name}" goes past the limits of a part (${error.message.replace(/; expected .*$/s, '')}): check the dimensions.`);
    }
    throw new EstimateError('part-too-large', [...path, i], error.message);
  }
}

interface ResolvedWithArea {
  part: ResolvedPart;
  area: PartArea;
}

/**
 * What was resolved before, for the editor's next call: a given part by its (parsed) object, which stays the same
 * while the part does not change (./parse-input), under the unit, default species and place it was resolved with;
 * a template's parts by the template, its dimensions in mm and the piece's species and veneer. Only parts that
 * resolved are remembered (a problem is worked out again, so its error is the same); what is remembered is only
 * read, never changed.
 */
let resolvedByPart = new WeakMap<Part, { unit: LengthUnit; defaultSpecies: string; index: number; value: ResolvedWithArea }>();
const resolvedTemplates = new Map<string, readonly ResolvedWithArea[]>();
const TEMPLATES_REMEMBERED = 64;

/** Forgets the resolved parts remembered (tests compare the engine with and without them). */
export function forgetResolvedParts(): void {
  resolvedByPart = new WeakMap();
  resolvedTemplates.clear();
}

function resolvedParts(input: ParsedEstimateInput, dims: Record<string, number> | null, source: PartsSource, defaultSpecies: string): readonly ResolvedWithArea[] {
  const piece = input.piece;
  if (source.generated && piece?.template && dims) {
    const key = JSON.stringify([piece.template, piece.species ?? null, piece.veneered ?? null, defaultSpecies, dims]);
    let list = resolvedTemplates.get(key);
    if (!list) {
      list = source.parts().map((p, i) => {
        const part = resolveOrRefuse(p, i, input, source, defaultSpecies);
        return { part, area: partArea(part) };
      });
      if (resolvedTemplates.size >= TEMPLATES_REMEMBERED) resolvedTemplates.clear();
      resolvedTemplates.set(key, list);
    }
    return list;
  }
  const unit = source.unit;
  return source.parts().map((p, i) => {
    const known = resolvedByPart.get(p);
    if (known && known.unit === unit && known.defaultSpecies === defaultSpecies && (known.index === i || p.id !== undefined)) return known.value;
    const part = resolveOrRefuse(p, i, input, source, defaultSpecies);
    const value = { part, area: partArea(part) };
    // Only a part parseEstimateInput remembers comes back as the same object: only those are worth remembering.
    if (isRememberedPart(p)) resolvedByPart.set(p, { unit, defaultSpecies, index: i, value });
    return value;
  });
}

/** The smallest plausible main dimension of a template, mm (common practice: no piano case is under 60 cm). */
const PLAUSIBLE_MIN_MM: Readonly<Record<TemplateKey, number>> = { grand: 1000, upright: 600, square: 1000, table: 200, cabinet: 200, chest: 200 };

/** Flags a template piece whose dimensions are far from any real piece of its kind (a piano a few millimetres long). */
function implausibleSize(input: ParsedEstimateInput, dims: Record<string, number> | null): EstimateWarning[] {
  const piece = input.piece;
  if (!piece?.template || !dims) return [];
  const out: EstimateWarning[] = [];
  for (const [name, mm] of Object.entries(dims)) {
    const usual = TEMPLATE_DEFAULTS[piece.template][name] as number;
    const small = name === Object.keys(dims)[0] ? Math.min(PLAUSIBLE_MIN_MM[piece.template], usual / 4) : usual / 10;
    if (mm < small) out.push({ code: 'implausible-size', text: `A ${piece.template} ${name} of ${Math.round(mm)} mm is far below any real one (about ${Math.round(usual)} mm is usual): check the unit.` });
    else if (mm > usual * 10) out.push({ code: 'implausible-size', text: `A ${piece.template} ${name} of ${Math.round(mm)} mm is far above any real one (about ${Math.round(usual)} mm is usual): check the unit.` });
  }
  return out;
}

interface PartContext {
  part: ResolvedPart;
  area: PartArea;
  species: Species;
}

/** Does a stage work on this part? */
function applies(stage: Stage, ctx: PartContext): boolean {
  if (stage.appliesTo === 'open-pored') return ctx.species.needsGrainFill;
  if (stage.appliesTo === 'show-faces') return ctx.part.show;
  return true;
}

interface StageWork {
  stage: Stage;
  result: StageResult;
  spiritL: number;
  labourMin: number;
}

/** Works out one stage over the parts it applies to. */
function workStage(stage: Stage, parts: readonly PartContext[], catalog: Catalog): StageWork | null {
  const f = catalog.factors;
  const coats = stage.sessions * stage.coatsPerSession;
  let areaM2 = 0;
  let polishL = 0;
  let extraSpiritL = 0;
  let partMinutes = 0;
  // The stage's materials in slots (a key given twice shares its slot), summed part by part in the parts' order,
  // as a Map keyed by material would sum them: the same additions in the same order.
  const stageMaterials = stage.materials;
  const keys: string[] = [];
  const slotOf: number[] = [];
  for (const m of stageMaterials) {
    let slot = keys.indexOf(m.material);
    if (slot < 0) slot = keys.push(m.material) - 1;
    slotOf.push(slot);
  }
  const sums: number[] = keys.map(() => 0);
  const nMaterials = stageMaterials.length;
  const sessions = stage.sessions;
  const firstCoats = stage.firstCoats;
  const veneerCare = stage.veneerCare;
  for (const ctx of parts) {
    if (!applies(stage, ctx)) continue;
    const a = ctx.area.areaM2;
    const factor = f.complexity[ctx.part.complexity];
    const fm = factor.material;
    areaM2 += a;
    polishL += polishLitres({
      areaM2: a, mlPerM2PerCoat: stage.polishMlPerM2PerCoat, coats,
      absorbency: firstCoats ? ctx.species.absorbency : 1, materialFactor: fm,
    });
    extraSpiritL += (a * stage.spiritMlPerM2PerSession * sessions * fm) / 1000;
    for (let j = 0; j < nMaterials; j++) {
      const slot = slotOf[j] as number;
      sums[slot] = (sums[slot] as number) + a * (stageMaterials[j] as Stage['materials'][number]).perM2 * sessions * fm;
    }
    partMinutes += labourMinutes({
      areaM2: a, minPerM2PerCoat: stage.labourMinPerM2PerCoat, coats,
      complexityFactor: factor.labour, veneerFactor: veneerCare && ctx.part.veneered ? f.veneerLabour : 1,
    });
  }
  if (areaM2 === 0) return null;
  // Every part the stage applies to went through every slot, so each key is there, in the stage's order.
  const gallon = catalog.shellac.gallon;
  const made = stage.cutLb > 0 ? makeUpPolish(withWaste(polishL, catalog.pricing.wastePct), stage.cutLb, catalog.shellac.apparentDensity, gallon) : null;
  const spiritL = (made?.solventL ?? 0) + extraSpiritL;
  const hours = stageHours(partMinutes, stage.setupMinPerSession, stage.sessions);
  const byKey = materialMap(catalog.materials);
  // Sheets, cloths and pads are opened whole: a stage's count is rounded up to whole pieces.
  const materials: StageResult['materials'] = [];
  for (let k = 0; k < keys.length; k++) {
    const material = keys[k] as string;
    const unit = byKey.get(material)?.unit ?? '';
    materials.push({ material, quantity: round(wholeForUnit(sums[k] as number, unit), 3), unit });
  }
  return {
    stage,
    spiritL,
    labourMin: hours * 60,
    result: {
      key: stage.key,
      kind: stage.kind,
      name: stage.name,
      sessions: stage.sessions,
      coatsPerSession: stage.coatsPerSession,
      coats: stage.cutLb > 0 ? coats : 0,
      cutLb: stage.cutLb,
      cutGPerL: round(cutToGramsPerLitre(stage.cutLb, gallon), 2),
      cutBasis: gallon,
      areaM2: round(areaM2, 4),
      polishL: round(made?.polishL ?? 0, 4),
      flakesG: round(made?.flakesG ?? 0, 2),
      spiritL: round(spiritL, 4),
      materials,
      labourHours: round(hours, 3),
      handsOnHoursPerSession: round(hours / stage.sessions, 3),
      restHours: stage.restHours,
    },
  };
}

/**
 * Prices one material's need: packs, cost of the packs and of the quantity used. The cost is worked in whole
 * cents where that gives exactly what decimal money gives (see ./cents): in safe integers, else in big integers,
 * else in decimal money.
 */
function priceMaterial(material: Material, need: number, wholePacks: boolean): { result: MaterialResult; charged: Money | number; packsFree: boolean } {
  const choice = choosePacks(need, material.packs);
  const cost = choice.cost;
  let charged: Money | number;
  let usedText: string;
  let chargeText: string;
  let packsFree: boolean;
  const packsC = centsOf(cost);
  const usedC = packsC === null ? null : usedCentsNumber(packsC, choice.bought, choice.need);
  if (packsC !== null && usedC !== null) {
    packsFree = packsC === 0;
    charged = wholePacks ? packsC : usedC;
    usedText = centsText(usedC);
    chargeText = wholePacks ? centsText(packsC) : usedText;
  } else {
    const packsCents = parseCents(cost);
    const usedBig = packsCents === null ? null : usedCents(packsCents, choice.bought, choice.need);
    if (packsCents !== null && usedBig !== null) {
      packsFree = packsCents === 0n;
      const chargedBig = wholePacks ? packsCents : usedBig;
      usedText = formatCents(usedBig);
      chargeText = formatCents(chargedBig);
      charged = money(chargeText);
    } else {
      const used = usedCost(cost, choice.bought, choice.need);
      charged = wholePacks ? money(cost) : used;
      packsFree = money(cost).isZero();
      usedText = formatAmount(used);
      chargeText = formatAmount(charged);
    }
  }
  return {
    charged,
    packsFree,
    result: {
      key: material.key,
      name: material.name,
      supplier: material.supplier,
      unit: material.unit,
      need: round(choice.need, 3),
      packs: choice.packs,
      bought: choice.bought,
      leftover: round(choice.leftover, 3),
      packsCost: cost,
      usedCost: usedText,
      charge: chargeText,
    },
  };
}

interface PricedMaterial {
  result: MaterialResult;
  charged: Money | number;
  packsFree: boolean;
}

/**
 * Materials priced before, by material, its pack list, the charge basis and the need: the editor's next call
 * (another discount, climate, start or units) prices the same needs again. Each call gets result objects of its own.
 */
const pricedBefore = new WeakMap<Material, { packs: Material['packs']; wholePacks: boolean; byNeed: Map<number, PricedMaterial> }>();
const NEEDS_REMEMBERED = 16;

function priceMaterialRemembered(material: Material, need: number, wholePacks: boolean): PricedMaterial {
  let memo = pricedBefore.get(material);
  if (!memo || memo.packs !== material.packs || memo.wholePacks !== wholePacks) {
    memo = { packs: material.packs, wholePacks, byNeed: new Map() };
    pricedBefore.set(material, memo);
  }
  let priced = memo.byNeed.get(need);
  if (!priced) {
    priced = priceMaterial(material, need, wholePacks);
    if (memo.byNeed.size >= NEEDS_REMEMBERED) memo.byNeed.clear();
    memo.byNeed.set(need, priced);
  }
  const r = priced.result;
  return { charged: priced.charged, packsFree: priced.packsFree, result: { ...r, packs: r.packs.map((line) => ({ ...line })) } };
}

/**
 * The sum of the materials' charges: in whole cents (a safe integer) when every charge is in cents, in decimal
 * money otherwise.
 */
function sumCharged(charges: ReadonlyArray<Money | number>): { cents: number | null; money: () => Money } {
  let cents = 0;
  let exact = true;
  for (const c of charges) {
    if (typeof c !== 'number') {
      exact = false;
      break;
    }
    cents += c;
  }
  if (exact && Number.isSafeInteger(cents)) return { cents, money: () => money(centsText(cents)) };
  return { cents: null, money: () => sumMoney(charges.map((x) => (typeof x === 'number' ? money(centsText(x)) : x))) };
}


/**
 * Estimates a French-polishing job. Validates the input (throws a ZodError whose issues name the field),
 * fills defaults, and returns plain JSON. Parts unchanged since an earlier call are not checked again (./parse-input). Throws {@link EstimateError} for a system or species the catalog does
 * not hold. Never mutates its arguments.
 *
 * @example estimate({ piece: { template: 'grand', dimensions: { length: '6 ft 3 in' } }, system: 'full-repolish' }, catalog).totals
 */
export function estimate(rawInput: EstimateInput, catalog: Catalog, options: EstimateOptions = {}): EstimateResult {
  return estimateParsed(parseEstimateInput(rawInput), catalog, options);
}

/**
 * {@link estimate} for an input already parsed by `EstimateInputSchema` (its output, defaults filled): the server
 * checks a request body once to answer a 400 naming the field, then prices what it checked without checking the
 * same parts a second time. Only a value the schema itself produced may be passed (the type says so).
 */
export function estimateParsed(input: ParsedEstimateInput, catalog: Catalog, options: EstimateOptions = {}): EstimateResult {
  checkCatalog(catalog);

  const system = catalog.systems.find((s) => s.key === input.system);
  if (!system) {
    throw new EstimateError('unknown-system', ['system'], `Unknown finishing system "${input.system}"; expected one of ${catalog.systems.map((s) => s.key).join(', ')}`);
  }
  const speciesByKey = speciesMap(catalog.species);
  const dims = input.piece?.template ? templateDimensions(input.piece.template, input.piece.dimensions, input.defaultLengthUnit) : null;
  const source = inputParts(input, dims);
  const defaultSpecies = source.defaultSpecies ?? (speciesByKey.has('mahogany') ? 'mahogany' : (catalog.species[0] as Species).key);

  // Parts and areas.
  const resolved = resolvedParts(input, dims, source, defaultSpecies);
  const contexts: PartContext[] = resolved.map(({ part, area }, i) => {
    const species = speciesByKey.get(part.species);
    if (!species) {
      const path = source.path[0] === 'piece' && source.path.length === 1 ? ['piece', 'species'] : [...source.path, i, 'species'];
      throw new EstimateError('unknown-species', path, `Unknown species "${part.species}"; expected one of ${[...speciesByKey.keys()].join(', ')}`);
    }
    return { part, area, species };
  });
  const warnings: EstimateWarning[] = [];
  for (const c of contexts) {
    if (c.area.cutOutsExceedFace) warnings.push({ code: 'cut-outs-exceed-face', text: `The cut-outs of "${c.part.name}" leave no face: its face area is taken as zero.` });
  }
  warnings.push(...implausibleSize(input, dims));
  const parts: PartResult[] = contexts.map((c) => ({
    id: c.part.id,
    name: c.part.name,
    shape: c.part.shape.kind,
    count: c.part.count,
    faces: c.part.faces,
    species: c.species.key,
    pores: c.species.pores,
    complexity: c.part.complexity,
    veneered: c.part.veneered,
    show: c.part.show,
    faceAreaM2: round(c.area.faceAreaM2, 4),
    edgeAreaM2: round(c.area.edgeAreaM2, 4),
    areaM2: round(c.area.areaM2, 4),
  }));
  const totalArea = contexts.reduce((t, c) => t + c.area.areaM2, 0);

  // Stages.
  const stages = (input.stages ?? system.stages).filter((s) => s.enabled && s.sessions > 0);
  const works = stages.map((s) => workStage(s, contexts, catalog)).filter((w): w is StageWork => w !== null);

  // Materials and packs.
  const needs = new Map<string, number>();
  const add = (key: string, q: number): void => {
    if (q > 0) needs.set(key, (needs.get(key) ?? 0) + q);
  };
  const flakesG = works.reduce((t, w) => t + w.result.flakesG, 0);
  const spiritL = works.reduce((t, w) => t + w.spiritL, 0);
  add(catalog.shellac.flakesMaterial, flakesG);
  add(catalog.shellac.spiritMaterial, spiritL * 1000);
  for (const w of works) for (const m of w.result.materials) add(m.material, m.quantity);
  const materialsByKey = materialMap(catalog.materials);
  const wholePacks = catalog.pricing.materialsCharge === 'whole-packs';
  const priced = [...needs].map(([key, need]) => {
    const material = materialsByKey.get(key);
    if (!material) throw new EstimateError('unknown-material', ['stages'], `Unknown material "${key}" in a stage`);
    return priceMaterialRemembered(material, need, wholePacks);
  });
  const materialsCost = sumCharged(priced.map((p) => p.charged));

  // Labour: to a hundredth of an hour and to the cent in safe integers where they give the decimal working's figures.
  let labourMinutesTotal = 0;
  for (const w of works) labourMinutesTotal += w.labourMin;
  const rawHours = labourMinutesTotal / 60;
  const hundredths = hundredthsOfHours(rawHours);
  const labourHours = hundredths === null ? roundHours(rawHours) : hundredths / 100;
  const rate = rateMap(catalog.labourRates).get(catalog.pricing.polisherRate);
  if (!rate) throw new EstimateError('unknown-rate', ['pricing', 'polisherRate'], `Unknown labour rate "${catalog.pricing.polisherRate}"`);
  const labourCents = hundredths === null ? null : labourCentsOf(hundredths, rate.perHour);
  const labourText = labourCents === null ? formatAmount(labourCost(labourHours, rate.perHour)) : centsText(labourCents);

  // Calendar.
  const climate = input.climate ?? { temperatureC: 20, humidityPct: 50 };
  const factor = restFactor(climate.temperatureC, climate.humidityPct);
  if (input.climate) warnings.push(...climateWarnings(climate.temperatureC, climate.humidityPct));
  const requests: SessionRequest[] = [];
  const sessionSpiritL: number[] = [];
  for (const w of works) {
    for (let s = 1; s <= w.stage.sessions; s++) {
      sessionSpiritL.push(w.spiritL / w.stage.sessions);
      requests.push({ stage: w.stage.key, stageKind: w.stage.kind, session: s, handsOnMin: w.labourMin / w.stage.sessions, restMin: w.stage.restHours * 60 * factor });
    }
  }
  const startText = input.startDate ?? options.today ?? workshopToday();
  const startDay = toMinutes(startText.slice(0, 10));
  let scheduled: ScheduledSession[];
  try {
    scheduled = scheduleSessions(requests, compiledCalendar(catalog.calendar), toMinutes(startText));
  } catch (error) {
    if (!(error instanceof CalendarError)) throw error;
    const longest = Math.max(0, ...requests.map((r) => r.handsOnMin)) / 60;
    throw new EstimateError(
      'calendar-unplaceable', source.path,
      `The work cannot be placed in the working calendar (${error.message}): the longest session is ${Math.round(longest).toLocaleString('en-GB')} hours of hands-on work. Check the sizes and counts of the parts.`,
    );
  }
  const first = scheduled[0] as ScheduledSession | undefined;
  const last = scheduled[scheduled.length - 1] as ScheduledSession | undefined;
  const firstFinish = scheduled.findIndex((s) => s.stageKind === 'cut-back' || s.stageKind === 'burnish');
  const dryEnd = firstFinish > 0 ? (scheduled[firstFinish - 1] as ScheduledSession).restUntil : (last?.restUntil ?? startDay);
  const jobStart = first?.start ?? startDay;
  const jobEnd = last?.end ?? startDay;
  const calendarDays = first ? dayOf(jobEnd) - dayOf(jobStart) + 1 : 0;

  const years = (jobEnd - jobStart) / (365 * 1440);
  if (years > 1) {
    warnings.push({
      code: 'calendar-past-a-year',
      text: `The calendar runs ${calendarDays} days, past a year${factor > 1.5 ? `: the climate stretches every rest ${round(factor, 1)} times` : ''}. Check the climate and the rests before quoting.`,
    });
  }

  // Price.
  const price =
    (materialsCost.cents !== null && labourCents !== null
      ? priceFromCents({ materialsCents: materialsCost.cents, labourHours, labourCents, perHour: rate.perHour, discountPct: input.discountPct, pricing: catalog.pricing })
      : null) ??
    priceEstimate({
      materialsCost: materialsCost.money(), labourHours, labourCost: labourCents === null ? labourCost(labourHours, rate.perHour) : money(centsText(labourCents)),
      perHour: rate.perHour, discountPct: input.discountPct, pricing: catalog.pricing,
    });
  if (input.discountPct > catalog.pricing.maxDiscountPct) {
    warnings.push({ code: 'discount-over-cap', text: `A discount of ${input.discountPct} % is above the workshop's cap of ${catalog.pricing.maxDiscountPct} %.` });
  }

  if (/^-?0\.00$/.test(price.total)) {
    warnings.push({ code: 'zero-price', text: 'The price comes to 0.00: the labour rate and the materials in use have no prices yet. Enter them in the price list before quoting.' });
  } else {
    const unpriced = priced
      .filter((p) => p.result.need > 0 && p.packsFree)
      .map((p) => p.result.name);
    if (unpriced.length > 0) warnings.push({ code: 'unpriced-materials', text: `No price yet for ${unpriced.join(', ')}: they are counted at 0.00.` });
  }

  // Safety. Stages that use a solvent product other than the spirit (stripper, stain) are named, not guessed at.
  const kindOf = materialsByKey;
  const notCovered = works.flatMap((w) => {
    const own = w.result.materials.map((m) => kindOf.get(m.material)).filter((m): m is Material => m !== undefined && UNCOVERED_KINDS.has(m.kind));
    return own.length > 0 ? [{ stage: w.stage.key, name: w.stage.name, materials: own.map((m) => m.name) }] : [];
  });
  const vent = ventilation(
    scheduled.map((s) => ({ index: s.index, date: fromMinutes(s.start).slice(0, 10), spiritL: sessionSpiritL[s.index] ?? 0, handsOnMin: s.handsOnMin })),
    catalog.safety,
    notCovered,
  );
  if (!vent.adequate) {
    warnings.push({ code: 'ventilation', text: `The finishing room supplies ${Math.round(vent.suppliedFlowM3h)} m³/h of air; the busiest session needs ${Math.ceil(vent.requiredFlowM3h)} m³/h.` });
  }

  const coats = works.reduce((t, w) => t + w.result.coats, 0);
  return {
    totals: {
      areaM2: round(totalArea, 3),
      coats,
      labourHours,
      flakesG: round(flakesG, 1),
      spiritL: round(spiritL, 3),
      calendarDays,
      price: price.total,
      currency: price.currency,
    },
    cautions: cautions(vent, catalog.safety.spirit),
    warnings,
    display: {
      units: input.units,
      area: formatArea(totalArea, input.units),
      flakes: formatMass(flakesG, input.units),
      spirit: formatVolume(spiritL, input.units, input.imperialVolumes),
      volumes: input.imperialVolumes,
      gallon: catalog.shellac.gallon,
    },
    system: system.key,
    catalogVersion: catalog.version,
    parts,
    stages: works.map((w) => w.result),
    materials: priced.map((p) => p.result),
    labour: { hours: labourHours, rate: rate.key, perHour: rate.perHour, cost: labourText },
    calendar: {
      start: fromMinutes(jobStart),
      end: fromMinutes(jobEnd),
      calendarDays,
      restFactor: round(factor, 4),
      sessions: scheduled.map((s) => ({
        index: s.index,
        stage: s.stage,
        stageKind: s.stageKind,
        session: s.session,
        start: fromMinutes(s.start),
        end: fromMinutes(s.end),
        handsOnHours: round(s.handsOnMin / 60, 3),
        restHours: round(s.restMin / 60, 3),
        restUntil: fromMinutes(s.restUntil),
        spiritL: round(sessionSpiritL[s.index] ?? 0, 4),
        segments: s.segments.map((g) => ({ start: fromMinutes(g.start), end: fromMinutes(g.end) })),
      })),
      dryingRoom: { start: fromMinutes(jobStart), end: fromMinutes(dryEnd), days: first ? dayOf(dryEnd) - dayOf(jobStart) + 1 : 0 },
    },
    price,
    ventilation: {
      ...vent,
      worstSession: { ...vent.worstSession, spiritL: round(vent.worstSession.spiritL, 4), evaporationLPerMin: round(vent.worstSession.evaporationLPerMin, 6) },
      worstDay: { ...vent.worstDay, spiritL: round(vent.worstDay.spiritL, 4) },
      days: vent.days.map((d) => ({ date: d.date, spiritL: round(d.spiritL, 4) })),
      components: vent.components.map((c) => ({
        ...c,
        evaporationLPerMin: round(c.evaporationLPerMin, 7),
        vapourM3h: round(c.vapourM3h, 4),
        requiredFlowM3h: round(c.requiredFlowM3h, 1),
        requiredFlowCfm: round(c.requiredFlowCfm, 1),
        concentrationPpm: round(c.concentrationPpm, 1),
      })),
      concentrationPpm: round(vent.concentrationPpm, 1),
      exposureIndex: round(vent.exposureIndex, 3),
      mixtureLelPct: round(vent.mixtureLelPct, 3),
      quarterLelPpm: round(vent.quarterLelPpm, 0),
      exposureFlowM3h: round(vent.exposureFlowM3h, 1),
      fireFlowM3h: round(vent.fireFlowM3h, 1),
      requiredFlowM3h: round(vent.requiredFlowM3h, 1),
      requiredFlowCfm: round(vent.requiredFlowCfm, 1),
    },
  };
}
