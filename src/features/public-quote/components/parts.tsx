import { Flame, Info, Mail, MapPin, Phone, ShieldAlert, TriangleAlert } from 'lucide-react';
import type { ReactNode } from 'react';
import type { PublicQuote } from '@shared/schemas/quotes';

type Workshop = PublicQuote['workshop'];

/** The workshop's name and how to reach it: the page's letterhead. */
export function Letterhead({ workshop }: { workshop: Workshop | null }) {
  return (
    <header className="bg-walnut-900 text-parchment-100">
      <div className="mx-auto flex max-w-4xl flex-col gap-3 px-4 py-5 sm:flex-row sm:items-end sm:justify-between sm:px-6 sm:py-7">
        <div>
          <p className="text-xs font-semibold uppercase tracking-[0.2em] text-amber-300">French polishing &amp; restoration</p>
          <p className="mt-1 font-serif text-2xl font-semibold text-parchment-50 sm:text-3xl">{workshop?.name ?? 'Your quote'}</p>
        </div>
        {workshop && <Contact workshop={workshop} className="text-sm text-parchment-200 sm:text-right" />}
      </div>
      <div className="h-1 bg-gradient-to-r from-amber-500 via-amber-300 to-amber-600" aria-hidden />
    </header>
  );
}

export function Contact({ workshop, className = '' }: { workshop: Workshop; className?: string }) {
  const line = 'flex items-center gap-1.5 sm:justify-end';
  return (
    <address className={`not-italic ${className}`}>
      {workshop.phone && (
        <p className={line}>
          <Phone className="h-3.5 w-3.5" aria-hidden /> <a href={`tel:${workshop.phone.replace(/\s+/g, '')}`} className="hover:underline">{workshop.phone}</a>
        </p>
      )}
      {workshop.email && (
        <p className={line}>
          <Mail className="h-3.5 w-3.5" aria-hidden /> <a href={`mailto:${workshop.email}`} className="break-all hover:underline">{workshop.email}</a>
        </p>
      )}
      {workshop.address && (
        <p className={line}>
          <MapPin className="h-3.5 w-3.5 shrink-0" aria-hidden /> {workshop.address.replace(/\n/g, ', ')}
        </p>
      )}
    </address>
  );
}

export function Section({ id, title, children, className = '' }: { id: string; title: string; children: ReactNode; className?: string }) {
  return (
    <section aria-labelledby={id} className={`rounded-xl border border-parchment-200 bg-white p-5 shadow-card sm:p-6 ${className}`}>
      <h2 id={id} className="mb-3 font-serif text-xl font-semibold text-walnut-900">
        {title}
      </h2>
      {children}
    </section>
  );
}

const SEVERITY = {
  danger: { word: 'Danger', Icon: Flame, box: 'border-brick-600/40 bg-brick-100/70 text-brick-700' },
  warning: { word: 'Warning', Icon: TriangleAlert, box: 'border-amber-500/50 bg-amber-50 text-amber-800' },
  info: { word: 'Note', Icon: Info, box: 'border-walnut-200 bg-parchment-50 text-walnut-700' },
} as const;

/** The fire, vapour and rag cautions that go with every French-polishing job. */
export function Safety({ cautions }: { cautions: PublicQuote['cautions'] }) {
  return (
    <section aria-labelledby="safety-heading" className="rounded-xl border border-brick-600/30 bg-white shadow-card">
      <header className="flex items-center gap-2 border-b border-brick-600/20 bg-brick-100/50 px-5 py-3 sm:px-6">
        <ShieldAlert className="h-5 w-5 text-brick-700" aria-hidden />
        <h2 id="safety-heading" className="font-serif text-xl font-semibold text-brick-700">Safety</h2>
      </header>
      <div className="space-y-2 px-5 py-4 text-sm sm:px-6">
        <p className="text-walnut-700">
          French polishing uses shellac dissolved in spirit, which gives off flammable vapour. We do the work under our ventilation and fire
          precautions; if you keep or touch up polished pieces at home, these notes apply to you too.
        </p>
        <ul className="space-y-1.5">
          {cautions.map((c) => {
            const s = SEVERITY[c.severity as keyof typeof SEVERITY] ?? SEVERITY.info;
            return (
              <li key={c.code} className={`flex gap-2 rounded-md border px-3 py-2 ${s.box}`}>
                <s.Icon className="mt-0.5 h-4 w-4 shrink-0" aria-hidden />
                <span>
                  <span className="font-semibold">{s.word}: </span>
                  {c.text}
                </span>
              </li>
            );
          })}
        </ul>
      </div>
    </section>
  );
}
