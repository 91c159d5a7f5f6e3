// Publish / republish one period, for the cycles page. A closed period can be published (its peer
// statistics are frozen as version 1, which every lab's report then shows); a published one can be
// republished with a reason (the next version; earlier versions stay readable). An open period must
// be closed first, so data that arrives after the deadline is marked late.
import { useState } from 'react';
import { useQuery } from '@tanstack/react-query';
import type { Period } from '@plumbline/contracts';
import { Button } from '../../../components/ui/button.tsx';
import { ConfirmDialog } from '../../../components/ui/confirm-dialog.tsx';
import { showToast } from '../../../components/ui/toast.tsx';
import { errorMessage } from '../../../lib/form-errors.ts';
import { formatDateTime, formatPeriod } from '../../../utils/format.ts';
import { publishingKeys, usePublishPeriod } from '../api/publishing.ts';

function LatestVersion({ period }: { period: string }) {
  const publications = useQuery(publishingKeys.publications(period));
  const latest = publications.data?.at(-1);
  if (!latest) return <span className="text-sm text-slate-700">Reports published</span>;
  return (
    <span className="text-sm text-slate-700">
      Version {latest.version}
      <span className="block text-xs text-slate-500">
        {formatDateTime(latest.publishedAt)}
        {latest.reason ? ` · ${latest.reason}` : ''}
      </span>
    </span>
  );
}

export function PeriodPublishing({ period }: { period: Period }) {
  const [open, setOpen] = useState(false);
  const publish = usePublishPeriod();
  const name = formatPeriod(period.period);
  const again = period.state === 'published';

  if (period.state === 'open') return <span className="text-sm text-slate-400">Close the period first</span>;

  const dismiss = () => {
    publish.reset();
    setOpen(false);
  };
  return (
    <span className="flex flex-wrap items-center gap-2">
      {again ? (
        <LatestVersion period={period.period} />
      ) : (
        <span className="text-sm text-slate-600">Ready to publish</span>
      )}
      <Button
        size="xs"
        variant={again ? 'ghost' : 'primary'}
        onClick={() => setOpen(true)}
        aria-label={`${again ? 'Republish' : 'Publish'} ${name}`}
      >
        {again ? 'Republish' : 'Publish'}
      </Button>
      <ConfirmDialog
        open={open}
        onClose={dismiss}
        title={again ? `Republish ${name}?` : `Publish ${name}?`}
        confirmLabel={again ? 'Publish a new version' : 'Publish'}
        reason={again ? 'required' : 'optional'}
        reasonLabel={
          again
            ? 'Why is the period published again? (kept with the version)'
            : 'Note (kept in the audit log)'
        }
        isPending={publish.isPending}
        error={publish.error ? errorMessage(publish.error) : null}
        onConfirm={(reason) =>
          publish.mutate(
            { period: period.period, reason, again },
            {
              onSuccess: (result) => {
                showToast(
                  `${name} is published as version ${result.publication.version}; labs' reports now show it.`,
                );
                dismiss();
              },
            },
          )
        }
      >
        {again ? (
          <p>
            The peer statistics of {name} as they are now become a new version, which labs' reports show from
            now on. The earlier versions stay readable.
          </p>
        ) : (
          <p>
            The peer statistics of {name} are frozen as version 1 and every lab's report shows them. Data or
            adjustments that come later change only the provisional figures, until you republish.
          </p>
        )}
      </ConfirmDialog>
    </span>
  );
}
