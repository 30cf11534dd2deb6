import { Beaker, Brush, Droplet, Droplets, FlaskConical, Layers, Package, Scissors, Sparkles, Wind, type LucideIcon } from 'lucide-react';
import { MATERIAL_KIND_LABELS, type MaterialKind } from '@shared/schemas/price-list';

const ICONS: Record<MaterialKind, LucideIcon> = {
  shellac: Sparkles,
  spirit: FlaskConical,
  pumice: Wind,
  oil: Droplet,
  abrasive: Layers,
  wax: Brush,
  stripper: Beaker,
  wadding: Package,
  cloth: Scissors,
  stain: Droplets,
  other: Package,
};

export function KindBadge({ kind }: { kind: MaterialKind }) {
  const Icon = ICONS[kind];
  return (
    <span className="inline-flex items-center gap-1 whitespace-nowrap rounded-full bg-parchment-100 px-2 py-0.5 text-xs font-medium text-walnut-700">
      <Icon className="h-3.5 w-3.5 text-amber-600" aria-hidden /> {MATERIAL_KIND_LABELS[kind]}
    </span>
  );
}
