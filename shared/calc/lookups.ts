/**
 * Look-ups the engine builds from a catalog, built once and kept for as long as the catalog's lists live. The
 * engine runs on every keystroke with the same catalog; rebuilding these maps on every call was measurable.
 *
 * Each look-up is keyed by the list (or object) it is built from, not by the catalog as a whole, so a catalog
 * whose list is replaced (`catalog.materials = [...]`, as a price change does) gets fresh look-ups at once. A
 * catalog is treated as immutable in place, as checkCatalog already does for its validation.
 */
import type { Catalog, LabourRate, Material, Species } from '../schemas/catalog';
import { compileCalendar } from './calendar';
import type { CompiledCalendar } from './calendar';

function memo<K extends object, V>(build: (key: K) => V): (key: K) => V {
  const cache = new WeakMap<K, V>();
  return (key: K): V => {
    let value = cache.get(key);
    if (value === undefined) {
      value = build(key);
      cache.set(key, value);
    }
    return value;
  };
}

/** Species by key. */
export const speciesMap = memo((species: readonly Species[]): ReadonlyMap<string, Species> => new Map(species.map((s) => [s.key, s])));

/** Materials by key. */
export const materialMap = memo((materials: readonly Material[]): ReadonlyMap<string, Material> => new Map(materials.map((m) => [m.key, m])));

/** Labour rates by key (the first of a key wins, as Array.prototype.find would). */
export const rateMap = memo((rates: readonly LabourRate[]): ReadonlyMap<string, LabourRate> => {
  const out = new Map<string, LabourRate>();
  for (const r of rates) if (!out.has(r.key)) out.set(r.key, r);
  return out;
});

/** The working calendar compiled for fast look-up (throws, uncached, for a calendar without opening hours). */
export const compiledCalendar = memo((calendar: Catalog['calendar']): CompiledCalendar => compileCalendar(calendar));
