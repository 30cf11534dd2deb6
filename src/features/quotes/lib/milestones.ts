import type { QuoteSummary } from '@shared/schemas/quotes';

export interface Milestone {
  key: 'created' | 'sent' | 'viewed' | 'accepted' | 'declined' | 'deposit';
  label: string;
  at: string;
}

/** A quote's dated events, oldest first: made, sent, opened, answered, deposit paid. */
export function milestones(q: Pick<QuoteSummary, 'createdAt' | 'sentAt' | 'viewedAt' | 'acceptedAt' | 'declinedAt' | 'depositPaidAt'>): Milestone[] {
  const all: (Milestone | null)[] = [
    { key: 'created', label: 'Prepared', at: q.createdAt },
    q.sentAt ? { key: 'sent', label: 'Sent', at: q.sentAt } : null,
    q.viewedAt ? { key: 'viewed', label: 'Opened', at: q.viewedAt } : null,
    q.acceptedAt ? { key: 'accepted', label: 'Accepted', at: q.acceptedAt } : null,
    q.declinedAt ? { key: 'declined', label: 'Declined', at: q.declinedAt } : null,
    q.depositPaidAt ? { key: 'deposit', label: 'Deposit paid', at: q.depositPaidAt } : null,
  ];
  return all.filter((m): m is Milestone => m !== null).sort((a, b) => a.at.localeCompare(b.at));
}

/** The latest thing that happened to a quote, for a one-line summary beside its state. */
export function lastMilestone(q: Parameters<typeof milestones>[0]): Milestone {
  const list = milestones(q);
  return list[list.length - 1]!;
}
