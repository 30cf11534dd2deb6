/**
 * Safety: spirit evaporated, vapour concentration against exposure limits and the lower explosive limit, the
 * fresh air the dilution-ventilation equation asks for, and the cautions every estimate carries.
 *
 * Solvent data: NIOSH Pocket Guide to Chemical Hazards (isopropanol density from memory). Ventilation: the
 * general dilution-ventilation equation of ACGIH "Industrial Ventilation" and the OSHA Technical Manual; for a
 * mixture, the additive rule of OSHA 29 CFR 1910.1000(d)(2): each solvent's air against its own limit, added.
 * Sources in our words: docs/references.md.
 */
import type { SafetySettings, SpiritComposition } from '../schemas/catalog';
import type { Caution } from '../schemas/calc';

/** A solvent's data. */
export interface SolventData {
  name: string;
  /** g/mol */
  molarMass: number;
  /** g/mL at 20 °C; numerically the specific gravity. */
  density: number;
  flashPointC: number;
  lelPct: number;
  uelPct: number;
  /** Strictest 8 h limit of OSHA PEL and NIOSH REL, ppm. */
  limitPpm: number;
  skin: boolean;
}

export type SolventKey = keyof SpiritComposition;

/** Solvent table (NIOSH Pocket Guide; isopropanol density from memory). */
export const SOLVENTS: Readonly<Record<SolventKey, SolventData>> = {
  ethanol: { name: 'ethanol', molarMass: 46.07, density: 0.789, flashPointC: 13, lelPct: 3.3, uelPct: 19, limitPpm: 1000, skin: false },
  methanol: { name: 'methanol', molarMass: 32.04, density: 0.791, flashPointC: 11, lelPct: 6.0, uelPct: 36.5, limitPpm: 200, skin: true },
  isopropanol: { name: 'isopropanol', molarMass: 60.1, density: 0.785, flashPointC: 12, lelPct: 2.0, uelPct: 12.7, limitPpm: 400, skin: false },
};

const SOLVENT_KEYS = Object.keys(SOLVENTS) as SolventKey[];

/** Litres of vapour per mole of ideal gas at 25 °C and 1 atm. */
export const MOLAR_VOLUME_L = 24.45;
/** Millilitres in a US pint (231 in³ / 8), from the inch. */
export const ML_PER_US_PINT = (231 * 16.387064) / 8;
/** m³/h in one ft³/min: 0.3048³ × 60. */
export const M3H_PER_CFM = 0.3048 ** 3 * 60;

/** Inputs of the dilution-ventilation equation, imperial form. */
export interface DilutionImperial {
  specificGravity: number;
  /** Evaporation rate, US pints per minute. */
  erPintsPerMin: number;
  /** Mixing factor K, 1–10. */
  k: number;
  molarMass: number;
  /** Allowed concentration, ppm. */
  ppm: number;
}

/**
 * Fresh air required, ft³/min: Q = 403 × 10⁶ × SG × ER × K / (MW × C) (ACGIH; OSHA Technical Manual).
 *
 * @example dilutionFlowCfm({ specificGravity: 0.789, erPintsPerMin: 0.01, k: 3, molarMass: 46.07, ppm: 1000 }) // ≈ 207
 */
export function dilutionFlowCfm(d: DilutionImperial): number {
  return (403e6 * d.specificGravity * d.erPintsPerMin * d.k) / (d.molarMass * d.ppm);
}

/** Inputs of the dilution-ventilation equation, metric form. */
export interface DilutionMetric {
  /** g/mL */
  density: number;
  /** Evaporation rate, litres of liquid per minute. */
  erLitresPerMin: number;
  k: number;
  molarMass: number;
  ppm: number;
}

/**
 * Fresh air required, m³/h, from the ideal-gas molar volume: vapour = ER × 1000 × ρ / MW mol/min × 24.45 L/mol;
 * Q = vapour × K × 10⁶ / C. Collected: Q = 1.467 × 10⁹ × ρ × ER × K / (MW × C). It agrees with the imperial form
 * within 1.5 %: 403 rests on 387 ft³ per lb-mole (24.1 L/mol, 70 °F) where 24.45 L/mol is 25 °C.
 *
 * @example dilutionFlowM3h({ density: 0.789, erLitresPerMin: 0.01, k: 3, molarMass: 46.07, ppm: 1000 }) // ≈ 7.5
 */
