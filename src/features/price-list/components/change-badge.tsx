import { ArrowDownRight, ArrowUpRight, Minus } from 'lucide-react';
import { formatChange } from '@/lib/format';

/** A price change with an arrow and its sign in words, so it never relies on colour alone. */
export function ChangeBadge({ pct, title }: { pct: string | null; title?: string }) {
  if (pct === null) return <span className="text-xs text-walnut-400">—</span>;
  const n = Number(pct);
  const [Icon, tone, word] =
    n > 0 ? [ArrowUpRight, 'bg-brick-100 text-brick-700', 'up'] : n < 0 ? [ArrowDownRight, 'bg-moss-100 text-moss-700', 'down'] : [Minus, 'bg-parchment-100 text-walnut-600', 'no change'];
  return (
    <span className={`num inline-flex items-center gap-0.5 rounded-full px-1.5 py-0.5 text-xs font-medium ${tone}`} title={title}>
      <Icon className="h-3 w-3" aria-hidden />
      <span className="sr-only">{word} </span>
      {formatChange(pct)}
    </span>
  );
}
