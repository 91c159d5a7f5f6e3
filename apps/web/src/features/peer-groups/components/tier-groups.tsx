// The groups of one tier: a row per group with its lab count and figures (provisional, and the
// published version beside them once the period is published), members on demand, and the actions.
// Two rows of one tier can be selected and merged.
import { createContext, useContext, useMemo, useState } from 'react';
import {
  createColumnHelper,
  getCoreRowModel,
  getSortedRowModel,
  useReactTable,
  type SortingState,
} from '@tanstack/react-table';
import type { PeerGroup, PeerGroupMember, PeerGroupsView, PeerTier } from '@plumbline/contracts';
import { Badge } from '../../../components/ui/badge.tsx';
import { Button } from '../../../components/ui/button.tsx';
import { DataTable } from '../../../components/ui/data-table.tsx';
import { formatPercent, formatValue, meanDecimals, tierTitles } from '../utils/figures.ts';

export type TierActions = {
  onMerge: (groups: [PeerGroup, PeerGroup]) => void;
  onSplit: (group: PeerGroup) => void;
  onMove: (member: PeerGroupMember, from: PeerGroup) => void;
  onExclude: (member: PeerGroupMember) => void;
};

const groupColumn = createColumnHelper<PeerGroup>();
const memberColumn = createColumnHelper<PeerGroupMember>();

function MemberStatus({ member }: { member: PeerGroupMember }) {
  return (
    <span className="flex flex-wrap gap-1">
      {member.excluded?.reason === 'outlier' ? <Badge tone="alarm">Outlier (Algorithm A)</Badge> : null}
      {member.excluded?.reason === 'manual' ? (
        <Badge tone="brass">Excluded{member.excluded.note ? `: ${member.excluded.note}` : ''}</Badge>
      ) : null}
      {member.assigned ? <Badge tone="plumb">Placed here by you</Badge> : null}
      {member.data?.late ? <Badge tone="muted">Late</Badge> : null}
      {!member.data ? <span className="text-xs text-slate-500">No data this period</span> : null}
    </span>
  );
}

/** What the member rows' action buttons need; read from context so the columns stay stable. */
type MembersState = { group: PeerGroup; canMove: boolean; actions: TierActions };
const MembersContext = createContext<MembersState | null>(null);

function MemberActions({ member }: { member: PeerGroupMember }) {
  const { group, canMove, actions } = useContext(MembersContext)!;
  const name = `${member.lab.code} ${member.procedureCode}`;
  return (
    <span className="flex justify-end gap-1">
      {canMove ? (
        <Button
          variant="ghost"
          size="xs"
          onClick={() => actions.onMove(member, group)}
          aria-label={`Move ${name}`}
        >
          Move…
        </Button>
      ) : null}
      {member.data && member.excluded?.reason !== 'manual' ? (
        <Button
          variant="ghost"
          size="xs"
          onClick={() => actions.onExclude(member)}
          aria-label={`Exclude ${name}`}
        >
          Exclude…
        </Button>
      ) : null}
    </span>
  );
}

function memberColumns(d: number) {
  return [
    memberColumn.accessor((m) => m.lab.code, {
      id: 'lab',
      header: 'Lab',
      cell: (c) => (
        <span className="block">
          <span className="font-semibold text-plumb-900">{c.getValue()}</span>
          <span className="block text-xs text-slate-600">{c.row.original.lab.name}</span>
        </span>
      ),
    }),
    memberColumn.accessor('procedureCode', { header: 'Procedure' }),
    memberColumn.display({
      id: 'setup',
      header: 'Instrument · method · reagent',
      cell: (c) => (
        <span className="text-xs text-slate-700">
          {c.row.original.instrumentModel.name} · {c.row.original.method.name} · {c.row.original.reagent.name}
        </span>
      ),
    }),
    memberColumn.accessor((m) => m.data?.n ?? null, {
      id: 'n',
      header: 'n',
      meta: { align: 'right' },
      cell: (c) => c.getValue() ?? '—',
    }),
    memberColumn.accessor((m) => m.data?.mean ?? null, {
      id: 'mean',
      header: 'Mean',
      meta: { align: 'right' },
      cell: (c) => <span className="figures">{formatValue(c.getValue(), d)}</span>,
    }),
    memberColumn.accessor((m) => m.data?.sd ?? null, {
      id: 'sd',
      header: 'SD',
      meta: { align: 'right' },
      cell: (c) => <span className="figures">{formatValue(c.getValue(), d)}</span>,
    }),
    memberColumn.accessor((m) => m.data?.cv ?? null, {
      id: 'cv',
      header: 'CV %',
      meta: { align: 'right' },
      cell: (c) => <span className="figures">{formatPercent(c.getValue())}</span>,
    }),
    memberColumn.display({
      id: 'status',
      header: 'Status',
      cell: (c) => <MemberStatus member={c.row.original} />,
    }),
    memberColumn.display({
      id: 'actions',
      header: () => <span className="sr-only">Actions</span>,
      meta: { align: 'right' },
      cell: (c) => <MemberActions member={c.row.original} />,
    }),
  ];
}

