// The flags of a report row: each as a chip with its severity's shape, colour and word, and the
// API's sentence on what it is about.
import type { ReportFlag } from '@plumbline/contracts';
import { SeverityChip } from '../../../components/charts/severity.tsx';

const kindLabels: Record<ReportFlag['kind'], string> = {
  sdi: 'SDI',
  cvr: 'CVR',
  exclusion: 'Left out',
};

export function FlagChips({ flags }: { flags: readonly ReportFlag[] }) {
  // Fine flags are the normal state: the table says "fine" once rather than repeating it.
  const shown = flags.filter((flag) => flag.severity !== 'fine');
  if (flags.length === 0) return <span className="text-xs text-slate-500">no figure to flag</span>;
  if (shown.length === 0) return <SeverityChip severity="fine" />;
  return (
    <ul className="flex flex-col items-start gap-1">
      {shown.map((flag) => (
        <li key={`${flag.kind}-${flag.severity}`} title={flag.message}>
          <SeverityChip severity={flag.severity}>
            {kindLabels[flag.kind]}: {severityWord(flag.severity)}
          </SeverityChip>
          <span className="sr-only">. {flag.message}</span>
        </li>
      ))}
    </ul>
  );
}

function severityWord(severity: ReportFlag['severity']): string {
  return { fine: 'fine', acceptable: 'acceptable', warning: 'warning', action: 'action' }[severity];
}