export function dilutionFlowM3h(d: DilutionMetric): number {
  const vapourM3h = ((d.erLitresPerMin * 1000 * d.density) / d.molarMass) * MOLAR_VOLUME_L * 0.06;
  return (vapourM3h * d.k * 1e6) / d.ppm;
}

/**
 * Vapour each solvent gives off, m³/h, when spirit of this composition evaporates at a rate (L/min).
 *
 * @example vapourM3h(0.01, { ethanol: 1, methanol: 0, isopropanol: 0 }).ethanol // ≈ 0.2513
 */
export function vapourM3h(erLitresPerMin: number, spirit: SpiritComposition): Record<SolventKey, number> {
  const out = { ethanol: 0, methanol: 0, isopropanol: 0 };
  for (const key of SOLVENT_KEYS) {
    const s = SOLVENTS[key];
    out[key] = ((erLitresPerMin * spirit[key] * 1000 * s.density) / s.molarMass) * MOLAR_VOLUME_L * 0.06;
  }
  return out;
}

/**
 * Lower explosive limit of a vapour mixture by Le Chatelier's rule: 1 / Σ (yᵢ / LELᵢ), y the vapour mole shares.
 *
 * @example mixtureLel({ ethanol: 0.5, methanol: 0.5, isopropanol: 0 }) // 1 / (0.5/3.3 + 0.5/6) ≈ 4.26
 */
export function mixtureLel(shares: Record<SolventKey, number>): number {
  const total = SOLVENT_KEYS.reduce((t, k) => t + shares[k], 0);
  const sum = SOLVENT_KEYS.reduce((t, k) => t + shares[k] / total / SOLVENTS[k].lelPct, 0);
  return 1 / sum;
}

/** Spirit used in one session. */
export interface SessionSpirit {
  index: number;
  /** Local date of the session, YYYY-MM-DD. */
  date: string;
  spiritL: number;
  handsOnMin: number;
}

/** A stage that gives off solvent vapour the ventilation figure does not count, with the materials that do. */
export interface UncoveredStage {
  stage: string;
  name: string;
  materials: string[];
}

/** One solvent of the spirit in the busiest session. */
export interface VentilationComponent {
  solvent: SolventKey;
  /** Share of the spirit by volume, 0–1. */
  share: number;
  /** Litres of this solvent evaporated per minute. */
  evaporationLPerMin: number;
  /** Vapour given off, m³/h. */
  vapourM3h: number;
  /** Its own 8 h exposure limit, ppm. */
  limitPpm: number;
  /** Fresh air that keeps this solvent alone at its own limit, m³/h (the mixing factor included). */
  requiredFlowM3h: number;
  requiredFlowCfm: number;
  /** Its concentration at the room's air supply, ppm. */
  concentrationPpm: number;
}

/** Ventilation figures for the job's worst session. */
export interface Ventilation {
  roomVolumeM3: number;
  airChangesPerHour: number;
  mixingFactor: number;
  worstSession: { index: number; spiritL: number; evaporationLPerMin: number };
  worstDay: { date: string; spiritL: number };
  days: Array<{ date: string; spiritL: number }>;
  components: VentilationComponent[];
  /** All vapour at the room's air supply, ppm. */
  concentrationPpm: number;
  /** Σ Cᵢ / Lᵢ at the room's air supply (OSHA 29 CFR 1910.1000(d)(2)(i)); above 1 the mixture is over its limit. */
  exposureIndex: number;
  mixtureLelPct: number;
  quarterLelPpm: number;
  /** Fresh air for the exposure limits: Σ of each solvent's own figure (additive mixture rule). */
  exposureFlowM3h: number;
  /** Fresh air that keeps the vapour below 25 % of the mixture's LEL. */
  fireFlowM3h: number;
  /** Which of the two asks for more air. */
  governs: 'exposure' | 'fire';
  requiredFlowM3h: number;
  requiredFlowCfm: number;
  suppliedFlowM3h: number;
  adequate: boolean;
  /** Stages whose own solvents (stripper, stain) the figure leaves out; named in the cautions. */
  notCovered: UncoveredStage[];
}

