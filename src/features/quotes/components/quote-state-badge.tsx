import { Ban, Banknote, CircleCheck, CircleX, Eye, Hourglass, PencilLine, Send, type LucideIcon } from 'lucide-react';
import { QUOTE_STATE_LABELS, type QuoteState } from '@shared/schemas/quotes';

/** Each quote state has a word, an icon and a border style, so that it never depends on colour alone. */
const STYLE: Record<QuoteState, { Icon: LucideIcon; box: string }> = {
  draft: { Icon: PencilLine, box: 'border-dashed border-walnut-300 bg-white text-walnut-700' },
  quoted: { Icon: Send, box: 'border-walnut-300 bg-parchment-100 text-walnut-800' },
  viewed: { Icon: Eye, box: 'border-amber-400 bg-amber-50 text-amber-800' },
  accepted: { Icon: CircleCheck, box: 'border-moss-600/50 bg-moss-100 text-moss-700' },
  declined: { Icon: CircleX, box: 'border-dotted border-brick-600/60 bg-brick-100 text-brick-700' },
  expired: { Icon: Hourglass, box: 'border-dotted border-walnut-300 bg-walnut-50 text-walnut-600' },
  'deposit-paid': { Icon: Banknote, box: 'border-double border-moss-600/60 bg-moss-100 text-moss-700' },
  withdrawn: { Icon: Ban, box: 'border-dashed border-walnut-300 bg-walnut-50 text-walnut-500' },
};

export function QuoteStateBadge({ state }: { state: QuoteState }) {
  const { Icon, box } = STYLE[state];
  return (
    <span className={`inline-flex items-center gap-1 whitespace-nowrap rounded-full border px-2 py-0.5 text-xs font-medium ${box}`} data-quote-state={state}>
      <Icon className="h-3.5 w-3.5" aria-hidden />
      {QUOTE_STATE_LABELS[state]}
    </span>
  );
}

export const QUOTE_STATE_ICONS: Record<QuoteState, LucideIcon> = Object.fromEntries(
  Object.entries(STYLE).map(([k, v]) => [k, v.Icon]),
) as Record<QuoteState, LucideIcon>;
