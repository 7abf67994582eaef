import type { ReactNode } from "react";
import { cx } from "./cx";

export function PageHeader({ title, subtitle, actions }: { title: ReactNode; subtitle?: ReactNode; actions?: ReactNode }) {
  return (
    <header className="mb-5 flex flex-wrap items-end justify-between gap-3">
      <div>
        <h1 className="text-2xl font-bold tracking-tight">{title}</h1>
        {subtitle && <p className="mt-1 text-ink-soft">{subtitle}</p>}
      </div>
      {actions && <div className="no-print flex flex-wrap gap-2">{actions}</div>}
    </header>
  );
}

export function Card({ title, children, className, actions }: { title?: ReactNode; children: ReactNode; className?: string; actions?: ReactNode }) {
  return (
    <section className={cx("min-w-0 rounded-card border border-paper-line bg-paper-raised p-4 shadow-card", className)}>
      {(title || actions) && (
        <div className="mb-3 flex items-center justify-between gap-2">
          {title && <h2 className="text-lg font-semibold">{title}</h2>}
          {actions}
        </div>
      )}
      {children}
    </section>
  );
}

/** A sentence for an empty list, with what to do next. */
export function EmptyState({ children }: { children: ReactNode }) {
  return <p className="rounded-md border border-dashed border-paper-line p-6 text-center text-ink-faint">{children}</p>;
}

export function ErrorNote({ children }: { children: ReactNode }) {
  return (
    <p role="alert" className="rounded-md border border-stop/40 bg-stop-light px-3 py-2 text-stop">
      {children}
    </p>
  );
}

export function Loading({ what = "Loading" }: { what?: string }) {
  return (
    <p className="py-6 text-ink-faint" aria-live="polite">
      {what}…
    </p>
  );
}

/** Label/value pairs for a record's details. */
export function Facts({ items }: { items: [ReactNode, ReactNode][] }) {
  return (
    <dl className="grid grid-cols-[max-content_1fr] gap-x-4 gap-y-1 text-sm">
      {items.map(([k, v], i) => (
        <div key={i} className="contents">
          <dt className="text-ink-faint">{k}</dt>
          <dd className="font-medium">{v ?? "—"}</dd>
        </div>
      ))}
    </dl>
  );
}
