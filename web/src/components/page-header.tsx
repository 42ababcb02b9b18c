import type { ReactNode } from 'react';

export function PageHeader({ title, eyebrow, children }: { title: ReactNode; eyebrow?: ReactNode; children?: ReactNode }) {
  return (
    <header className="mb-6 flex flex-wrap items-end justify-between gap-4 border-b border-ink-200 pb-4">
      <div className="min-w-0">
        {eyebrow && <div className="mb-1 text-caption font-medium uppercase tracking-wider text-ink-600">{eyebrow}</div>}
        <h1 className="text-display font-semibold text-ink-950 break-words">{title}</h1>
      </div>
      {children && <div className="flex flex-wrap items-center gap-2">{children}</div>}
    </header>
  );
}

export function Section({ title, id, children, actions, className = '' }: { title: string; id?: string; children: ReactNode; actions?: ReactNode; className?: string }) {
  const headingId = id ? `${id}-title` : undefined;
  return (
    <section aria-labelledby={headingId} id={id} className={`rounded-lg border border-ink-200 bg-white p-4 sm:p-5 ${className}`}>
      <div className="mb-3 flex flex-wrap items-center justify-between gap-2">
        <h2 id={headingId} className="text-title font-semibold text-ink-950">{title}</h2>
        {actions}
      </div>
      {children}
    </section>
  );
}
