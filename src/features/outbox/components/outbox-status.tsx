import { CircleAlert, Clock, MailCheck, type LucideIcon } from 'lucide-react';
import type { OutboxSummary } from '@shared/schemas/quotes';

const STYLE: Record<OutboxSummary['status'], { label: string; Icon: LucideIcon; box: string }> = {
  sent: { label: 'Sent', Icon: MailCheck, box: 'border-moss-600/50 bg-moss-100 text-moss-700' },
  failed: { label: 'Failed', Icon: CircleAlert, box: 'border-dotted border-brick-600/60 bg-brick-100 text-brick-700' },
  queued: { label: 'Queued', Icon: Clock, box: 'border-dashed border-walnut-300 bg-parchment-100 text-walnut-700' },
  sending: { label: 'Sending', Icon: Clock, box: 'border-dashed border-amber-400 bg-amber-50 text-amber-800' },
};

export const OUTBOX_STATUS_LABELS = { sent: 'Sent', failed: 'Failed', queued: 'Queued' } as const;

/** A message's status as a word with an icon, never colour alone. */
export function OutboxStatus({ status }: { status: OutboxSummary['status'] }) {
  const { label, Icon, box } = STYLE[status];
  return (
    <span className={`inline-flex items-center gap-1 whitespace-nowrap rounded-full border px-2 py-0.5 text-xs font-medium ${box}`} data-status={status}>
      <Icon className="h-3.5 w-3.5" aria-hidden />
      {label}
    </span>
  );
}
