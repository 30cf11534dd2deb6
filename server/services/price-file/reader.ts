/**
 * The supplier price file read without storage: decoding, delimiter and decimal separator, headers, dates, units, and each row matched to the price list given as context (pure: no database).
 */
import { parse } from 'csv-parse/sync';
import Decimal from 'decimal.js';
import { MATERIAL_KINDS, MATERIAL_UNITS, type MaterialUnit } from '@shared/schemas/catalog';
import { DATE_RULES, dateProblem, isRealDate } from '@shared/schemas/dates';
import { keyFromName } from '@shared/schemas/finishing-admin';
import type { MaterialKind, PriceFileColumn, PriceFileMatch, PriceFileNewItem, PriceFilePreview as PreviewDto, PriceFileRowError } from '@shared/schemas/price-list';
import { problems } from '../../http/problem';
import { changePct, priceOn, showPrice, showSize, today } from '../price-list';

/** Largest file accepted (the route's multer limit uses it too). */
export const PRICE_FILE_MAX_BYTES = 512 * 1024;
const MAX_ROWS = 5000;
/** How long a preview may be applied after the upload. */
export const PREVIEW_MINUTES = 30;

const HEADER_ALIASES: Record<string, PriceFileColumn> = {
  supplier: 'supplier',
  suppliername: 'supplier',
  vendor: 'supplier',
  suppliercode: 'supplier_code',
  code: 'supplier_code',
  sku: 'supplier_code',
  itemcode: 'supplier_code',
  productcode: 'supplier_code',
  materialkey: 'material_key',
  material: 'material_key',
  key: 'material_key',
  description: 'description',
  name: 'description',
  item: 'description',
  product: 'description',
  packsize: 'pack_size',
  size: 'pack_size',
  pack: 'pack_size',
  quantity: 'pack_size',
  unit: 'unit',
  units: 'unit',
  uom: 'unit',
  price: 'price',
  packprice: 'price',
  netprice: 'price',
  unitprice: 'price',
  effectivedate: 'effective_date',
  effectivefrom: 'effective_date',
  effective: 'effective_date',
  validfrom: 'effective_date',
  date: 'effective_date',
  kind: 'kind',
  category: 'kind',
};

const normaliseHeader = (h: string) => h.toLowerCase().replace(/[\s_\-.()]/g, '');

/** Reads the file as UTF-8, or as Windows-1252 when it is not valid UTF-8 (spreadsheets often save that). */
function decode(buffer: Buffer): string {
  try {
    return new TextDecoder('utf-8', { fatal: true }).decode(buffer);
  } catch {
    return new TextDecoder('windows-1252').decode(buffer);
  }
}

/** Comma or semicolon: whichever the header line (outside quotes) holds more of. */
export function detectDelimiter(text: string): ',' | ';' {
  const firstLine = text.replace(/^\uFEFF/, '').split(/\r?\n/, 1)[0] ?? '';
  let inQuotes = false;
  let commas = 0;
  let semicolons = 0;
  for (const ch of firstLine) {
    if (ch === '"') inQuotes = !inQuotes;
    else if (!inQuotes && ch === ',') commas++;
    else if (!inQuotes && ch === ';') semicolons++;
  }
  return semicolons > commas ? ';' : ',';
}

/** The character that separates whole units from decimals in a file's numbers. */
export type DecimalSeparator = '.' | ',';

/**
 * The decimal separator a number's writing proves, or undefined when it could be either ("1,234", "1.234", "12"):
 * a separator followed by other than exactly three digits ("12,50", "7.5"), or the later of two different ones
 * ("1.234,50"), is the decimal separator.
 */
export function separatorOf(raw: string): DecimalSeparator | undefined {
  const s = raw.replace(/[^\d.,]/g, '');
  const lastComma = s.lastIndexOf(',');
  const lastDot = s.lastIndexOf('.');
  if (lastComma >= 0 && lastDot >= 0) return lastComma > lastDot ? ',' : '.';
  const at = Math.max(lastComma, lastDot);
  if (at < 0) return undefined;
  const sep = s[at] as DecimalSeparator;
  const groups = s.split(sep);
  // One separator followed by exactly three digits reads as thousands as well as decimals; more than one is grouping.
  if (groups.length > 2) return sep === ',' ? '.' : ',';
  return s.length - at - 1 === 3 ? undefined : sep;
}

