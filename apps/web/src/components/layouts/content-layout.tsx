import type { ReactNode } from 'react';
import { Head } from '../ui/head.tsx';

/** The frame of one page inside the app: its title (tab and heading), a short description, content. */
export function ContentLayout({
  title,
  area,
  description,
  actions,
  width = 'default',
  children,
}: {
  title: string;
  /** Small label above the heading naming the area, e.g. the lab or "Network". */
  area?: string;
  description?: ReactNode;
  actions?: ReactNode;
  /** 'wide' for pages built around a wide table (catalogue, audit log); reading pages keep the default. */
  width?: 'default' | 'wide';
  children: ReactNode;
}) {
  return (
    <>
      <Head title={title} />
      <div className={`mx-auto px-6 py-8 md:px-10 ${width === 'wide' ? 'max-w-[100rem]' : 'max-w-6xl'}`}>
        <div className="flex flex-col gap-4 border-b border-slate-200 pb-6 md:flex-row md:items-end md:justify-between">
          <div>
            {area ? (
              <p className="text-xs font-semibold tracking-[0.12em] text-brass-700 uppercase">{area}</p>
            ) : null}
            <h1 className="mt-1 text-2xl font-semibold text-plumb-950">{title}</h1>
            {description ? (
              <p className="mt-2 max-w-3xl text-[0.95rem] text-slate-700">{description}</p>
            ) : null}
          </div>
          {actions ? <div className="flex shrink-0 gap-2">{actions}</div> : null}
        </div>
        <div className="pt-6">{children}</div>
      </div>
    </>
  );
}
