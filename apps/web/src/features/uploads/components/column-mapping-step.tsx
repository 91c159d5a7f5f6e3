import { useId } from 'react';
import type { Delimiter, UploadPreview } from '@plumbline/contracts';
import { Alert } from '../../../components/ui/alert.tsx';
import { Button } from '../../../components/ui/button.tsx';
import { formatPeriod } from '../../../utils/format.ts';
import { mappingIssues, sampleValue, type MappingDraft } from '../utils/column-mapping.ts';

const delimiterNames: Record<Delimiter, string> = { ',': 'commas', ';': 'semicolons', '\t': 'tabs' };
const SAMPLE_ROWS_SHOWN = 5;

function FileShape({ preview }: { preview: UploadPreview }) {
  const facts = [`Cells separated by ${delimiterNames[preview.delimiter]}`];
  if (preview.decimalComma) facts.push('decimal commas (5,4 is read as 5.4)');
  if (preview.bom) facts.push('UTF-8 with a byte-order mark');
  return <>{facts.join(', ')}.</>;
}

function SampleRows({ preview }: { preview: UploadPreview }) {
  if (preview.rows.length === 0) return null;
  return (
    <details className="mt-4 rounded-md border border-slate-200 bg-white">
      <summary className="cursor-pointer px-3 py-2 text-sm font-medium text-plumb-800">
        Show the first lines of the file
      </summary>
      <div className="overflow-x-auto border-t border-slate-200">
        <table className="w-full text-left text-xs">
          <thead className="bg-slate-50 text-slate-600">
            <tr>
              {preview.headers.map((header, index) => (
                <th
                  key={`${header}-${index}`}
                  scope="col"
                  className="px-3 py-1.5 font-medium whitespace-nowrap"
                >
                  {header}
                </th>
              ))}
            </tr>
          </thead>
          <tbody>
            {preview.rows.slice(0, SAMPLE_ROWS_SHOWN).map((row, rowIndex) => (
              <tr key={rowIndex} className="border-t border-slate-100">
                {preview.headers.map((_, index) => (
                  <td key={index} className="px-3 py-1.5 whitespace-nowrap text-slate-800">
                    {row[index] ?? ''}
                  </td>
                ))}
              </tr>
            ))}
          </tbody>
        </table>
      </div>
    </details>
  );
}

/**
 * Step two: which column of the file holds each of Plumbline's columns, prefilled from the lab's saved
 * mapping or from the header names. The mapping is saved for the lab when the file is sent.
 */
export function ColumnMappingStep({
  preview,
  fileName,
  draft,
  periods,
  onChange,
  onUpload,
  onChooseAnother,
  isUploading,
  uploadError,
}: {
  preview: UploadPreview;
  fileName: string;
  draft: MappingDraft;
  /** The months found in the first rows. */
  periods: string[];
  onChange: (column: string, header: string | null) => void;
  onUpload: () => void;
  onChooseAnother: () => void;
  isUploading: boolean;
  uploadError: string | null;
}) {
  const baseId = useId();
  const issues = mappingIssues(preview.columns, draft);
  const issueOf = (column: string) => issues.find((issue) => issue.column === column)?.message ?? null;

  return (
    <section aria-labelledby={`${baseId}-heading`}>
      <h2 id={`${baseId}-heading`} className="text-base font-semibold text-plumb-950">
        Match the columns of {fileName}
      </h2>
      <p className="mt-1 text-sm text-slate-700">
        <FileShape preview={preview} />{' '}
        {preview.mappingSource === 'saved'
          ? 'Your lab’s saved column choices are filled in.'
          : 'Columns were matched by their names; check them.'}{' '}
        Your choices are kept for your lab’s next file of this kind.
      </p>
      {periods.length > 0 ? (
        <p className="mt-1 text-sm text-slate-700">
          Month of the first rows:{' '}
          <strong className="font-semibold">{periods.map(formatPeriod).join(', ')}</strong>
        </p>
      ) : null}

      <div className="mt-4 overflow-x-auto rounded-lg border border-slate-200 bg-white">
        <table className="w-full text-left text-sm">
          <thead className="bg-slate-50 text-xs text-slate-600">
            <tr>
              <th scope="col" className="px-4 py-2 font-medium">
                Plumbline column
              </th>
              <th scope="col" className="px-4 py-2 font-medium">
                Column in your file
              </th>
              <th scope="col" className="px-4 py-2 font-medium">
                First value
              </th>
            </tr>
          </thead>
          <tbody>
            {preview.columns.map((column) => {
              const selectId = `${baseId}-${column.name}`;
              const issue = issueOf(column.name);
              const header = draft[column.name] ?? null;
              const sample = sampleValue(preview, header);
              return (
                <tr key={column.name} className="border-t border-slate-100 align-top">
                  <th scope="row" className="px-4 py-2.5 font-normal">
                    <label htmlFor={selectId} className="font-mono text-sm font-semibold text-plumb-900">
                      {column.name}
                    </label>
                    {column.required ? null : <span className="ml-1.5 text-xs text-slate-500">optional</span>}
                    <p id={`${selectId}-description`} className="mt-0.5 max-w-xs text-xs text-slate-600">
                      {column.description}
                    </p>
                  </th>
                  <td className="px-4 py-2.5">
                    <select
                      id={selectId}
                      value={header ?? ''}
                      onChange={(event) => onChange(column.name, event.target.value || null)}
                      aria-invalid={issue ? true : undefined}
                      aria-describedby={`${selectId}-description${issue ? ` ${selectId}-issue` : ''}`}
                      className={`h-9 w-full min-w-44 rounded-md border bg-white px-2 text-sm text-slate-900 ${
                        issue ? 'border-alarm-700' : 'border-slate-300'
                      }`}
                    >
                      <option value="">— not in this file —</option>
                      {preview.headers.map((fileHeader, index) => (
                        <option key={`${fileHeader}-${index}`} value={fileHeader}>
                          {fileHeader}
                        </option>
                      ))}
                    </select>
                    {issue ? (
                      <p id={`${selectId}-issue`} className="mt-1 text-xs font-medium text-alarm-700">
                        {issue}
                      </p>
                    ) : null}
                  </td>
                  <td className="px-4 py-2.5 font-mono text-xs text-slate-700">
                    {sample ?? <span className="text-slate-400">—</span>}
                  </td>
                </tr>
              );
            })}
          </tbody>
        </table>
      </div>

      <SampleRows preview={preview} />

      {uploadError ? (
        <div className="mt-4">
          <Alert tone="error" title="The file was not sent">
            {uploadError}
          </Alert>
        </div>
      ) : null}

      <div className="mt-5 flex flex-wrap items-center gap-3">
        <Button onClick={onUpload} isLoading={isUploading} disabled={issues.length > 0}>
          Upload and check the file
        </Button>
        <Button variant="secondary" onClick={onChooseAnother} disabled={isUploading}>
          Choose another file
        </Button>
        {issues.length > 0 ? (
          <p className="text-sm text-alarm-700">
            {issues.length === 1 ? 'One column needs' : `${issues.length} columns need`} your attention first.
          </p>
        ) : null}
      </div>
    </section>
  );
}
