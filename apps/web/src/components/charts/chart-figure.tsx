// The frame every chart sits in: a visible heading, a sentence on how to read it, the SVG (titled and
// described for assistive technology, focusable), a legend, a line that reads out the point in focus,
// and the same values as a table (the chart's text alternative).
import { useId, type ReactNode } from 'react';
import { saveFile } from '../../lib/api-client.ts';
import type { ChartSize } from './chart-layout.ts';
import { toCsv } from '@plumbline/contracts';

export type LegendItem = { key: string; symbol: ReactNode; label: string };

export function ChartLegend({ items }: { items: LegendItem[] }) {
  if (items.length === 0) return null;
  return (
    <ul className="mt-2 flex flex-wrap gap-x-4 gap-y-1 text-xs text-slate-700" aria-label="Legend">
      {items.map((item) => (
        <li key={item.key} className="inline-flex items-center gap-1.5">
          <span aria-hidden="true" className="inline-flex">
            {item.symbol}
          </span>
          {item.label}
        </li>
      ))}
    </ul>
  );
}

/** A small swatch of a line style for the legend. */
export function LineSwatch({ stroke, dash }: { stroke: string; dash?: string }) {
  return (
    <svg width="22" height="10" viewBox="0 0 22 10" aria-hidden="true" focusable="false">
      <line x1="1" x2="21" y1="5" y2="5" stroke={stroke} strokeWidth="2" strokeDasharray={dash} />
    </svg>
  );
}

/** A small swatch of a marker shape for the legend. */
export function MarkerSwatch({ path, fill, stroke }: { path: string; fill: string; stroke: string }) {
  return (
    <svg width="14" height="14" viewBox="-7 -7 14 14" aria-hidden="true" focusable="false">
      <path d={path} fill={fill} stroke={stroke} strokeWidth="1.5" />
    </svg>
  );
}

export function ChartFigure({
  title,
  headingLevel = 3,
  description,
  size,
  legend,
  readout,
  table,
  children,
  testId,
}: {
  title: string;
  headingLevel?: 2 | 3 | 4;
  /** How to read the chart; shown under the heading and given to the SVG as its description. */
  description: string;
  size: ChartSize;
  legend?: LegendItem[];
  /** What the point in focus stands for; null when no point is in focus. */
  readout: string | null;
  /** The same values as a table: the chart's text alternative. */
  table: ReactNode;
  /** The SVG's content, drawn in the size's coordinate system. */
  children: ReactNode;
  testId?: string;
}) {
  const headingId = useId();
  const titleId = useId();
  const descId = useId();
  const Heading = `h${headingLevel}` as 'h2' | 'h3' | 'h4';
  return (
    <section
      aria-labelledby={headingId}
      className="rounded-lg border border-slate-200 bg-white p-4 shadow-xs"
      data-testid={testId}
    >
      <Heading id={headingId} className="text-[0.95rem] font-semibold text-plumb-950">
        {title}
      </Heading>
      <p className="mt-0.5 text-xs leading-relaxed text-slate-600">{description}</p>
      <svg
        role="group"
        tabIndex={0}
        aria-labelledby={titleId}
        aria-describedby={descId}
        viewBox={`0 0 ${size.width} ${size.height}`}
        className="mt-3 block h-auto w-full overflow-visible font-sans"
        style={{ maxWidth: size.width }}
      >
        <title id={titleId}>{title}</title>
        <desc id={descId}>{description}</desc>
        {children}
      </svg>
      {legend ? <ChartLegend items={legend} /> : null}
      <p aria-live="polite" className="mt-2 min-h-5 text-sm text-slate-800">
        {readout ?? (
          <span className="text-xs text-slate-500">
            Point at a mark, or tab to the chart’s points and move with the arrow keys, to read its values.
          </span>
        )}
      </p>
      <details className="mt-2 text-sm">
        <summary className="cursor-pointer text-xs font-medium text-plumb-700 hover:text-plumb-900">
          Show the values as a table
        </summary>
        <div className="mt-2 overflow-x-auto">{table}</div>
      </details>
    </section>
  );
}

/** A compact table for a chart's values, with its CSV. `caption` names it for assistive technology. */
export function ChartTable({
  caption,
  headers,
  rows,
  filename,
}: {
  caption: string;
  headers: string[];
  /** Cells as text; the first cell of a row is its header. */
  rows: { key: string; cells: (string | number)[]; emphasis?: boolean }[];
  /** Name of the CSV file the values download as. */
  filename?: string;
}) {
  return (
    <>
      <table className="w-full border-collapse text-xs">
        <caption className="sr-only">{caption}</caption>
        <thead>
          <tr className="border-b border-slate-200 text-slate-500">
            {headers.map((header, index) => (
              <th
                key={header}
                scope="col"
                className={`px-2 py-1 font-medium ${index === 0 ? 'text-left' : 'text-right'}`}
              >
                {header}
              </th>
            ))}
          </tr>
        </thead>
        <tbody>
          {rows.map((row) => (
            <tr
              key={row.key}
              className={`border-b border-slate-100 ${row.emphasis ? 'bg-plumb-50 font-semibold' : ''}`}
            >
              {row.cells.map((cell, index) =>
                index === 0 ? (
                  <th
                    key={index}
                    scope="row"
                    className="px-2 py-1 text-left font-medium whitespace-nowrap text-slate-800"
                  >
                    {cell}
                  </th>
                ) : (
                  <td key={index} className="px-2 py-1 text-right whitespace-nowrap">
                    {cell}
                  </td>
                ),
              )}
            </tr>
          ))}
        </tbody>
      </table>
      <button
        type="button"
        onClick={() =>
          saveFile(
            new Blob(
              [
                toCsv(
                  headers,
                  rows.map((row) => row.cells),
                ),
              ],
              { type: 'text/csv;charset=utf-8' },
            ),
            filename ??
              `${caption
                .replace(/[^A-Za-z0-9]+/g, '-')
                .replace(/^-|-$/g, '')
                .toLowerCase()}.csv`,
          )
        }
        className="mt-2 text-xs font-medium text-plumb-700 underline decoration-plumb-300 underline-offset-2 hover:text-plumb-900"
      >
        Download these values as CSV
      </button>
    </>
  );
}
