import { useId } from 'react';
import { canonicalColumns, qcUploadKinds, type UploadKind } from '@plumbline/contracts';

export const uploadKindLabels: Record<UploadKind, string> = {
  'qc-summary': 'Monthly summary',
  'qc-values': 'Daily values',
  'patient-results': 'Patient results (CSV)',
  'fhir-bundle': 'Patient results (FHIR Bundle)',
};

const kindDescriptions: Record<UploadKind, string> = {
  'qc-summary': 'One row per procedure, control lot, level and month, with that month’s n, mean and SD.',
  'qc-values':
    'One row per control measurement. Plumbline works out the monthly figures and the multirule checks.',
  'patient-results': 'De-identified patient results for reference-interval studies, one row per result.',
  'fhir-bundle': 'A FHIR R4 Bundle of Observations with their Patients; identifiers are refused.',
};

/** The two file kinds as radio cards, each with the columns a file of that kind holds. */
export function UploadKindChoice({
  value,
  onChange,
  disabled = false,
}: {
  value: UploadKind;
  onChange: (kind: UploadKind) => void;
  disabled?: boolean;
}) {
  const name = useId();
  return (
    <fieldset disabled={disabled}>
      <legend className="text-sm font-semibold text-slate-900">What does the file hold?</legend>
      <div className="mt-2 grid gap-3 md:grid-cols-2">
        {qcUploadKinds.map((kind) => {
          const id = `${name}-${kind}`;
          const checked = value === kind;
          return (
            <div
              key={kind}
              className={`relative rounded-lg border p-4 transition-colors has-[:focus-visible]:outline-3 has-[:focus-visible]:outline-offset-2 has-[:focus-visible]:outline-brass-500 ${
                checked ? 'border-plumb-500 bg-plumb-50 ring-1 ring-plumb-500' : 'border-slate-200 bg-white'
              }`}
            >
              <div className="flex items-start gap-3">
                <input
                  id={id}
                  type="radio"
                  name={name}
                  value={kind}
                  checked={checked}
                  onChange={() => onChange(kind)}
                  aria-describedby={`${id}-description`}
                  className="mt-1 size-4 accent-plumb-700 focus-visible:outline-none"
                />
                <div>
                  {/* The label covers the whole card, so a click anywhere on it chooses the kind. */}
                  <label
                    htmlFor={id}
                    className="text-[0.95rem] font-semibold text-plumb-900 after:absolute after:inset-0 after:content-['']"
                  >
                    {uploadKindLabels[kind]}
                  </label>
                  <div id={`${id}-description`}>
                    <p className="mt-1 text-sm leading-relaxed text-slate-700">{kindDescriptions[kind]}</p>
                    <p className="mt-2 text-xs text-slate-600">Columns:</p>
                    <ul
                      className="mt-1 flex flex-wrap gap-1"
                      aria-label={`Columns of a ${uploadKindLabels[kind].toLowerCase()} file`}
                    >
                      {canonicalColumns[kind].map((column) => (
                        <li key={column.name}>
                          <code
                            title={column.description}
                            className={`rounded px-1.5 py-0.5 font-mono text-xs ${
                              column.required
                                ? 'bg-white text-plumb-900 ring-1 ring-plumb-200'
                                : 'bg-slate-100 text-slate-600'
                            }`}
                          >
                            {column.name}
                            {column.required ? '' : ' (optional)'}
                          </code>
                        </li>
                      ))}
                    </ul>
                  </div>
                </div>
              </div>
            </div>
          );
        })}
      </div>
    </fieldset>
  );
}
