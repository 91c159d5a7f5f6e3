// Short confirmations of what an action did ("Lab L15 enrolled"), announced politely to screen
// readers and dismissed after a few seconds. A tiny external store, so any code can raise one.
import { useSyncExternalStore } from 'react';

export type ToastTone = 'success' | 'error';
export type Toast = { id: number; tone: ToastTone; message: string };

const TOAST_DURATION_MS = 6000;

let toasts: Toast[] = [];
let nextId = 1;
const listeners = new Set<() => void>();

function publish(next: Toast[]) {
  toasts = next;
  for (const listener of listeners) listener();
}

export function dismissToast(id: number): void {
  publish(toasts.filter((toast) => toast.id !== id));
}

export function showToast(message: string, tone: ToastTone = 'success'): void {
  const id = nextId++;
  // At most three at a time: older confirmations are no longer news.
  publish([...toasts.slice(-2), { id, tone, message }]);
  setTimeout(() => dismissToast(id), TOAST_DURATION_MS);
}

function subscribe(listener: () => void) {
  listeners.add(listener);
  return () => listeners.delete(listener);
}

const getToasts = () => toasts;

const tones: Record<ToastTone, string> = {
  success: 'border-plumb-300 bg-plumb-950 text-white',
  error: 'border-alarm-200 bg-alarm-50 text-alarm-800',
};

/** Rendered once, by the app provider. The live region exists before any toast so it is announced. */
export function Toaster() {
  const current = useSyncExternalStore(subscribe, getToasts, getToasts);
  return (
    <div
      role="status"
      aria-live="polite"
      className="pointer-events-none fixed right-4 bottom-4 z-50 flex w-[min(24rem,calc(100vw-2rem))] flex-col gap-2"
    >
      {current.map((toast) => (
        <div
          key={toast.id}
          className={`pointer-events-auto flex items-start gap-3 rounded-md border px-4 py-3 text-sm shadow-lg ${tones[toast.tone]}`}
        >
          <span
            aria-hidden="true"
            className={`mt-1.5 size-2 shrink-0 rotate-45 ${toast.tone === 'success' ? 'bg-brass-400' : 'bg-alarm-700'}`}
          />
          <p className="flex-1">{toast.message}</p>
          <button
            type="button"
            onClick={() => dismissToast(toast.id)}
            className="-my-1 rounded px-1 text-base leading-none opacity-70 hover:opacity-100"
            aria-label="Dismiss message"
          >
            &times;
          </button>
        </div>
      ))}
    </div>
  );
}
