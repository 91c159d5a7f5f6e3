import { Link } from 'react-router-dom';

/** A link to another area, with one line on what the user does there. */
export function LinkCard({ to, title, description }: { to: string; title: string; description: string }) {
  return (
    <Link
      to={to}
      className="group flex flex-col rounded-lg border border-slate-200 bg-white p-5 shadow-xs transition-colors hover:border-plumb-300 hover:bg-plumb-50/40"
    >
      <span className="flex items-center justify-between text-[0.95rem] font-semibold text-plumb-900">
        {title}
        <span aria-hidden="true" className="text-plumb-400 transition-transform group-hover:translate-x-0.5">
          &rarr;
        </span>
      </span>
      <span className="mt-1.5 text-sm leading-relaxed text-slate-600">{description}</span>
    </Link>
  );
}
