// The coordinator's peer-group workspace: choose a control lot, level, period and analyte (kept in
// the address, so a view can be shared or reloaded), see the groups of each tier with their
// members and figures, adjust them with a preview, and review or undo earlier adjustments.
import { useState } from 'react';
import { useQuery } from '@tanstack/react-query';
import { useSearchParams } from 'react-router-dom';
import type { PeerGroupsView } from '@plumbline/contracts';
import { Alert } from '../../../components/ui/alert.tsx';
import { Badge } from '../../../components/ui/badge.tsx';
import { PageLoading } from '../../../components/ui/page-loading.tsx';
import { SelectField } from '../../../components/ui/select-field.tsx';
import { errorMessage } from '../../../lib/form-errors.ts';
import { formatDateTime, formatPeriod } from '../../../utils/format.ts';
import { cyclesKeys } from '../../cycles/api/cycles-keys.ts';
import { peerGroupsKeys } from '../api/peer-groups-keys.ts';
import { defaultControlLot, defaultPeerGroupPeriod } from '../utils/defaults.ts';
import { AdjustmentDialog, type AdjustmentRequest } from './adjustment-dialog.tsx';
import { AdjustmentsHistory } from './adjustments-history.tsx';
import { TierGroups } from './tier-groups.tsx';

function PublicationNote({ view }: { view: PeerGroupsView }) {
  return (
    <p className="flex flex-wrap items-center gap-2 text-sm text-slate-700">
      <span>
        {formatPeriod(view.period)}: {view.periodState ?? 'no such period'}.
      </span>
      {view.publication ? (
        <Badge tone="solid">
          Published version {view.publication.version}, {formatDateTime(view.publication.publishedAt)}
        </Badge>
      ) : (
        <Badge tone="brass">Not published: figures are provisional</Badge>
      )}
      <span className="text-slate-600">
        Figures are shown as they are now; labs see the published version once there is one. At least{' '}
        {view.minLabs} labs must remain for a group’s figures to be used.
      </span>
    </p>
  );
}

