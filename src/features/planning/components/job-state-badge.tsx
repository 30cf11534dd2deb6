import { Ban, CalendarCheck, CircleCheck, CircleDashed, Hammer, type LucideIcon } from 'lucide-react';
import { JOB_STATE_LABELS, type JobState } from '@shared/schemas/planning';

/** Each state has a word, an icon and a border style, so that it never depends on colour alone. */
const STYLE: Record<JobState, { Icon: LucideIcon; box: string }> = {
  unbooked: { Icon: CircleDashed, box: 'border-dashed border-walnut-300 bg-white text-walnut-700' },
  booked: { Icon: CalendarCheck, box: 'border-amber-400 bg-amber-50 text-amber-800' },
  'in-progress': { Icon: Hammer, box: 'border-walnut-400 bg-parchment-100 text-walnut-800' },
  finished: { Icon: CircleCheck, box: 'border-moss-600/50 bg-moss-100 text-moss-700' },
  cancelled: { Icon: Ban, box: 'border-dotted border-walnut-300 bg-walnut-50 text-walnut-500' },
};

export function JobStateBadge({ state }: { state: JobState }) {
  const { Icon, box } = STYLE[state];
  return (
    <span className={`inline-flex items-center gap-1 whitespace-nowrap rounded-full border px-2 py-0.5 text-xs font-medium ${box}`} data-state={state}>
      <Icon className="h-3.5 w-3.5" aria-hidden />
      {JOB_STATE_LABELS[state]}
    </span>
  );
}
