// The columns of each catalogue list. A column whose id is one of the list's sort keys
// (catalogueSortColumns) can be sorted; the API does the sorting.
import type { ReactNode } from 'react';
import { createColumnHelper, type ColumnDef } from '@tanstack/react-table';
import {
  catalogueSortColumns,
  type AnalyteItem,
  type CatalogueList,
  type ControlLotItem,
  type ControlMaterialItem,
  type InstrumentModelItem,
  type MethodItem,
} from '@plumbline/contracts';
import { Badge } from '../../../components/ui/badge.tsx';
import { Button } from '../../../components/ui/button.tsx';
import { formatDate } from '../../../utils/format.ts';
import type { CatalogueItem } from '../api/catalogue-keys.ts';
import { entryName } from '../utils/list-labels.ts';

export type CatalogueRowActions = {
  onEdit: (item: CatalogueItem) => void;
  onStateChange: (item: CatalogueItem, action: 'retire' | 'restore') => void;
};

const none = <span className="text-slate-400">—</span>;
const orNone = (value: ReactNode) => (value === null || value === undefined || value === '' ? none : value);

function Code({ children }: { children: ReactNode }) {
  return <span className="font-medium whitespace-nowrap text-plumb-900">{children}</span>;
}

function StateBadge({ item }: { item: CatalogueItem }) {
  if (item.retired) {
    const since =
      'retiredAt' in item && item.retiredAt ? `Retired on ${formatDate(item.retiredAt)}` : undefined;
    return (
      <span title={since}>
        <Badge tone="muted">Retired</Badge>
      </span>
    );
  }
  if ('expired' in item && item.expired) return <Badge tone="brass">Expired</Badge>;
  return <Badge tone="plumb">Active</Badge>;
}

function RowActions({ item, actions }: { item: CatalogueItem; actions: CatalogueRowActions }) {
  const name = entryName(item);
  return (
    <div className="flex justify-end gap-1">
      <Button variant="ghost" size="xs" onClick={() => actions.onEdit(item)} aria-label={`Edit ${name}`}>
        Edit
      </Button>
      {item.retired ? (
        <Button
          variant="ghost"
          size="xs"
          onClick={() => actions.onStateChange(item, 'restore')}
          aria-label={`Restore ${name}`}
        >
          Restore
        </Button>
      ) : (
        <Button
          variant="ghost"
          size="xs"
          onClick={() => actions.onStateChange(item, 'retire')}
          aria-label={`Retire ${name}`}
        >
          Retire
        </Button>
      )}
    </div>
  );
}

const analyte = createColumnHelper<AnalyteItem>();
const analyteColumns = [
  analyte.accessor('code', { header: 'Code', cell: (c) => <Code>{c.getValue()}</Code> }),
  analyte.accessor('name', { header: 'Name' }),
  analyte.accessor('loinc', {
    header: 'LOINC',
    cell: (c) => orNone(c.getValue() ? <span className="whitespace-nowrap">{c.getValue()}</span> : null),
  }),
  analyte.accessor('unit', {
    header: 'Unit (UCUM)',
    cell: (c) => <span className="font-mono text-xs">{c.getValue()}</span>,
  }),
  analyte.accessor('conventionalUnit', {
    header: 'Conventional unit',
    cell: (c) => orNone(c.getValue() ? <span className="font-mono text-xs">{c.getValue()}</span> : null),
  }),
  analyte.accessor('decimals', { header: 'Decimals', meta: { align: 'right' } }),
  analyte.accessor('teaPct', {
    header: 'TEa',
    meta: { align: 'right' },
    cell: (c) => {
      const item = c.row.original;
      if (item.teaPct === null && item.teaAbsolute === null) return none;
      const source = [item.teaSource, item.teaDate ? formatDate(item.teaDate) : null]
        .filter(Boolean)
        .join(', ');
      // As published rules state it: the larger of the two parts at the control's concentration.
      const parts = [
        item.teaAbsolute !== null ? `± ${item.teaAbsolute} ${item.unit}` : null,
        item.teaPct !== null ? `${item.teaPct} %` : null,
      ].filter(Boolean);
      return (
        <span title={source || undefined} className="whitespace-nowrap">
          {parts.join(' or ')}
        </span>
      );
    },
  }),
  analyte.accessor('plausibleLow', {
    header: 'Plausible range',
    meta: { align: 'right' },
    cell: (c) => {
      const item = c.row.original;
      if (item.plausibleLow === null && item.plausibleHigh === null) return none;
      return (
        <span title={item.plausibilitySource ?? undefined} className="whitespace-nowrap">
          {item.plausibleLow ?? '−∞'} – {item.plausibleHigh ?? '∞'}
        </span>
      );
    },
  }),
] as ColumnDef<AnalyteItem>[];

