import type { ReactNode } from 'react';

/** A small card of labelled facts (a description list), e.g. the user's lab, role and today's date. */
export function FactList({ title, facts }: { title: string; facts: { label: string; value: ReactNode }[] }) {
  return (
    <section
      aria-label={title}
      className="self-start rounded-lg border border-slate-200 bg-white p-5 shadow-xs"
    >
      <h2 className="text-xs font-semibold tracking-[0.12em] text-slate-500 uppercase">{title}</h2>
      <dl className="mt-3 space-y-3">
        {facts.map((fact) => (
          <div key={fact.label}>
            <dt className="text-xs text-slate-500">{fact.label}</dt>
            <dd className="mt-0.5 text-[0.95rem] font-medium text-slate-900">{fact.value}</dd>
          </div>
        ))}
      </dl>
    </section>
  );
}
