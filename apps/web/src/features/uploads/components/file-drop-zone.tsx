import { useId, type ChangeEvent } from 'react';
import { formatFileSize } from '../../../utils/format.ts';
import { useFileDrop } from '../hooks/use-file-drop.ts';

/**
 * Where a file is dropped, or chosen with the file picker. The picker is a real file input (visually
 * hidden, still focusable) labelled by a button-like label, so keyboard users reach it with Tab.
 */
export function FileDropZone({
  onFile,
  file,
  disabled = false,
}: {
  onFile: (file: File) => void;
  file: File | null;
  disabled?: boolean;
}) {
  const inputId = useId();
  const { isDragging, dropProps } = useFileDrop((dropped) => {
    if (!disabled) onFile(dropped);
  });

  const onChange = (event: ChangeEvent<HTMLInputElement>) => {
    const chosen = event.target.files?.[0];
    // Reset so choosing the same file again still fires a change.
    event.target.value = '';
    if (chosen) onFile(chosen);
  };

  return (
    <div
      {...dropProps}
      data-dragging={isDragging || undefined}
      className={`flex flex-col items-center justify-center gap-3 rounded-lg border-2 border-dashed px-6 py-8 text-center transition-colors ${
        isDragging ? 'border-brass-500 bg-brass-100/60' : 'border-plumb-300 bg-white'
      } ${disabled ? 'opacity-60' : ''}`}
    >
      <svg viewBox="0 0 24 24" className="size-8 text-plumb-500" aria-hidden="true" focusable="false">
        <path
          d="M12 15V4m0 0 4 4m-4-4L8 8M5 14v4a2 2 0 0 0 2 2h10a2 2 0 0 0 2-2v-4"
          fill="none"
          stroke="currentColor"
          strokeWidth="1.6"
          strokeLinecap="round"
          strokeLinejoin="round"
        />
      </svg>
      <p className="text-[0.95rem] font-medium text-plumb-900">
        {isDragging ? 'Drop the file to read it' : 'Drag your CSV file here'}
      </p>
      <div className="flex items-center gap-3 text-sm text-slate-600">
        <span aria-hidden="true">or</span>
        <input
          id={inputId}
          type="file"
          accept=".csv,.tsv,.txt,text/csv,text/plain,text/tab-separated-values"
          disabled={disabled}
          onChange={onChange}
          className="peer sr-only"
        />
        <label
          htmlFor={inputId}
          className="inline-flex h-10 cursor-pointer items-center rounded-md bg-white px-4 text-sm font-medium text-plumb-800 ring-1 ring-plumb-200 ring-inset peer-focus-visible:outline-3 peer-focus-visible:outline-offset-2 peer-focus-visible:outline-brass-500 peer-disabled:cursor-not-allowed hover:bg-plumb-50"
        >
          Choose a file
        </label>
      </div>
      <p className="text-xs text-slate-600">
        {file ? (
          <>
            Chosen: <span className="font-medium text-slate-800">{file.name}</span> (
            {formatFileSize(file.size)})
          </>
        ) : (
          <>A CSV file: comma, semicolon or tab separated, UTF-8, up to 100 MB.</>
        )}
      </p>
    </div>
  );
}
