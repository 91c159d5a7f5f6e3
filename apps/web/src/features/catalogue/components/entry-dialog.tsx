// The create/edit dialog of one catalogue entry; which form it holds depends on the list.
import type { AnalyteItem, CatalogueList, ControlLotItem } from '@plumbline/contracts';
import { Dialog } from '../../../components/ui/dialog.tsx';
import type { CatalogueItem } from '../api/catalogue-keys.ts';
import { catalogueListLabels, entryName } from '../utils/list-labels.ts';
import { AnalyteForm } from './analyte-form.tsx';
import { ControlLotForm } from './control-lot-form.tsx';
import { SimpleEntryForm, type SimpleList } from './simple-entry-form.tsx';

export type EntryDialogState = { mode: 'create' } | { mode: 'edit'; entry: CatalogueItem } | null;

export function EntryDialog({
  list,
  state,
  onClose,
}: {
  list: CatalogueList;
  state: EntryDialogState;
  onClose: () => void;
}) {
  const labels = catalogueListLabels[list];
  const entry = state?.mode === 'edit' ? state.entry : null;
  const title = entry ? `Edit ${labels.singular} ${entryName(entry)}` : `New ${labels.singular}`;
  return (
    <Dialog open={state !== null} onClose={onClose} title={title} size={list === 'analytes' ? 'lg' : 'md'}>
      {list === 'analytes' ? (
        <AnalyteForm entry={entry as AnalyteItem | null} onDone={onClose} />
      ) : list === 'control-lots' ? (
        <ControlLotForm entry={entry as ControlLotItem | null} onDone={onClose} />
      ) : (
        <SimpleEntryForm
          list={list as SimpleList}
          entry={entry as Exclude<CatalogueItem, AnalyteItem | ControlLotItem> | null}
          onDone={onClose}
        />
      )}
    </Dialog>
  );
}