/**
 * Ventilation for the session that evaporates spirit fastest. All spirit of a session is taken to evaporate
 * during its hands-on time (conservative). Concentration at steady state: C = G × K / Q × 10⁶ with G the
 * vapour generated and Q the room's air supply (volume × air changes).
 *
 * Exposure: each solvent's evaporation is set against its own limit and the flows are added (the dilution
 * equation applied per component, ACGIH "Industrial Ventilation"; the additive rule of OSHA 29 CFR
 * 1910.1000(d)(2)(i), Σ Cᵢ/Lᵢ ≤ 1, holds exactly at that flow). Fire: all vapour against 25 % of the mixture's LEL
 * (Le Chatelier). The required flow is the larger of the two.
 */
export function ventilation(sessions: readonly SessionSpirit[], settings: SafetySettings, notCovered: readonly UncoveredStage[] = []): Ventilation {
  const k = settings.mixingFactor;
  const spirit = settings.spirit;
  let worst: SessionSpirit | null = null;
  let worstRate = 0;
  const byDay = new Map<string, number>();
  for (const s of sessions) {
    const rate = s.handsOnMin > 0 ? s.spiritL / s.handsOnMin : 0;
    if (!worst || rate > worstRate) {
      worst = s;
      worstRate = rate;
    }
    byDay.set(s.date, (byDay.get(s.date) ?? 0) + s.spiritL);
  }
  let worstDay = { date: '', spiritL: 0 };
  for (const [date, litres] of byDay) if (litres > worstDay.spiritL) worstDay = { date, spiritL: litres };

  const vapour = vapourM3h(worstRate, spirit);
  const generated = SOLVENT_KEYS.reduce((t, key) => t + vapour[key], 0);
  const supplied = settings.room.volumeM3 * settings.room.airChangesPerHour;
  const lel = generated > 0 ? mixtureLel(vapour) : mixtureLel({ ...spirit });
  const quarterLelPpm = 0.25 * lel * 10_000;

  const components: VentilationComponent[] = [];
  let fireCfm = 0;
  for (const key of SOLVENT_KEYS) {
    if (spirit[key] === 0) continue;
    const s = SOLVENTS[key];
    const er = worstRate * spirit[key];
    const pintsPerMin = (er * 1000) / ML_PER_US_PINT;
    components.push({
      solvent: key,
      share: spirit[key],
      evaporationLPerMin: er,
      vapourM3h: vapour[key],
      limitPpm: s.limitPpm,
      requiredFlowM3h: dilutionFlowM3h({ density: s.density, erLitresPerMin: er, k, molarMass: s.molarMass, ppm: s.limitPpm }),
      requiredFlowCfm: dilutionFlowCfm({ specificGravity: s.density, erPintsPerMin: pintsPerMin, k, molarMass: s.molarMass, ppm: s.limitPpm }),
      concentrationPpm: (vapour[key] * k * 1e6) / supplied,
    });
    fireCfm += dilutionFlowCfm({ specificGravity: s.density, erPintsPerMin: pintsPerMin, k, molarMass: s.molarMass, ppm: quarterLelPpm });
  }
  const exposureFlowM3h = components.reduce((t, c) => t + c.requiredFlowM3h, 0);
  const exposureFlowCfm = components.reduce((t, c) => t + c.requiredFlowCfm, 0);
  const fireFlowM3h = (generated * k * 1e6) / quarterLelPpm;
  const governs = fireFlowM3h > exposureFlowM3h ? 'fire' : 'exposure';
  const requiredM3h = Math.max(exposureFlowM3h, fireFlowM3h);
  return {
    roomVolumeM3: settings.room.volumeM3,
    airChangesPerHour: settings.room.airChangesPerHour,
    mixingFactor: k,
    worstSession: { index: worst?.index ?? 0, spiritL: worst?.spiritL ?? 0, evaporationLPerMin: worstRate },
    worstDay,
    days: [...byDay].map(([date, litres]) => ({ date, spiritL: litres })),
    components,
    concentrationPpm: (generated * k * 1e6) / supplied,
    exposureIndex: components.reduce((t, c) => t + c.concentrationPpm / c.limitPpm, 0),
    mixtureLelPct: lel,
    quarterLelPpm,
    exposureFlowM3h,
    fireFlowM3h,
    governs,
    requiredFlowM3h: requiredM3h,
    requiredFlowCfm: governs === 'fire' ? fireCfm : exposureFlowCfm,
    suppliedFlowM3h: supplied,
    adequate: supplied >= requiredM3h,
    notCovered: notCovered.map((u) => ({ ...u, materials: [...u.materials] })),
  };
}

