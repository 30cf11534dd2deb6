import { Banknote, CircleCheck, CircleX, Eye, FilePlus2, Send, type LucideIcon } from 'lucide-react';
import type { QuoteSummary } from '@shared/schemas/quotes';
import { formatDateTime } from '@/lib/format';
import { milestones, type Milestone } from '../lib/milestones';

const ICONS: Record<Milestone['key'], LucideIcon> = {
  created: FilePlus2,
  sent: Send,
  viewed: Eye,
  accepted: CircleCheck,
  declined: CircleX,
  deposit: Banknote,
};

/** A quote's dates in one line each, short enough for a list. */
export function QuoteDates({ quote, className = '' }: { quote: QuoteSummary; className?: string }) {
  return (
    <ul className={`flex flex-wrap gap-x-3 gap-y-0.5 text-xs text-walnut-600 ${className}`}>
      {milestones(quote).map((m) => {
        const Icon = ICONS[m.key];
        return (
          <li key={m.key} className="inline-flex items-center gap-1 whitespace-nowrap">
            <Icon className="h-3 w-3 text-amber-600" aria-hidden />
            {m.label} <span className="num">{formatDateTime(m.at)}</span>
          </li>
        );
      })}
    </ul>
  );
}

export { ICONS as MILESTONE_ICONS };
