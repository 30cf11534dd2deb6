import type { ReactNode } from 'react';

export function Card({ title, actions, children, className = '' }: { title?: ReactNode; actions?: ReactNode; children: ReactNode; className?: string }) {
  return (
    <section className={`min-w-0 rounded-xl border border-parchment-200 bg-white shadow-card ${className}`}>
      {(title || actions) && (
        <header className="flex flex-wrap items-center justify-between gap-x-4 gap-y-2 border-b border-parchment-200 px-4 py-3 sm:px-5">
          {title && <h2 className="text-lg font-semibold text-walnut-800">{title}</h2>}
          {actions}
        </header>
      )}
      <div className="px-4 py-4 sm:px-5">{children}</div>
    </section>
  );
}

export function PageHeader({ title, description, actions }: { title: string; description?: ReactNode; actions?: ReactNode }) {
  return (
    <div className="mb-6 flex flex-wrap items-end justify-between gap-4 border-b border-walnut-100 pb-4">
      <div className="min-w-0">
        <h1 className="text-2xl font-semibold tracking-tight text-walnut-900 sm:text-3xl">{title}</h1>
        {description && <p className="mt-1 max-w-3xl text-walnut-600">{description}</p>}
      </div>
      {actions && <div className="flex flex-wrap gap-2">{actions}</div>}
    </div>
  );
}