function GroupMembers({
  group,
  decimals,
  canMove,
  actions,
}: {
  group: PeerGroup;
  decimals: number;
  canMove: boolean;
  actions: TierActions;
}) {
  const [sorting, setSorting] = useState<SortingState>([]);
  const d = meanDecimals(decimals);
  const columns = useMemo(() => memberColumns(d), [d]);
  const table = useReactTable({
    data: group.members,
    columns,
    state: { sorting },
    onSortingChange: setSorting,
    getCoreRowModel: getCoreRowModel(),
    getSortedRowModel: getSortedRowModel(),
    getRowId: (m) => m.procedureId,
  });
  return (
    <MembersContext.Provider value={{ group, canMove, actions }}>
      <DataTable table={table} caption={`Members of ${group.label}`} emptyMessage="No members." />
    </MembersContext.Provider>
  );
}

/** Selection and expanded rows of a tier, read by the cells from context so the columns stay stable. */
type TierState = {
  selected: string[];
  toggleSelected: (id: string) => void;
  open: ReadonlySet<string>;
  toggleOpen: (id: string) => void;
  actions: TierActions;
};
const TierContext = createContext<TierState | null>(null);

function SelectCell({ group }: { group: PeerGroup }) {
  const { selected, toggleSelected } = useContext(TierContext)!;
  return (
    <input
      type="checkbox"
      className="size-4 accent-plumb-700"
      checked={selected.includes(group.id)}
      onChange={() => toggleSelected(group.id)}
      aria-label={`Select ${group.label}`}
    />
  );
}

function GroupActions({ group }: { group: PeerGroup }) {
  const { open, toggleOpen, actions } = useContext(TierContext)!;
  const isOpen = open.has(group.id);
  return (
    <span className="flex flex-col items-end gap-0.5">
      <Button
        variant="ghost"
        size="xs"
        aria-expanded={isOpen}
        onClick={() => toggleOpen(group.id)}
        aria-label={`Members of ${group.label}`}
      >
        {isOpen ? 'Hide members' : 'Members'}
      </Button>
      {group.members.length > 1 ? (
        <Button
          variant="ghost"
          size="xs"
          onClick={() => actions.onSplit(group)}
          aria-label={`Split ${group.label}`}
        >
          Split…
        </Button>
      ) : null}
    </span>
  );
}

function GroupStatus({ group }: { group: PeerGroup }) {
  const outliers = group.provisional?.excluded.filter((x) => x.reason === 'outlier').length ?? 0;
  const manual = group.provisional?.excluded.filter((x) => x.reason === 'manual').length ?? 0;
  return (
    <span className="flex flex-wrap gap-1">
      {group.notComputable ? (
        <span title={group.notComputable.reason}>
          <Badge tone="alarm">Cannot be computed</Badge>
          <span className="sr-only">: {group.notComputable.reason}</span>
        </span>
      ) : !group.provisional ? (
        <Badge tone="muted">No data</Badge>
      ) : group.provisional.sufficient ? (
        <Badge tone="solid">Enough labs</Badge>
      ) : (
        <Badge tone="brass">Too few labs</Badge>
      )}
      {outliers ? (
        <Badge tone="alarm">
          {outliers} outlier{outliers > 1 ? 's' : ''}
        </Badge>
      ) : null}
      {manual ? <Badge tone="neutral">{manual} excluded</Badge> : null}
    </span>
  );
}

