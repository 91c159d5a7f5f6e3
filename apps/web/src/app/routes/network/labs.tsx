// Member labs: the list, and beside it the lab opened (?lab=<id>) with its actions (edit, deactivate,
// reactivate) and its users and invitations. Enrolling a new lab starts from the page header.
import { useState } from 'react';
import { useSearchParams } from 'react-router-dom';
import { useQuery } from '@tanstack/react-query';
import { ContentLayout } from '../../../components/layouts/content-layout.tsx';
import { Alert } from '../../../components/ui/alert.tsx';
import { Button } from '../../../components/ui/button.tsx';
import { EmptyState } from '../../../components/ui/empty-state.tsx';
import { PageLoading } from '../../../components/ui/page-loading.tsx';
import { networkLabsKeys } from '../../../features/network-labs/api/network-labs-keys.ts';
import {
  LabFormDialog,
  type LabFormState,
} from '../../../features/network-labs/components/lab-form-dialog.tsx';
import {
  LabStateDialog,
  type LabStateRequest,
} from '../../../features/network-labs/components/lab-state-dialog.tsx';
import { LabPanel } from '../../../features/network-labs/components/lab-panel.tsx';
import { LabsTable } from '../../../features/network-labs/components/labs-table.tsx';
import { errorMessage } from '../../../lib/form-errors.ts';

export default function LabsRoute() {
  const labs = useQuery(networkLabsKeys.labs());
  const [searchParams, setSearchParams] = useSearchParams();
  const [labForm, setLabForm] = useState<LabFormState>(null);
  const [stateChange, setStateChange] = useState<LabStateRequest>(null);
  const selectedLabId = searchParams.get('lab');
  const selected = labs.data?.find((lab) => lab.id === selectedLabId) ?? null;

  return (
    <ContentLayout
      title="Labs"
      area="Network set-up"
      width="wide"
      description="Member labs of the network and their users. Other labs only ever see a lab's code; only you see which code belongs to which lab."
      actions={<Button onClick={() => setLabForm({ mode: 'enrol' })}>Enrol a lab</Button>}
    >
      {labs.isPending ? (
        <PageLoading />
      ) : labs.isError ? (
        <Alert tone="error" title="The labs could not be loaded">
          {errorMessage(labs.error)}
        </Alert>
      ) : (
        <div className="grid items-start gap-6 lg:grid-cols-[minmax(0,5fr)_minmax(0,7fr)]">
          <LabsTable
            labs={labs.data}
            actions={{
              selectedLabId: selected?.id ?? null,
              onSelect: (lab) => {
                setSearchParams({ lab: lab.id }, { replace: true });
                // Take keyboard and screen-reader users to the users that just appeared.
                requestAnimationFrame(() => document.getElementById('lab-panel-title')?.focus());
              },
            }}
          />
          <div className="lg:sticky lg:top-4">
            {selected ? (
              <LabPanel
                key={selected.id}
                lab={selected}
                onEdit={(lab) => setLabForm({ mode: 'edit', lab })}
                onStateChange={(lab, action) => setStateChange({ lab, action })}
              />
            ) : (
              <EmptyState
                title="Open a lab to manage it"
                description="Its name, code and state can be changed there, and its users listed: invite someone, change a role or withdraw an invitation."
              />
            )}
          </div>
        </div>
      )}
      <LabFormDialog state={labForm} onClose={() => setLabForm(null)} />
      <LabStateDialog request={stateChange} onClose={() => setStateChange(null)} />
    </ContentLayout>
  );
}
