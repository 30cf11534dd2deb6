import { AlertTriangle, Info, OctagonAlert } from 'lucide-react';
import type { ReactNode } from 'react';

const TONES = {
  error: { box: 'border-brick-600/40 bg-brick-100 text-brick-700', Icon: OctagonAlert, label: 'Error' },
  warning: { box: 'border-amber-500/50 bg-amber-50 text-amber-800', Icon: AlertTriangle, label: 'Caution' },
  info: { box: 'border-walnut-200 bg-parchment-100 text-walnut-800', Icon: Info, label: 'Note' },
} as const;

/** A message with an icon and a word for its kind, so it never relies on colour alone. */
export function Alert({ tone = 'info', title, children }: { tone?: keyof typeof TONES; title?: ReactNode; children?: ReactNode }) {
  const { box, Icon, label } = TONES[tone];
  return (
    <div role={tone === 'error' ? 'alert' : 'status'} className={`flex gap-3 rounded-lg border px-4 py-3 text-sm ${box}`}>
      <Icon className="mt-0.5 h-4 w-4 shrink-0" aria-hidden />
      <div>
        <p className="font-semibold">
          <span className="sr-only">{label}: </span>
          {title ?? label}
        </p>
        {children && <div className="mt-0.5">{children}</div>}
      </div>
    </div>
  );
}
