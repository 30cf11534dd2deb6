/**
 * Countries (ISO 3166-1 alpha-2) with their English names and currencies (ISO 4217), from the countries-list
 * package, for the sign-up form: the country a workshop works in suggests its currency, paper size and measures.
 */
import { countries } from 'countries-list';

export interface CountryOption {
  code: string;
  name: string;
  /** The country's currencies, the usual one first. */
  currencies: string[];
}

/** Every country, by English name. */
export const COUNTRIES: readonly CountryOption[] = Object.entries(countries)
  .map(([code, c]) => ({ code, name: c.name, currencies: [...c.currency] }))
  .sort((a, b) => a.name.localeCompare(b.name, 'en'));

const BY_CODE = new Map(COUNTRIES.map((c) => [c.code, c]));

export function isCountryCode(code: string): boolean {
  return BY_CODE.has(code);
}

export function countryOf(code: string): CountryOption | undefined {
  return BY_CODE.get(code);
}

/** Every currency code some country uses, sorted. */
export const CURRENCY_CODES: readonly string[] = [...new Set(COUNTRIES.flatMap((c) => c.currencies))].sort();

export function isCurrencyCode(code: string): boolean {
  return CURRENCY_CODES.includes(code);
}

/** Countries whose offices print on US Letter rather than A4 (common practice). */
const LETTER_COUNTRIES = new Set(['US', 'CA', 'MX', 'PH', 'CL', 'CO', 'VE', 'GT', 'PR', 'DO', 'CR', 'SV', 'PA', 'NI', 'HN', 'BO']);

export function paperSizeOf(country: string): 'A4' | 'Letter' {
  return LETTER_COUNTRIES.has(country) ? 'Letter' : 'A4';
}
