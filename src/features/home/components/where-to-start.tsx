/**
 * A first visit explains itself: each role sees where its work starts, with links to those pages. It stays until
 * dismissed (remembered in this browser, per person) and can be opened again from the overview.
 */
import { Compass, X } from 'lucide-react';
import { useState } from 'react';
import { Link } from 'react-router-dom';
import type { Role } from '@shared/schemas/auth';
import { paths } from '@/config/paths';

interface Step {
  to: string;
  label: string;
  text: string;
}

/** Where each role starts, in the order the work goes. */
export const START_HERE: Record<Role, Step[]> = {
  owner: [
    { to: paths.priceList, label: 'Price list', text: 'check what the workshop pays for shellac, spirit and the rest; a supplier\u2019s file updates it in one go' },
    { to: paths.settings, label: 'Settings', text: 'labour rates, overheads, margin, tax, opening hours and the drying room' },
    { to: paths.estimates, label: 'Estimates', text: 'every priced job; reprice the open ones after a price change' },
    { to: paths.auditLog, label: 'Audit log', text: 'who changed which price or setting, and when' },
  ],
  estimator: [
    { to: paths.customers, label: 'Customers', text: 'open a customer, add the piece with its measurements and photos' },
    { to: paths.estimates, label: 'Estimates', text: 'from the piece, New estimate prices the case part by part, coat by coat' },
    { to: paths.finishingSystems, label: 'Finishing systems', text: 'the stages, cuts and rests each estimate starts from' },
  ],
  sales: [
    { to: paths.estimates, label: 'Estimates', text: 'priced estimates are ready to quote: open one and prepare the quote' },
    { to: paths.quotes, label: 'Quotes', text: 'what was sent, accepted or paid, and what waits for an answer' },
    { to: paths.outbox, label: 'Outbox', text: 'every e-mail sent to customers, and any that did not go' },
  ],
  workshop: [
    { to: paths.planning, label: 'Planning', text: 'today\u2019s and tomorrow\u2019s sessions (mark them done from the bench), the drying room and the polishers\u2019 week' },
    { to: paths.forecast, label: 'Forecast', text: 'the shellac, spirit and abrasives the coming weeks will use' },
  ],
};

const KEY = (userId: number) => `shellwright:welcome-seen:${userId}`;

function seen(userId: number): boolean {
  try {
    return window.localStorage.getItem(KEY(userId)) === '1';
  } catch {
    return false;
  }
}

export function WhereToStart({ userId, role }: { userId: number; role: Role }) {
  const [open, setOpen] = useState(() => !seen(userId));
  const close = () => {
    try {
      window.localStorage.setItem(KEY(userId), '1');
    } catch {
      // Without storage the card simply shows again next time.
    }
    setOpen(false);
  };
  if (!open) {
    return (
      <button type="button" onClick={() => setOpen(true)} className="mb-4 inline-flex items-center gap-1.5 text-sm text-walnut-600 underline decoration-walnut-300 underline-offset-2 hover:text-walnut-900">
        <Compass className="h-4 w-4" aria-hidden /> Where to start
      </button>
    );
  }
  return (
    <section aria-labelledby="where-to-start" className="mb-6 rounded-xl border border-amber-300 bg-amber-50/60 px-4 py-4 sm:px-5" data-testid="where-to-start">
      <div className="flex items-start justify-between gap-3">
        <h2 id="where-to-start" className="flex items-center gap-2 text-lg font-semibold text-walnut-900">
          <Compass className="h-5 w-5 text-amber-700" aria-hidden /> Where to start
        </h2>
        <button type="button" onClick={close} className="rounded p-1 text-walnut-600 hover:bg-amber-100" aria-label="Close: I know my way">
          <X className="h-4 w-4" aria-hidden />
        </button>
      </div>
      <ol className="mt-2 space-y-2 text-sm text-walnut-800">
        {START_HERE[role].map((step, i) => (
          <li key={step.to} className="flex gap-2">
            <span className="num font-semibold text-amber-800">{i + 1}.</span>
            <span>
              <Link to={step.to} className="font-semibold text-walnut-900 underline decoration-amber-400 underline-offset-2 hover:text-amber-800">
                {step.label}
              </Link>
              : {step.text}.
            </span>
          </li>
        ))}
      </ol>
    </section>
  );
}