/** What the customer reads for the ventilation caution: no figures, no room arithmetic. */
const PLAIN_VENTILATION =
  'Spirit vapour builds up while polishing: the finishing room is worked with its extraction running and fresh air coming in, so the vapour stays well below its exposure limits and far from the point where it could ignite.';

/** The staff's words for stages whose own solvents the ventilation figure leaves out. */
function uncoveredText(stages: readonly UncoveredStage[]): string {
  const names = stages.map((s) => `${s.name} (${s.materials.join(', ')})`).join('; ');
  return `The ventilation figure counts the polishing spirit only. These stages give off vapour of their own that it does not cover: ${names}. Ventilate for them as each product's safety data sheet says.`;
}

/**
 * The cautions every estimate carries, in plain words: no air-change arithmetic (the working is in the
 * ventilation figures, shown on staff screens only). Never empty.
 *
 * @example cautions(vent, spirit).map((c) => c.code) // ['flammable-vapour', 'ignition-sources', 'ventilation', ...]
 */
export function cautions(vent: Ventilation, spirit: SpiritComposition): Caution[] {
  const flash = Math.min(...SOLVENT_KEYS.filter((k) => spirit[k] > 0).map((k) => SOLVENTS[k].flashPointC));
  const list: Caution[] = [
    {
      code: 'flammable-vapour', severity: 'danger',
      text: `Spirit is highly flammable: its flash point is about ${flash} °C, below room temperature, so it gives off an ignitable vapour at any workshop temperature.`,
    },
    {
      code: 'ignition-sources', severity: 'danger',
      text: 'No naked flames, smoking, heaters with exposed elements or sparking tools where spirit or polish is open or drying.',
    },
    { code: 'ventilation', severity: 'warning', text: PLAIN_VENTILATION },
  ];
  if (vent.notCovered.length > 0) list.push({ code: 'other-solvents', severity: 'warning', text: uncoveredText(vent.notCovered) });
  list.push(
    {
      code: 'spirit-storage', severity: 'warning',
      text: 'Keep spirit and polish in closed, labelled metal containers in a flammable-liquids cabinet, away from exits and heat; take out only what the session needs.',
    },
    {
      code: 'oily-rags', severity: 'danger',
      text: 'Rags and rubbers with oil can heat up and catch fire on their own: spread them flat or hang them to dry outdoors, or keep them in a closed metal can of water until they can be.',
    },
    {
      code: 'gloves-eyes', severity: 'warning',
      text: 'Wear solvent-resistant gloves and eye protection when stripping, mixing polish and handling spirit.',
    },
  );
  if (spirit.methanol > 0) {
    list.push({
      code: 'methanol', severity: 'danger',
      text: `This spirit contains methanol (${Math.round(spirit.methanol * 100)} %): it is toxic by breathing, swallowing and through the skin. Ventilate, wear gloves, never use it in a closed room.`,
    });
  }
  list.push({
    code: 'local-rules', severity: 'info',
    text: 'Local fire codes, the workplace-safety regulator and licensed practice come first: these figures do not replace them.',
  });
  return list;
}

/**
 * The cautions as the customer reads them (public quote page, quote PDF, e-mail): fire, vapour, oily rags and
 * local rules in plain words, without the workshop's air-change arithmetic, evaporation rates or limits. Works on
 * the cautions of revisions saved before the cautions were plain, by code.
 *
 * @example customerCautions(result.cautions).find((c) => c.code === 'ventilation')?.text // no m³/h in it
 */
export function customerCautions(list: readonly Caution[]): Caution[] {
  return list.map((c) => {
    if (c.code === 'ventilation') return { code: c.code, severity: 'warning', text: PLAIN_VENTILATION };
    if (c.code === 'other-solvents') {
      return {
        code: c.code, severity: c.severity,
        text: 'Stripping and staining use products with vapour of their own besides the polishing spirit; they are used with the ventilation and protection their makers\' safety data sheets ask for.',
      };
    }
    if (c.code === 'methanol') return { ...c, text: c.text.replace(/\s*\(exposure limit [^)]*\)/, '') };
    if (c.code === 'local-rules') return { ...c, text: c.text.replace('these figures do not replace them', 'these notes do not replace them') };
    return { ...c };
  });
}

/** The sentence on ventilation for the customer's documents: no figures. */
export const CUSTOMER_VENTILATION_TEXT =
  'While we polish, the finishing room is ventilated with its extraction running and fresh air coming in, to keep spirit vapour well below its exposure limits.';
