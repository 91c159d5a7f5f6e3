// A modal dialog on the native <dialog> element: the browser traps focus inside, Escape closes it,
// and the rest of the page is inert. Focus goes to the first field (or an element marked data-autofocus)
// and returns to whatever opened the dialog when it closes.
import { useEffect, useId, useRef, type ReactNode } from 'react';

const widths = { sm: 'max-w-md', md: 'max-w-xl', lg: 'max-w-3xl', xl: 'max-w-5xl' } as const;

export function Dialog({
  open,
  onClose,
  title,
  description,
  size = 'md',
  children,
}: {
  open: boolean;
  onClose: () => void;
  title: string;
  description?: ReactNode;
  size?: keyof typeof widths;
  children: ReactNode;
}) {
  const ref = useRef<HTMLDialogElement>(null);
  const titleId = useId();
  const descriptionId = useId();
  const onCloseRef = useRef(onClose);
  useEffect(() => {
    onCloseRef.current = onClose;
  });

  useEffect(() => {
    const dialog = ref.current;
    if (!dialog || !open) return;
    const opener = document.activeElement instanceof HTMLElement ? document.activeElement : null;
    if (!dialog.open) dialog.showModal();
    const first =
      dialog.querySelector<HTMLElement>('[data-autofocus]') ??
      dialog.querySelector<HTMLElement>(
        'input:not([type="hidden"]):not([disabled]), select:not([disabled]), textarea:not([disabled])',
      );
    first?.focus();
    // Escape (the "cancel" event) and close() both end here; the parent decides what "closed" means.
    const handleClose = () => onCloseRef.current();
    dialog.addEventListener('close', handleClose);
    return () => {
      dialog.removeEventListener('close', handleClose);
      if (dialog.open) dialog.close();
      if (opener?.isConnected) opener.focus();
    };
  }, [open]);

  if (!open) return null;

  return (
    <dialog
      ref={ref}
      aria-labelledby={titleId}
      aria-describedby={description ? descriptionId : undefined}
      className={`m-auto w-[calc(100vw-2rem)] ${widths[size]} rounded-xl border border-slate-200 bg-white p-0 text-slate-900 shadow-2xl backdrop:bg-plumb-950/40`}
    >
      <div className="flex items-start justify-between gap-4 border-b border-slate-200 px-6 py-4">
        <div>
          <h2 id={titleId} className="text-lg font-semibold text-plumb-950">
            {title}
          </h2>
          {description ? (
            <div id={descriptionId} className="mt-1 text-sm text-slate-600">
              {description}
            </div>
          ) : null}
        </div>
        <button
          type="button"
          onClick={() => onCloseRef.current()}
          className="-mr-2 rounded-md px-2 py-1 text-xl leading-none text-slate-500 hover:bg-slate-100 hover:text-slate-900"
          aria-label="Close"
        >
          &times;
        </button>
      </div>
      <div className="max-h-[calc(100dvh-10rem)] overflow-y-auto px-6 py-5">{children}</div>
    </dialog>
  );
}

/** The row of buttons at the bottom of a dialog's form: cancel on the left of the main action. */
export function DialogActions({ children }: { children: ReactNode }) {
  return (
    // Stays in view at the bottom of a long form, so the main action never scrolls away.
    <div className="sticky -bottom-5 -mx-6 mt-6 flex flex-wrap justify-end gap-2 border-t border-slate-100 bg-white px-6 py-4">
      {children}
    </div>
  );
}
