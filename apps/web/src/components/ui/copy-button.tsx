import { useState } from 'react';
import { Button } from './button.tsx';

/** Copies a text to the clipboard and says so; where the clipboard is not allowed, it says that instead. */
export function CopyButton({ text, label = 'Copy' }: { text: string; label?: string }) {
  const [state, setState] = useState<'idle' | 'copied' | 'failed'>('idle');
  const copy = async () => {
    try {
      await navigator.clipboard.writeText(text);
      setState('copied');
    } catch {
      setState('failed');
    }
  };
  return (
    <span className="inline-flex items-center gap-2">
      <Button variant="secondary" size="sm" onClick={copy}>
        {label}
      </Button>
      <span role="status" className="text-xs text-slate-600">
        {state === 'copied'
          ? 'Copied'
          : state === 'failed'
            ? 'Copying is not allowed here; select the text instead'
            : ''}
      </span>
    </span>
  );
}
