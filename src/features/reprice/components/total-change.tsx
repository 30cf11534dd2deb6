import { ArrowDownRight, ArrowUpRight, Minus } from 'lucide-react';
import { formatMoneyDelta } from '@/lib/format-figures';
import { formatChange } from '@/lib/format';
import { totalChange, type Direction } from '../lib/change';

const STYLE: Record<Direction, { Icon: typeof Minus; word: string; tone: string }> = {
  up: { Icon: ArrowUpRight, word: 'up', tone: 'border-brick-600/30 bg-brick-100 text-brick-700' },
  down: { Icon: ArrowDownRight, word: 'down', tone: 'border-moss-600/30 bg-moss-100 text-moss-700' },
  same: { Icon: Minus, word: 'no change', tone: 'border-parchment-300 bg-parchment-100 text-walnut-600' },
};

/** How a total moves: an arrow and a word, the amount and the percent, so it never relies on colour alone. */
export function TotalChange({ oldTotal, newTotal, currency }: { oldTotal: string; newTotal: string; currency: string }) {
  const change = totalChange(oldTotal, newTotal);
  const { Icon, word, tone } = STYLE[change.direction];
  return (
    <span className="inline-flex items-center justify-end gap-2 whitespace-nowrap" data-direction={change.direction}>
      <span className={`inline-flex items-center gap-0.5 rounded-full border px-1.5 py-0.5 text-xs font-medium ${tone}`}>
        <Icon className="h-3 w-3" aria-hidden />
        {word}
      </span>
      {change.direction !== 'same' && (
        <>
          <span className="num font-medium text-walnut-900">{formatMoneyDelta(change.amount, currency)}</span>
          {change.pct !== null && <span className="num text-xs text-walnut-500">{formatChange(change.pct)}</span>}
        </>
      )}
    </span>
  );
}
