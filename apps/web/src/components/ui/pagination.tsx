import { formatCount } from '../../utils/format.ts';
import { Button } from './button.tsx';

/** Server-side paging: which rows are shown out of how many, and the previous and next pages. */
export function Pagination({
  total,
  limit,
  offset,
  onOffsetChange,
  label,
}: {
  total: number;
  limit: number;
  offset: number;
  onOffsetChange: (offset: number) => void;
  /** Names the paged list for assistive technology, e.g. "Audit events pages". */
  label: string;
}) {
  if (total === 0) return null;
  const first = offset + 1;
  const last = Math.min(offset + limit, total);
  return (
    <nav
      aria-label={label}
      className="mt-3 flex flex-wrap items-center justify-between gap-3 text-sm text-slate-600"
    >
      <p className="figures">
        Rows {formatCount(first)}–{formatCount(last)} of {formatCount(total)}
      </p>
      <div className="flex gap-2">
        <Button
          variant="secondary"
          size="sm"
          disabled={offset === 0}
          onClick={() => onOffsetChange(Math.max(0, offset - limit))}
        >
          Previous
        </Button>
        <Button
          variant="secondary"
          size="sm"
          disabled={last >= total}
          onClick={() => onOffsetChange(offset + limit)}
        >
          Next
        </Button>
      </div>
    </nav>
  );
}
