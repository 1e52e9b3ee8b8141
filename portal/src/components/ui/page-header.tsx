import type { ReactNode } from "react";

export function PageHeader({ title, eyebrow, children, actions }: { title: ReactNode; eyebrow?: ReactNode; children?: ReactNode; actions?: ReactNode }) {
  return (
    <header className="mb-6 flex flex-wrap items-end justify-between gap-4 border-b border-line pb-5">
      <div className="min-w-0">
        {eyebrow ? <p className="text-sm font-semibold uppercase tracking-wide text-moss">{eyebrow}</p> : null}
        <h1 className="text-2xl font-bold text-ink sm:text-3xl">{title}</h1>
        {children ? <div className="mt-1.5 max-w-prose text-ink-soft">{children}</div> : null}
      </div>
      {actions ? <div className="no-print flex flex-wrap gap-2">{actions}</div> : null}
    </header>
  );
}

export function Section({ title, children, description, id }: { title: string; children: ReactNode; description?: ReactNode; id?: string }) {
  return (
    <section aria-labelledby={id ? `${id}-title` : undefined} className="mb-8">
      <h2 id={id ? `${id}-title` : undefined} className="mb-1 text-lg font-bold text-ink">
        {title}
      </h2>
      {description ? <div className="mb-3 max-w-prose text-sm text-ink-soft">{description}</div> : null}
      {children}
    </section>
  );
}
