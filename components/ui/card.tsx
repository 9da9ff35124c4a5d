import type { ReactNode } from "react";

export function Card({ title, actions, children, className = "" }: { title?: ReactNode; actions?: ReactNode; children: ReactNode; className?: string }) {
  return (
    <section className={`rounded-lg border border-ink-200 bg-white shadow-sm ${className}`}>
      {title || actions ? (
        <header className="flex flex-wrap items-center justify-between gap-2 border-b border-ink-100 px-5 py-3">
          {title ? <h2 className="text-base font-semibold">{title}</h2> : <span />}
          {actions}
        </header>
      ) : null}
      <div className="px-5 py-4">{children}</div>
    </section>
  );
}

export function PageHeader({ title, description, actions }: { title: ReactNode; description?: ReactNode; actions?: ReactNode }) {
  return (
    <div className="mb-6 flex flex-wrap items-end justify-between gap-4">
      <div>
        <h1>{title}</h1>
        {description ? <p className="mt-1 max-w-3xl text-ink-600">{description}</p> : null}
      </div>
      {actions ? <div className="flex flex-wrap gap-2">{actions}</div> : null}
    </div>
  );
}

export function StatTile({ label, value, tone = "neutral", href }: { label: ReactNode; value: ReactNode; tone?: "neutral" | "pass" | "fail" | "caution" | "brand"; href?: string }) {
  const color = { neutral: "text-ink-900", pass: "text-pass-700", fail: "text-fail-700", caution: "text-caution-700", brand: "text-estuary-700" }[tone];
  const body = (
    <>
      <p className="text-sm font-medium text-ink-600">{label}</p>
      <p className={`mt-1 text-3xl font-bold tabular-nums ${color}`}>{value}</p>
    </>
  );
  return href ? (
    <a href={href} className="block rounded-lg border border-ink-200 bg-white px-4 py-3 no-underline shadow-sm hover:border-estuary-300 hover:no-underline">
      {body}
    </a>
  ) : (
    <div className="rounded-lg border border-ink-200 bg-white px-4 py-3 shadow-sm">{body}</div>
  );
}
