/** Areas, volumes, masses and material quantities in the chosen display units (metric or imperial). */
import { formatArea, formatLength, formatMass, formatVolume, type UnitSystem, type VolumeMeasure } from '@shared/units';

export { formatArea, formatLength, formatMass, formatVolume };

/** A material quantity in its catalog unit (g, mL, sheet, each), shown in the display system. */
export function formatQuantity(quantity: number, unit: string, system: UnitSystem, measure: VolumeMeasure = 'us'): string {
  switch (unit) {
    case 'g':
      return formatMass(quantity, system);
    case 'mL':
      return formatVolume(quantity / 1000, system, measure);
    case 'sheet':
      return `${round(quantity)} ${quantity === 1 ? 'sheet' : 'sheets'}`;
    default:
      return `${round(quantity)} ${quantity === 1 ? 'piece' : 'pieces'}`;
  }
}

function round(q: number): string {
  return Number.isInteger(q) ? String(q) : q.toFixed(q >= 10 ? 1 : 2);
}

/** A pack as bought: "2 × 500 g". */
export function formatPack(size: number, count: number, unit: string, system: UnitSystem, label?: string, measure: VolumeMeasure = 'us'): string {
  return `${count} × ${label && label.trim() !== '' ? label : formatQuantity(size, unit, system, measure)}`;
}
