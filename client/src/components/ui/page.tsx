import type { ReactNode } from 'react';
import { Link } from 'react-router-dom';

export function PageHeader({ title, lead, actions, back }: { title: ReactNode; lead?: ReactNode; actions?: ReactNode; back?: { to: string; label: string } }) {
  return (
    <header className="mb-5 flex flex-col gap-3 sm:flex-row sm:items-end sm:justify-between">
      <div className="flex flex-col gap-1">
        {back ? (
          <Link to={back.to} className="inline-flex min-h-6 items-center text-sm">
            ← {back.label}
          </Link>
        ) : null}
        <h1 tabIndex={-1} className="text-2xl font-bold tracking-tight focus:outline-none">
          {title}
        </h1>
        {lead ? <div className="text-slate-soft">{lead}</div> : null}
      </div>
      {actions ? <div className="flex flex-wrap gap-2">{actions}</div> : null}
    </header>
  );
}

export function Card({ title, children, actions, className = '' }: { title?: ReactNode; children: ReactNode; actions?: ReactNode; className?: string }) {
  return (
    <section className={`rounded-card border border-seam bg-cloth-raised p-4 sm:p-5 ${className}`}>
      {title || actions ? (
        <div className="mb-3 flex flex-wrap items-center justify-between gap-2">
          {title ? <h2 className="text-lg font-semibold">{title}</h2> : <span />}
          {actions}
        </div>
      ) : null}
      {children}
    </section>
  );
}

/** A definition list for a record's fields: two columns on a desktop, stacked on a phone. */
export function Facts({ items }: { items: { label: string; value: ReactNode }[] }) {
  return (
    <dl className="grid grid-cols-1 gap-x-6 gap-y-3 sm:grid-cols-2">
      {items.map((it) => (
        <div key={it.label} className="flex flex-col">
          <dt className="text-xs font-semibold uppercase tracking-wide text-slate-soft">{it.label}</dt>
          <dd className="tabular-nums">{it.value === '' || it.value == null ? '—' : it.value}</dd>
        </div>
      ))}
    </dl>
  );
}