const method = createColumnHelper<MethodItem>();
const methodColumns = [
  method.accessor('code', { header: 'Code', cell: (c) => <Code>{c.getValue()}</Code> }),
  method.accessor('name', { header: 'Name' }),
  method.accessor('principle', { header: 'Principle', cell: (c) => orNone(c.getValue()) }),
] as ColumnDef<MethodItem>[];

const made = createColumnHelper<InstrumentModelItem>();
const manufacturedColumns = [
  made.accessor('code', { header: 'Code', cell: (c) => <Code>{c.getValue()}</Code> }),
  made.accessor('name', { header: 'Name' }),
  made.accessor('manufacturer', { header: 'Manufacturer', cell: (c) => orNone(c.getValue()) }),
] as ColumnDef<InstrumentModelItem>[];

const material = createColumnHelper<ControlMaterialItem>();
const materialColumns = [
  material.accessor('code', { header: 'Code', cell: (c) => <Code>{c.getValue()}</Code> }),
  material.accessor('name', { header: 'Name' }),
  material.accessor('manufacturer', { header: 'Manufacturer', cell: (c) => orNone(c.getValue()) }),
  material.accessor('matrix', { header: 'Matrix', cell: (c) => orNone(c.getValue()) }),
] as ColumnDef<ControlMaterialItem>[];

const lot = createColumnHelper<ControlLotItem>();
const lotColumns = [
  lot.accessor('lotNumber', { header: 'Lot number', cell: (c) => <Code>{c.getValue()}</Code> }),
  lot.accessor((item) => item.material.name, {
    id: 'material',
    header: 'Material',
    cell: (c) => (
      <span>
        <span className="font-medium text-slate-800">{c.row.original.material.code}</span>{' '}
        <span className="text-slate-600">{c.getValue()}</span>
      </span>
    ),
  }),
  lot.accessor((item) => item.levels.length, {
    id: 'levels',
    header: 'Levels',
    cell: (c) => (
      <ul className="flex flex-wrap gap-x-3 gap-y-0.5">
        {c.row.original.levels.map((level) => (
          <li key={level.level} className="whitespace-nowrap">
            <span className="font-medium">{level.level}</span>
            {level.description ? <span className="text-slate-600"> {level.description}</span> : null}
          </li>
        ))}
      </ul>
    ),
  }),
  lot.accessor('expiresOn', {
    header: 'Expires',
    cell: (c) => <time dateTime={c.getValue()}>{formatDate(c.getValue())}</time>,
  }),
] as ColumnDef<ControlLotItem>[];

const columnsByList = {
  analytes: analyteColumns,
  methods: methodColumns,
  'instrument-models': manufacturedColumns,
  reagents: manufacturedColumns,
  'control-materials': materialColumns,
  'control-lots': lotColumns,
} as unknown as Record<CatalogueList, ColumnDef<CatalogueItem>[]>;

export function catalogueColumns(
  list: CatalogueList,
  actions: CatalogueRowActions,
): ColumnDef<CatalogueItem>[] {
  const sortable: readonly string[] = catalogueSortColumns[list];
  const own = columnsByList[list].map((column) => {
    const id = column.id ?? ('accessorKey' in column ? String(column.accessorKey) : '');
    return { ...column, id, enableSorting: sortable.includes(id) };
  });
  return [
    ...own,
    {
      id: 'state',
      header: 'State',
      enableSorting: list === 'control-lots',
      cell: (c) => <StateBadge item={c.row.original} />,
    },
    {
      id: 'actions',
      header: () => <span className="sr-only">Actions</span>,
      enableSorting: false,
      meta: { align: 'right' },
      cell: (c) => <RowActions item={c.row.original} actions={actions} />,
    },
  ];
}
