import { Banknote, BadgeCheck, CircleCheck, CircleX, Eye, Hourglass, PencilLine, Send, type LucideIcon } from 'lucide-react';
import { ESTIMATE_STATE_LABELS, type EstimateState } from '@shared/schemas/estimates';

/** Each state has a word, an icon and a border style, so that it never depends on colour alone. */
const STYLE: Record<EstimateState, { Icon: LucideIcon; box: string }> = {
  draft: { Icon: PencilLine, box: 'border-dashed border-walnut-300 bg-white text-walnut-700' },
  priced: { Icon: BadgeCheck, box: 'border-amber-400 bg-amber-50 text-amber-800' },
  quoted: { Icon: Send, box: 'border-walnut-300 bg-parchment-100 text-walnut-800' },
  viewed: { Icon: Eye, box: 'border-walnut-300 bg-parchment-100 text-walnut-800' },
  accepted: { Icon: CircleCheck, box: 'border-moss-600/50 bg-moss-100 text-moss-700' },
  declined: { Icon: CircleX, box: 'border-dotted border-brick-600/60 bg-brick-100 text-brick-700' },
  expired: { Icon: Hourglass, box: 'border-dotted border-walnut-300 bg-walnut-50 text-walnut-600' },
  'deposit-paid': { Icon: Banknote, box: 'border-double border-moss-600/60 bg-moss-100 text-moss-700' },
};

export function StateBadge({ state }: { state: EstimateState }) {
  const { Icon, box } = STYLE[state];
  return (
    <span className={`inline-flex items-center gap-1 whitespace-nowrap rounded-full border px-2 py-0.5 text-xs font-medium ${box}`} data-state={state}>
      <Icon className="h-3.5 w-3.5" aria-hidden />
      {ESTIMATE_STATE_LABELS[state]}
    </span>
  );
}