/**
 * The file's decimal separator, for the numbers that could be read either way ("1,234", "1.234"): the one most of
 * its other prices and pack sizes prove (see separatorOf), or when none does (or as many prove each), the
 * delimiter's convention: a semicolon-separated file writes decimals with a comma, a comma-separated file with a
 * point. A number whose own writing proves its separator ("12,50", "1.234,50") is read by it.
 */
export function fileDecimalSeparator(cells: string[], delimiter: ',' | ';'): DecimalSeparator {
  const proven = cells.map(separatorOf).filter((s): s is DecimalSeparator => s !== undefined);
  const commas = proven.filter((s) => s === ',').length;
  const points = proven.length - commas;
  if (commas !== points) return commas > points ? ',' : '.';
  return delimiter === ';' ? ',' : '.';
}

/**
 * A decimal written by a supplier, read with the file's decimal separator: "12.50", "1,234.50", "£12.50" with a
 * point; "12,50", "1.234,50", "1 234,50" with a comma. A negative amount ("-5", "5-", "(5.00)" as accountants write
 * it) comes back with a minus so that the caller refuses it. Returns a dot-decimal string, or undefined when it is
 * not a number in that writing (grouping must be in threes; a separator the file does not use is not a number).
 *
 * @example readDecimal('12,50', ',') // "12.50"
 * @example readDecimal('1,234', '.') // "1234"
 * @example readDecimal('(5.00)', '.') // "-5.00"
 */
