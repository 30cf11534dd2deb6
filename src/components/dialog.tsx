import { X } from 'lucide-react';
import { useEffect, useId, useRef, type ReactNode } from 'react';

/** A modal dialog: Escape or the close button dismisses it; focus moves into it on open. */
export function Dialog({ title, open, onClose, children, wide = false }: { title: string; open: boolean; onClose: () => void; children: ReactNode; wide?: boolean }) {
  const titleId = useId();
  const panel = useRef<HTMLDivElement>(null);
  useEffect(() => {
    if (!open) return;
    const first = panel.current?.querySelector<HTMLElement>('input, select, textarea, button:not([data-close])');
    first?.focus();
    const onKey = (e: KeyboardEvent) => e.key === 'Escape' && onClose();
    document.addEventListener('keydown', onKey);
    return () => document.removeEventListener('keydown', onKey);
  }, [open, onClose]);
  if (!open) return null;
  return (
    <div className="fixed inset-0 z-50 flex items-start justify-center overflow-y-auto bg-walnut-950/45 p-4 pt-[10vh]">
      <div ref={panel} role="dialog" aria-modal="true" aria-labelledby={titleId} className={`w-full ${wide ? 'max-w-3xl' : 'max-w-lg'} rounded-xl border border-parchment-200 bg-white shadow-2xl`}>
        <header className="flex items-center justify-between border-b border-parchment-200 px-5 py-3">
          <h2 id={titleId} className="text-lg font-semibold text-walnut-800">
            {title}
          </h2>
          <button type="button" data-close onClick={onClose} className="rounded p-1 text-walnut-500 hover:bg-walnut-50" aria-label="Close">
            <X className="h-4 w-4" aria-hidden />
          </button>
        </header>
        <div className="px-5 py-4">{children}</div>
      </div>
    </div>
  );
}
