import type { ReactNode } from 'react';
import { PlumbMark } from './logo.tsx';

/** What an area will hold once it has data: a title, one sentence, optionally the items to expect. */
export function EmptyState({
  title,
  description,
  expected,
  children,
}: {
  title: string;
  description: string;
  expected?: string[];
  children?: ReactNode;
}) {
  return (
    <section
      aria-label={title}
      className="flex gap-5 rounded-lg border border-dashed border-plumb-300 bg-white px-6 py-8"
    >
      <PlumbMark className="h-12 w-9 shrink-0" lineClassName="text-plumb-300" />
      <div className="max-w-2xl">
        <h2 className="text-base font-semibold text-plumb-900">{title}</h2>
        <p className="mt-1 text-sm leading-relaxed text-slate-700">{description}</p>
        {expected && expected.length > 0 ? (
          <ul className="mt-3 list-disc space-y-1 pl-5 text-sm text-slate-700 marker:text-brass-500">
            {expected.map((item) => (
              <li key={item}>{item}</li>
            ))}
          </ul>
        ) : null}
        {children}
      </div>
    </section>
  );
}