export function PeerGroupsWorkspace() {
  const [params, setParams] = useSearchParams();
  const lots = useQuery(peerGroupsKeys.controlLots());
  const periods = useQuery(cyclesKeys.periods());

  const lot =
    lots.data?.find((l) => l.id === params.get('lot')) ?? (lots.data ? defaultControlLot(lots.data) : null);
  const analytes = useQuery({ ...peerGroupsKeys.analytes(lot?.id ?? ''), enabled: Boolean(lot) });
  const requestedLevel = Number(params.get('level'));
  const level = lot?.levels.includes(requestedLevel) ? requestedLevel : (lot?.levels[0] ?? null);
  const period =
    periods.data?.find((p) => p.period === params.get('period'))?.period ??
    (periods.data ? defaultPeerGroupPeriod(periods.data) : null);
  const analyte = analytes.data?.find((a) => a.id === params.get('analyte')) ?? analytes.data?.[0] ?? null;

  const query =
    lot && analyte && level !== null && period
      ? { controlLotId: lot.id, analyteId: analyte.id, level, period }
      : null;
  const view = useQuery({
    ...peerGroupsKeys.view(query ?? { controlLotId: '', analyteId: '', level: 1, period: '' }),
    enabled: query !== null,
  });
  const [request, setRequest] = useState<AdjustmentRequest | null>(null);

  const choose = (key: string, value: string) =>
    setParams(
      (current) => {
        const next = new URLSearchParams(current);
        next.set(key, value);
        // Another lot has its own analytes and levels.
        if (key === 'lot') {
          next.delete('analyte');
          next.delete('level');
        }
        return next;
      },
      { replace: true },
    );

  if (lots.isPending || periods.isPending) return <PageLoading />;
  if (lots.isError || periods.isError) {
    return (
      <Alert tone="error" title="The control lots or periods could not be loaded">
        {errorMessage(lots.error ?? periods.error)}
      </Alert>
    );
  }

  return (
    // Wide tables (an open member list) scroll inside their own frame instead of widening the page:
    // inline-size containment keeps them from stretching the layout, and the clip keeps their
    // absolutely positioned screen-reader labels from doing so.
    <div className="relative space-y-8 overflow-x-clip [contain:inline-size]">
      <div className="grid gap-4 rounded-lg border border-slate-200 bg-white p-4 shadow-xs sm:grid-cols-2 lg:grid-cols-4">
        <SelectField
          label="Control lot"
          value={lot?.id ?? ''}
          onChange={(e) => choose('lot', e.target.value)}
        >
          {lots.data.map((l) => (
            <option key={l.id} value={l.id}>
              {l.lotNumber} · {l.material.name}
            </option>
          ))}
        </SelectField>
        <SelectField label="Level" value={level ?? ''} onChange={(e) => choose('level', e.target.value)}>
          {(lot?.levels ?? []).map((l) => (
            <option key={l} value={l}>
              Level {l}
            </option>
          ))}
        </SelectField>
        <SelectField label="Period" value={period ?? ''} onChange={(e) => choose('period', e.target.value)}>
          {[...periods.data]
            .sort((a, b) => b.period.localeCompare(a.period))
            .map((p) => (
              <option key={p.period} value={p.period}>
                {formatPeriod(p.period)} ({p.state})
              </option>
            ))}
        </SelectField>
        <SelectField
          label="Analyte"
          value={analyte?.id ?? ''}
          onChange={(e) => choose('analyte', e.target.value)}
          disabled={!analytes.data?.length}
          hint={analytes.data && analytes.data.length === 0 ? 'No QC data on this lot yet.' : undefined}
        >
          {(analytes.data ?? []).map((a) => (
            <option key={a.id} value={a.id}>
              {a.name} ({a.code})
            </option>
          ))}
        </SelectField>
      </div>

      {!query ? (
        lots.data.length === 0 || periods.data.length === 0 ? (
          <Alert tone="info">
            Create a control lot and a period first; peer groups form once labs send data.
          </Alert>
        ) : analytes.isError ? (
          <Alert tone="error" title="The analytes of this lot could not be loaded">
            {errorMessage(analytes.error)}
          </Alert>
        ) : analytes.isPending ? (
          <PageLoading />
        ) : (
          <Alert tone="info">No lab has sent data on this lot yet, so it has no peer groups.</Alert>
        )
      ) : view.isPending ? (
        <PageLoading />
      ) : view.isError ? (
        <Alert tone="error" title="The peer groups could not be loaded">
          {errorMessage(view.error)}
        </Alert>
      ) : (
        <>
          <PublicationNote view={view.data} />
          {view.data.tiers.map((tier) => (
            <TierGroups
              // A merge, split or move changes the groups: selections and open rows start afresh.
              key={`${tier.tier}|${tier.groups.map((g) => g.id).join(',')}`}
              tier={tier.tier}
              groups={tier.groups}
              view={view.data}
              actions={{
                onMerge: (groups) => setRequest({ kind: 'merge', groups }),
                onSplit: (group) => setRequest({ kind: 'split', group }),
                onMove: (member, from) =>
                  setRequest({
                    kind: 'move',
                    member,
                    from,
                    candidates: tier.groups.filter((g) => g.id !== from.id),
                  }),
                onExclude: (member) => setRequest({ kind: 'exclude', member }),
              }}
            />
          ))}
          <AdjustmentsHistory controlLotId={query.controlLotId} analyteId={query.analyteId} />
          <AdjustmentDialog
            request={request}
            onClose={() => setRequest(null)}
            context={{
              controlLotId: query.controlLotId,
              period: query.period,
              level: query.level,
              decimals: view.data.analyte.decimals,
              unit: view.data.analyte.unit,
            }}
          />
        </>
      )}
    </div>
  );
}