function groupColumns(d: number, unit: string, publishedVersion: number | null) {
  return [
    groupColumn.display({
      id: 'select',
      header: () => <span className="sr-only">Select</span>,
      cell: (c) => <SelectCell group={c.row.original} />,
    }),
    groupColumn.accessor('label', {
      header: 'Group',
      meta: { className: 'min-w-60' },
      cell: (c) => {
        const group = c.row.original;
        return (
          <span className="block max-w-md">
            <span className="font-semibold text-plumb-900">{group.label}</span>
            <span className="block text-xs text-slate-600">
              {group.members.length} {group.members.length === 1 ? 'member' : 'members'}:{' '}
              {group.members.map((m) => m.lab.code).join(', ')}
            </span>
            {group.mergedFrom.length ? (
              <span className="block text-xs text-plumb-700">
                Merged with {group.mergedFrom.map((m) => `“${m.label}”`).join(', ')}
              </span>
            ) : null}
          </span>
        );
      },
    }),
    groupColumn.accessor('labsWithData', { header: 'Labs', meta: { align: 'right' } }),
    groupColumn.accessor((g) => g.provisional?.labs ?? null, {
      id: 'labsInFigures',
      header: 'In figures',
      meta: { align: 'right' },
      cell: (c) => c.getValue() ?? '—',
    }),
    groupColumn.accessor((g) => g.provisional?.mean ?? null, {
      id: 'mean',
      header: `Mean (${unit})`,
      meta: { align: 'right' },
      cell: (c) => <span className="figures">{formatValue(c.getValue(), d)}</span>,
    }),
    groupColumn.accessor((g) => g.provisional?.sd ?? null, {
      id: 'sd',
      header: 'SD',
      meta: { align: 'right' },
      cell: (c) => <span className="figures">{formatValue(c.getValue(), d)}</span>,
    }),
    groupColumn.accessor((g) => g.provisional?.cv ?? null, {
      id: 'cv',
      header: 'CV %',
      meta: { align: 'right' },
      cell: (c) => <span className="figures">{formatPercent(c.getValue())}</span>,
    }),
    groupColumn.accessor((g) => g.provisional?.withinCv ?? null, {
      id: 'withinCv',
      header: 'Within CV %',
      meta: { align: 'right' },
      cell: (c) => <span className="figures">{formatPercent(c.getValue())}</span>,
    }),
    groupColumn.display({
      id: 'status',
      header: 'Status',
      cell: (c) => <GroupStatus group={c.row.original} />,
    }),
    ...(publishedVersion !== null
      ? [
          groupColumn.accessor((g) => g.published?.mean ?? null, {
            id: 'published',
            header: `Published v${publishedVersion}`,
            meta: { align: 'right' },
            cell: (c) =>
              c.row.original.published ? (
                <span className="figures text-slate-700">
                  {formatValue(c.getValue(), d)}{' '}
                  <span className="text-xs">({c.row.original.published.labs} labs)</span>
                </span>
              ) : (
                <span className="text-xs text-slate-500">not in v{publishedVersion}</span>
              ),
          }),
        ]
      : []),
    groupColumn.display({
      id: 'actions',
      header: () => <span className="sr-only">Actions</span>,
      meta: { align: 'right' },
      cell: (c) => <GroupActions group={c.row.original} />,
    }),
  ];
}

export function TierGroups({
  tier,
  groups,
  view,
  actions,
}: {
  tier: PeerTier;
  groups: PeerGroup[];
  view: PeerGroupsView;
  actions: TierActions;
}) {
  const [selected, setSelected] = useState<string[]>([]);
  const [open, setOpen] = useState<Set<string>>(new Set());
  const [sorting, setSorting] = useState<SortingState>([]);
  const d = meanDecimals(view.analyte.decimals);
  const unit = view.analyte.unit;
  const live = selected.filter((id) => groups.some((g) => g.id === id));
  const toggleSelected = (id: string) =>
    setSelected((current) =>
      current.includes(id) ? current.filter((x) => x !== id) : [...current.slice(-1), id],
    );
  const toggleOpen = (id: string) =>
    setOpen((current) => {
      const next = new Set(current);
      if (next.has(id)) next.delete(id);
      else next.add(id);
      return next;
    });

  const publishedVersion = view.publication?.version ?? null;
  const columns = useMemo(() => groupColumns(d, unit, publishedVersion), [d, unit, publishedVersion]);

  const table = useReactTable({
    data: groups,
    columns,
    state: { sorting },
    onSortingChange: setSorting,
    getCoreRowModel: getCoreRowModel(),
    getSortedRowModel: getSortedRowModel(),
    getRowId: (g) => g.id,
  });
  const chosen = groups.filter((g) => live.includes(g.id));

  return (
    <section aria-labelledby={`tier-${tier}`} className="space-y-2">
      <div className="flex flex-wrap items-end justify-between gap-3">
        <div>
          <h2 id={`tier-${tier}`} className="text-lg font-semibold text-plumb-950">
            {tierTitles[tier]}
          </h2>
          <p className="text-sm text-slate-600">
            {groups.length} {groups.length === 1 ? 'group' : 'groups'}. Select two to merge them.
          </p>
        </div>
        <Button
          size="sm"
          variant="secondary"
          disabled={chosen.length !== 2}
          onClick={() => actions.onMerge([chosen[0], chosen[1]])}
          aria-label={`Merge the selected groups (${tierTitles[tier].toLowerCase()})`}
        >
          Merge selected ({chosen.length}/2)
        </Button>
      </div>
      <TierContext.Provider value={{ selected: live, toggleSelected, open, toggleOpen, actions }}>
        <DataTable
          table={table}
          caption={`Peer groups: ${tierTitles[tier].toLowerCase()}`}
          emptyMessage="No group at this tier has members with data on this lot."
          rowClassName={(g) => (live.includes(g.id) ? 'bg-plumb-50/70' : '')}
          renderDetail={(group) =>
            open.has(group.id) ? (
              <GroupMembers
                group={group}
                decimals={view.analyte.decimals}
                canMove={groups.length > 1}
                actions={actions}
              />
            ) : null
          }
        />
      </TierContext.Provider>
    </section>
  );
}
