import type { ReactNode } from 'react';

export function Card({ title, actions, children, className = '' }: { title?: ReactNode; actions?: ReactNode; children: ReactNode; className?: string }) {
  return (
    <section className={`rounded-xl border border-parchment-200 bg-white shadow-card ${className}`}>
      {(title || actions) && (
        <header className="flex items-center justify-between gap-4 border-b border-parchment-200 px-5 py-3">
          {title && <h2 className="text-lg font-semibold text-walnut-800">{title}</h2>}
          {actions}
        </header>
      )}
      <div className="px-5 py-4">{children}</div>
    </section>
  );
}

export function PageHeader({ title, description, actions }: { title: string; description?: ReactNode; actions?: ReactNode }) {
  return (
    <div className="mb-6 flex flex-wrap items-end justify-between gap-4 border-b border-walnut-100 pb-4">
      <div>
        <h1 className="text-3xl font-semibold tracking-tight text-walnut-900">{title}</h1>
        {description && <p className="mt-1 max-w-3xl text-walnut-600">{description}</p>}
      </div>
      {actions && <div className="flex gap-2">{actions}</div>}
    </div>
  );
}