export function readDecimal(raw: string, decimal: DecimalSeparator = separatorOf(raw) ?? '.'): string | undefined {
  // Currency signs and codes around the number ("£", "EUR"), outside or inside accountants' brackets.
  const strip = (t: string) => t.trim().replace(/^[^\d\-.,()]+|[^\d.,\-()]+$/g, '');
  let s = strip(raw);
  let negative = false;
  const bracketed = /^\((.*)\)$/.exec(s);
  if (bracketed) {
    negative = true;
    s = strip(bracketed[1]!);
  }
  if (/[()]/.test(s)) return undefined;
  if (/^-|-$/.test(s)) {
    negative = true;
    s = s.replace(/^-|-$/g, '').replace(/^[^\d.,]+|[^\d.,]+$/g, '');
  }
  s = s.replace(/[\s\u00a0\u202f']/g, '');
  if (!s) return undefined;
  const group = decimal === ',' ? '.' : ',';
  const [whole, fraction, ...rest] = s.split(decimal);
  if (rest.length > 0 || whole === undefined) return undefined;
  if (whole.includes(group) && !new RegExp(`^\\d{1,3}(\\${group}\\d{3})+$`).test(whole)) return undefined;
  const digits = whole.split(group).join('');
  if (!/^\d+$/.test(digits) || (fraction !== undefined && !/^\d+$/.test(fraction))) return undefined;
  return `${negative ? '-' : ''}${digits}${fraction !== undefined ? `.${fraction}` : ''}`;
}

/** A change beyond these factors is flagged: a decimal slip or a pack/unit mix-up multiplies by 10, 100 or 1000. */
const FLAG_RISE = 3;
const FLAG_FALL = 1 / 3;
/** A price per g, mL, sheet or piece above this is flagged whatever the old price (no finishing material costs so). */
const FLAG_PER_UNIT: Record<MaterialUnit, number> = { g: 20, mL: 10, sheet: 50, each: 2000 };
/** A pack price at or above this is flagged. */
const FLAG_PACK = 10_000;

/**
 * Why a price in a file looks absurd, or null: it more than triples or falls below a third of the price in force,
 * costs more per unit than any finishing material does, or is a five-figure pack price. Flagged rows are shown in
 * the preview for the owner to look at; they are not refused (a supplier may really change a price that much).
 */
export function priceFlag(price: string, oldPrice: string | null, packSize: string | number, unit: MaterialUnit): string | null {
  const p = new Decimal(price);
  const reasons: string[] = [];
  if (oldPrice !== null && new Decimal(oldPrice).gt(0)) {
    const ratio = p.div(oldPrice);
    if (ratio.gt(FLAG_RISE)) reasons.push(`${ratio.toDecimalPlaces(1).toString()}× the price in force`);
    else if (ratio.lt(FLAG_FALL)) reasons.push(`${ratio.times(100).toDecimalPlaces(1).toString()}% of the price in force`);
  }
  const size = new Decimal(packSize);
  if (size.gt(0) && p.div(size).gt(FLAG_PER_UNIT[unit])) reasons.push(`more than ${FLAG_PER_UNIT[unit]} per ${unit}`);
  if (p.gte(FLAG_PACK)) reasons.push(`${FLAG_PACK.toLocaleString('en-GB')} or more for one pack`);
  return reasons.length ? `Check this price: ${reasons.join('; ')}.` : null;
}

/** YYYY-MM-DD, DD/MM/YYYY or DD.MM.YYYY (days first, as in the UK and Europe) to YYYY-MM-DD, checked. */
export function readDate(raw: string): string | undefined {
  const s = raw.trim();
  let iso: string | undefined;
  const ymd = /^(\d{4})-(\d{1,2})-(\d{1,2})$/.exec(s);
  const dmy = /^(\d{1,2})[/.](\d{1,2})[/.](\d{4})$/.exec(s);
  if (ymd) iso = `${ymd[1]}-${ymd[2]!.padStart(2, '0')}-${ymd[3]!.padStart(2, '0')}`;
  else if (dmy) iso = `${dmy[3]}-${dmy[2]!.padStart(2, '0')}-${dmy[1]!.padStart(2, '0')}`;
  return iso && isRealDate(iso) ? iso : undefined;
}

/** A unit as written, to the price list's unit and the factor that converts sizes into it. */
const UNIT_WORDS: Record<string, { unit: MaterialUnit; factor: number }> = {
  g: { unit: 'g', factor: 1 },
  gram: { unit: 'g', factor: 1 },
  grams: { unit: 'g', factor: 1 },
  kg: { unit: 'g', factor: 1000 },
  kilo: { unit: 'g', factor: 1000 },
  kilogram: { unit: 'g', factor: 1000 },
  kilograms: { unit: 'g', factor: 1000 },
  ml: { unit: 'mL', factor: 1 },
  millilitre: { unit: 'mL', factor: 1 },
  millilitres: { unit: 'mL', factor: 1 },
  l: { unit: 'mL', factor: 1000 },
  litre: { unit: 'mL', factor: 1000 },
  litres: { unit: 'mL', factor: 1000 },
  liter: { unit: 'mL', factor: 1000 },
  liters: { unit: 'mL', factor: 1000 },
  sheet: { unit: 'sheet', factor: 1 },
  sheets: { unit: 'sheet', factor: 1 },
  each: { unit: 'each', factor: 1 },
  ea: { unit: 'each', factor: 1 },
  pc: { unit: 'each', factor: 1 },
  pcs: { unit: 'each', factor: 1 },
  piece: { unit: 'each', factor: 1 },
  pieces: { unit: 'each', factor: 1 },
};

interface PackLite {
  id: number;
  materialId: number;
  size: string;
  supplier: string;
  supplierCode: string | null;
}

interface MaterialLite {
  id: number;
  key: string;
  name: string;
  unit: MaterialUnit;
}

export interface ParseContext {
  packsByCode: Map<string, PackLite>;
  packsByMaterialSize: Map<string, PackLite>;
  materialsByKey: Map<string, MaterialLite>;
  materialsByName: Map<string, MaterialLite>;
  materialsById: Map<number, MaterialLite>;
  pricesByPack: Map<number, { id: number; packId: number; price: string; effectiveFrom: string }[]>;
}

export const codeKey = (supplier: string, code: string) => `${supplier.trim().toLowerCase()}|${code.trim().toLowerCase()}`;
export const sizeKey = (materialId: number | string, size: string | number) => `${materialId}|${new Decimal(size).toString()}`;

type Parsed = Omit<PreviewDto, 'id' | 'expiresAt' | 'appliedAt' | 'fileName' | 'contentHash' | 'currency'>;

/** Reads the file into a preview. Throws 400 only for a file that cannot be read at all; bad rows are listed. */
export function readPriceFile(buffer: Buffer, ctx: ParseContext, onDate = today()): Parsed {
  const text = decode(buffer);
  if (!text.trim()) throw problems.badRequest('price_file_empty', 'The file is empty.', 'file');
  const nul = text.indexOf('\u0000');
  if (nul >= 0) {
    const line = text.slice(0, nul).split('\n').length;
    throw problems.badRequest('price_file_unreadable', `The file holds a NUL character (line ${line}): it is not a text CSV file.`, 'file');
  }
  const delimiter = detectDelimiter(text);
  let records: { record: string[]; info: { lines: number } }[];
  try {
    records = parse(text, { delimiter, bom: true, relax_column_count: true, skip_empty_lines: true, trim: true, info: true }) as unknown as typeof records;
  } catch (err) {
    const line = (err as { lines?: number }).lines;
    throw problems.badRequest('price_file_unreadable', `The file is not a readable CSV${line ? ` (line ${line})` : ''}: ${(err as Error).message}`, 'file');
  }
  if (records.length === 0) throw problems.badRequest('price_file_empty', 'The file has no header line.', 'file');
  if (records.length - 1 > MAX_ROWS) throw problems.badRequest('price_file_too_long', `The file has ${records.length - 1} rows; at most ${MAX_ROWS} are read at once.`, 'file');

  const header = records[0]!.record;
  const columns: string[] = [];
  const unknownColumns: string[] = [];
  const index = new Map<PriceFileColumn, number>();
  header.forEach((h, i) => {
    const col = HEADER_ALIASES[normaliseHeader(h)];
    if (col && !index.has(col)) {
      index.set(col, i);
      columns.push(col);
    } else if (h.trim()) unknownColumns.push(h.trim());
  });
  const missing: string[] = [];
  if (!index.has('supplier')) missing.push('supplier');
  if (!index.has('price')) missing.push('price');
  if (!index.has('supplier_code') && !index.has('material_key') && !index.has('description')) missing.push('supplier_code (or material_key with pack_size)');
  if (missing.length > 0) {
    throw problems.badRequest('price_file_columns', `The header line lacks the column${missing.length > 1 ? 's' : ''} ${missing.join(', ')}. Found: ${header.join(', ') || 'nothing'}.`, 'file');
  }

  // One decimal separator for the whole file, from its prices and pack sizes (see fileDecimalSeparator).
  const numberCells = records.slice(1).flatMap(({ record }) => (['price', 'pack_size'] as const).map((c) => (index.has(c) ? (record[index.get(c)!] ?? '').trim() : '')).filter(Boolean));
  const decimal = fileDecimalSeparator(numberCells, delimiter);
  /** A number as the file writes it: by its own separator when its writing proves one, else by the file's. */
  const readNumber = (raw: string) => readDecimal(raw, separatorOf(raw) ?? decimal);

  const matched: PriceFileMatch[] = [];
  const unchanged: PriceFileMatch[] = [];
  const newItems: PriceFileNewItem[] = [];
  const errors: PriceFileRowError[] = [];
  const seenTargets = new Map<string, number>();
  const newMaterialKeys = new Map<string, { key: string; name: string; unit: MaterialUnit; kind: MaterialKind }>();
  const reservedKeys = new Set<string>();

  for (const { record, info } of records.slice(1)) {
    const line = info.lines;
    const cell = (col: PriceFileColumn) => {
      const i = index.get(col);
      return i === undefined ? '' : (record[i] ?? '').trim();
    };
    if (record.every((v) => !v.trim())) continue;
    if (record.length > header.length) {
      errors.push({ line, reason: `has ${record.length} fields but the header has ${header.length} (a price with a decimal comma in a comma-separated file must be in quotes)` });
      continue;
    }
    const supplier = cell('supplier');
    const code = cell('supplier_code');
    const materialKey = cell('material_key').toLowerCase();
    const description = cell('description');
    const problemsHere: string[] = [];
    if (!supplier) problemsHere.push('supplier is empty');
    const rawPrice = cell('price');
    const price = readNumber(rawPrice);
    if (!rawPrice) problemsHere.push('price is empty');
    else if (price === undefined) problemsHere.push(`price "${rawPrice}" is not an amount`);
    else if (price.startsWith('-')) problemsHere.push(`price "${rawPrice}" is negative; a price must be more than zero`);
    else if (new Decimal(price).lte(0)) problemsHere.push(`price ${rawPrice} must be more than zero`);
    else if (new Decimal(price).decimalPlaces() > 4 || new Decimal(price).gte(1e8)) problemsHere.push(`price ${rawPrice} has more than 4 decimals or is too large`);
    const rawDate = cell('effective_date');
    const effectiveFrom = rawDate ? readDate(rawDate) : onDate;
    const dateWhy = rawDate && effectiveFrom ? dateProblem(effectiveFrom, DATE_RULES.priceEffective) : undefined;
    if (rawDate && !effectiveFrom) problemsHere.push(`effective date "${rawDate}" is not a date (use YYYY-MM-DD or DD/MM/YYYY; it must be a real calendar day)`);
    else if (dateWhy) problemsHere.push(`effective date "${rawDate}" ${dateWhy}`);
    const rawUnit = cell('unit');
    const unitWord = rawUnit ? UNIT_WORDS[rawUnit.toLowerCase()] : undefined;
    if (rawUnit && !unitWord) problemsHere.push(`unit "${rawUnit}" is not one of g, kg, mL, L, sheet, each`);
    const rawSize = cell('pack_size');
    const sizeText = rawSize ? readNumber(rawSize) : undefined;
    if (rawSize && (sizeText === undefined || new Decimal(sizeText).lte(0))) problemsHere.push(`pack size "${rawSize}" is not a positive number`);
    if (!code && !materialKey && !description) problemsHere.push('has neither a supplier code nor a material key nor a description');
    if (problemsHere.length > 0) {
      errors.push({ line, reason: problemsHere.join('; ') });
      continue;
    }
    /** The size in the material's unit, or an error message. */
    const sizeIn = (unit: MaterialUnit): string | { error: string } | undefined => {
      if (!sizeText) return undefined;
      if (unitWord && unitWord.unit !== unit) return { error: `unit ${rawUnit} does not fit a material counted in ${unit}` };
      const size = new Decimal(sizeText).times(unitWord?.factor ?? 1);
      if (size.decimalPlaces() > 3) return { error: `pack size ${rawSize} has more than 3 decimals` };
      return size.toString();
    };

    // 1. The supplier's code for a pack we already buy.
    let pack = code ? ctx.packsByCode.get(codeKey(supplier, code)) : undefined;
    // 2. Material key (or the exact material name) and pack size.
    const material = pack
      ? ctx.materialsById.get(pack.materialId)
      : (materialKey ? ctx.materialsByKey.get(materialKey) : undefined) ?? (description ? ctx.materialsByName.get(description.toLowerCase()) : undefined);
    if (materialKey && !pack && !material && !description) {
      errors.push({ line, reason: `material key "${materialKey}" is not in the price list and the row has no description to add it by` });
      continue;
    }
    if (!pack && material) {
      const size = sizeIn(material.unit);
      if (typeof size === 'object') {
        errors.push({ line, reason: size.error });
        continue;
      }
      if (size) pack = ctx.packsByMaterialSize.get(sizeKey(material.id, size));
    }
    if (pack && material) {
      const size = sizeIn(material.unit);
      if (typeof size === 'object') {
        errors.push({ line, reason: size.error });
        continue;
      }
      if (size && !new Decimal(size).eq(pack.size)) {
        errors.push({ line, reason: `pack size ${showSize(size)} ${material.unit} differs from the ${showSize(pack.size)} ${material.unit} pack with code ${code}` });
        continue;
      }
      const target = `pack|${pack.id}|${effectiveFrom}`;
      if (seenTargets.has(target)) {
        errors.push({ line, reason: `repeats the pack and date of line ${seenTargets.get(target)}` });
        continue;
      }
      seenTargets.set(target, line);
      const old = priceOn(ctx.pricesByPack.get(pack.id) ?? [], effectiveFrom!);
      const row: PriceFileMatch = {
        line,
        packId: pack.id,
        materialId: material.id,
        materialName: material.name,
        packSize: showSize(pack.size),
        unit: material.unit,
        supplier: pack.supplier || supplier,
        supplierCode: pack.supplierCode ?? (code || null),
        oldPrice: old ? showPrice(old.price) : null,
        newPrice: showPrice(price!),
        changePct: old ? changePct(old.price, price!) : null,
        effectiveFrom: effectiveFrom!,
        flag: priceFlag(price!, old?.price ?? null, pack.size, material.unit),
      };
      if (old && new Decimal(old.price).eq(price!)) unchanged.push(row);
      else matched.push(row);
      continue;
    }

    // 3. Something new: a pack of a material we have, or a material we do not have yet.
    if (!sizeText) {
      errors.push({ line, reason: code ? `supplier code ${code} is not in the price list for ${supplier}, and the row has no pack size to add it with` : 'has no pack size' });
      continue;
    }
    let kind: MaterialKind = 'other';
    const rawKind = cell('kind').toLowerCase();
    if (rawKind) {
      if (!(MATERIAL_KINDS as readonly string[]).includes(rawKind)) {
        errors.push({ line, reason: `kind "${cell('kind')}" is not one of ${MATERIAL_KINDS.join(', ')}` });
        continue;
      }
      kind = rawKind as MaterialKind;
    }
    let target: { materialId: number | null; key: string; name: string; unit: MaterialUnit; kind: MaterialKind };
    if (material) {
      target = { materialId: material.id, key: material.key, name: material.name, unit: material.unit, kind };
    } else {
      const groupKey = (materialKey || description).toLowerCase();
      const existing = newMaterialKeys.get(groupKey);
      if (existing) {
        target = { materialId: null, ...existing };
      } else {
        if (!description) {
          errors.push({ line, reason: 'a new material needs a description to name it' });
          continue;
        }
        if (!unitWord) {
          errors.push({ line, reason: `a new material needs a unit (${MATERIAL_UNITS.join(', ')}, kg or L)` });
          continue;
        }
        let key = materialKey && /^[a-z0-9][a-z0-9-]{0,63}$/.test(materialKey) ? materialKey : keyFromName(description);
        for (let n = 2; ctx.materialsByKey.has(key) || reservedKeys.has(key); n++) key = `${keyFromName(description).slice(0, 60)}-${n}`;
        reservedKeys.add(key);
        const created = { key, name: description.slice(0, 120), unit: unitWord.unit, kind };
        newMaterialKeys.set(groupKey, created);
        target = { materialId: null, ...created };
      }
    }
    const size = sizeIn(target.unit);
    if (typeof size === 'object' || size === undefined) {
      errors.push({ line, reason: typeof size === 'object' ? size.error : 'has no pack size' });
      continue;
    }
    const dupKey = `new|${target.key}|${size}|${effectiveFrom}`;
    if (seenTargets.has(dupKey)) {
      errors.push({ line, reason: `repeats the new pack of line ${seenTargets.get(dupKey)}` });
      continue;
    }
    const packKey = `new|${target.key}|${size}`;
    if (seenTargets.has(packKey)) {
      errors.push({ line, reason: `gives a second price for the new pack of line ${seenTargets.get(packKey)}; add it first, then upload later prices` });
      continue;
    }
    seenTargets.set(dupKey, line);
    seenTargets.set(packKey, line);
    newItems.push({
      line,
      kind: target.materialId ? 'new-pack' : 'new-material',
      materialId: target.materialId,
      materialKey: target.key,
      materialName: target.name,
      materialKind: target.kind,
      packSize: size,
      unit: target.unit,
      supplier,
      supplierCode: code || null,
      newPrice: showPrice(price!),
      effectiveFrom: effectiveFrom!,
      flag: priceFlag(price!, null, size, target.unit),
    });
  }

  const rowCount = records.length - 1;
  return {
    delimiter,
    decimalSeparator: decimal,
    rowCount,
    columns,
    unknownColumns,
    matched,
    unchanged,
    newItems,
    errors,
    canApply: errors.length === 0 && matched.length + newItems.length > 0,
  };

}
