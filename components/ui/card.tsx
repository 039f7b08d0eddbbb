import type { ReactNode } from 'react';

export function Card({ title, actions, children, id }: { title?: ReactNode; actions?: ReactNode; children: ReactNode; id?: string }) {
  return (
    <section id={id} aria-labelledby={title && id ? `${id}-title` : undefined} className="rounded-card border border-line bg-white/70 p-5">
      {title || actions ? (
        <div className="mb-3 flex flex-wrap items-center justify-between gap-2">
          {title ? (
            <h2 id={id ? `${id}-title` : undefined} className="text-lg font-bold">
              {title}
            </h2>
          ) : null}
          {actions}
        </div>
      ) : null}
      {children}
    </section>
  );
}

export function PageHeader({ title, eyebrow, children }: { title: ReactNode; eyebrow?: ReactNode; children?: ReactNode }) {
  return (
    <header className="mb-6 flex flex-wrap items-end justify-between gap-4 border-b border-line pb-4">
      <div>
        {eyebrow ? <p className="text-sm font-bold uppercase tracking-wide text-brine">{eyebrow}</p> : null}
        <h1 className="text-2xl font-bold">{title}</h1>
      </div>
      {children ? <div className="flex flex-wrap gap-2">{children}</div> : null}
    </header>
  );
}

/** An honest empty state: what would be here, and why it is not. */
export function EmptyState({ title, children }: { title: string; children?: ReactNode }) {
  return (
    <div className="rounded-card border border-dashed border-line bg-paper-deep/50 px-4 py-6 text-center">
      <p className="font-bold text-ink-soft">{title}</p>
      {children ? <div className="mt-1 text-sm text-brine">{children}</div> : null}
    </div>
  );
}

export function DefinitionList({ items }: { items: { term: string; detail: ReactNode }[] }) {
  return (
    <dl className="grid grid-cols-1 gap-x-6 gap-y-2 sm:grid-cols-[max-content_1fr]">
      {items.map((item) => (
        <div key={item.term} className="contents">
          <dt className="text-sm font-bold text-brine">{item.term}</dt>
          <dd className="text-ink">{item.detail}</dd>
        </div>
      ))}
    </dl>
  );
}
