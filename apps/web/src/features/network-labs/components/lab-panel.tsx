// One lab: its code, name and state with their actions (edit, deactivate, reactivate), and its users:
// who they are, their role, whether they have accepted their invitation; invite someone, change a
// role, deactivate or reactivate an account, withdraw an invitation.
import { useState } from 'react';
import { useQuery } from '@tanstack/react-query';
import {
  createColumnHelper,
  getCoreRowModel,
  getSortedRowModel,
  useReactTable,
  type SortingState,
} from '@tanstack/react-table';
import type { LabListItem, LabUser, LabUserUpdate } from '@plumbline/contracts';
import { Alert } from '../../../components/ui/alert.tsx';
import { Badge } from '../../../components/ui/badge.tsx';
import { Button } from '../../../components/ui/button.tsx';
import { ConfirmDialog } from '../../../components/ui/confirm-dialog.tsx';
import { DataTable } from '../../../components/ui/data-table.tsx';
import { showToast } from '../../../components/ui/toast.tsx';
import { errorMessage } from '../../../lib/form-errors.ts';
import { formatDate } from '../../../utils/format.ts';
import { useUpdateLabUser } from '../api/lab-users.ts';
import { networkLabsKeys } from '../api/network-labs-keys.ts';
import { InviteUserDialog } from './invite-user-dialog.tsx';

type UserChange = {
  user: LabUser;
  body: LabUserUpdate;
  title: string;
  confirmLabel: string;
  done: string;
  danger: boolean;
  text: string;
};

function statusOf(user: LabUser) {
  if (user.invitationPending) return <Badge tone="brass">Invitation pending</Badge>;
  return user.active ? <Badge tone="plumb">Active</Badge> : <Badge tone="muted">Inactive</Badge>;
}

/** The changes that make sense for a user in their current state. */
function changesFor(user: LabUser): UserChange[] {
  const changes: UserChange[] = [];
  const otherRole = user.role === 'analyst' ? 'supervisor' : 'analyst';
  if (user.active) {
    changes.push({
      user,
      body: { role: otherRole },
      title: `Make ${user.name} ${otherRole === 'supervisor' ? 'a supervisor' : 'an analyst'}?`,
      confirmLabel: `Make ${otherRole}`,
      done: `${user.name} is now ${otherRole === 'supervisor' ? 'a supervisor' : 'an analyst'}.`,
      danger: false,
      text:
        otherRole === 'supervisor'
          ? 'A supervisor also manages the lab’s procedures, users and API tokens.'
          : 'An analyst uploads QC data and reads the lab’s reports, but no longer manages the lab.',
    });
    changes.push({
      user,
      body: { active: false },
      title: `Deactivate ${user.name}?`,
      confirmLabel: 'Deactivate',
      done: `${user.name} can no longer sign in.`,
      danger: true,
      text: `${user.email} will no longer be able to sign in. What they did stays in the audit log.`,
    });
  } else if (user.invitationPending) {
    changes.push({
      user,
      body: { active: false },
      title: `Withdraw the invitation of ${user.name}?`,
      confirmLabel: 'Withdraw invitation',
      done: `The invitation of ${user.email} was withdrawn.`,
      danger: true,
      text: 'The link sent to them stops working. You can invite them again later.',
    });
  } else {
    changes.push({
      user,
      body: { active: true },
      title: `Reactivate ${user.name}?`,
      confirmLabel: 'Reactivate',
      done: `${user.name} can sign in again.`,
      danger: false,
      text: `${user.email} will be able to sign in again with their password.`,
    });
  }
  return changes;
}

const column = createColumnHelper<LabUser>();

export function LabPanel({
  lab,
  onEdit,
  onStateChange,
}: {
  lab: LabListItem;
  onEdit: (lab: LabListItem) => void;
  onStateChange: (lab: LabListItem, action: 'deactivate' | 'reactivate') => void;
}) {
  const users = useQuery(networkLabsKeys.users(lab.id));
  const update = useUpdateLabUser();
  const [inviting, setInviting] = useState(false);
  const [change, setChange] = useState<UserChange | null>(null);
  const [sorting, setSorting] = useState<SortingState>([{ id: 'name', desc: false }]);

  const columns = [
    column.accessor('name', {
      header: 'User',
      cell: (c) => (
        <div>
          <p className="font-medium text-slate-900">{c.getValue()}</p>
          <p className="text-xs break-words text-slate-600">{c.row.original.email}</p>
          <p className="text-xs text-slate-500">
            Added <time dateTime={c.row.original.createdAt}>{formatDate(c.row.original.createdAt)}</time>
          </p>
        </div>
      ),
    }),
    column.accessor('role', {
      header: 'Role',
      cell: (c) => (
        <span className="flex flex-col items-start gap-1">
          {c.getValue() === 'supervisor' ? 'Supervisor' : 'Analyst'}
          {statusOf(c.row.original)}
        </span>
      ),
    }),
    column.display({
      id: 'actions',
      header: () => <span className="sr-only">Actions</span>,
      meta: { align: 'right' },
      cell: (c) => (
        <div className="flex flex-col items-end gap-0.5 whitespace-nowrap">
          {changesFor(c.row.original).map((option) => (
            <Button key={option.confirmLabel} variant="ghost" size="xs" onClick={() => setChange(option)}>
              {option.confirmLabel}
            </Button>
          ))}
        </div>
      ),
    }),
  ];
  const table = useReactTable({
    data: users.data ?? [],
    columns,
    state: { sorting },
    onSortingChange: setSorting,
    getCoreRowModel: getCoreRowModel(),
    getSortedRowModel: getSortedRowModel(),
    getRowId: (user) => user.id,
  });

  const closeChange = () => {
    update.reset();
    setChange(null);
  };

  return (
    <section
      aria-labelledby="lab-panel-title"
      className="rounded-lg border border-slate-200 bg-white shadow-xs"
    >
      <div className="flex flex-wrap items-start justify-between gap-3 border-b border-slate-200 px-5 py-4">
        <div className="min-w-0">
          <div className="flex items-center gap-2">
            <p className="text-xs font-semibold tracking-[0.12em] text-brass-700 uppercase">Lab {lab.code}</p>
            {lab.active ? <Badge tone="plumb">Active</Badge> : <Badge tone="muted">Inactive</Badge>}
          </div>
          <h2 id="lab-panel-title" tabIndex={-1} className="mt-1 text-lg font-semibold text-plumb-950">
            {lab.name}
          </h2>
        </div>
        <div className="flex gap-2">
          <Button variant="secondary" size="sm" onClick={() => onEdit(lab)} aria-label={`Edit ${lab.code}`}>
            Edit
          </Button>
          {lab.active ? (
            <Button
              variant="secondary"
              size="sm"
              onClick={() => onStateChange(lab, 'deactivate')}
              aria-label={`Deactivate ${lab.code}`}
            >
              Deactivate
            </Button>
          ) : (
            <Button
              variant="secondary"
              size="sm"
              onClick={() => onStateChange(lab, 'reactivate')}
              aria-label={`Reactivate ${lab.code}`}
            >
              Reactivate
            </Button>
          )}
        </div>
      </div>
      <div className="px-5 py-4">
        <div className="flex flex-wrap items-center justify-between gap-3">
          <h3 className="text-sm font-semibold text-slate-900">Users</h3>
          <Button size="sm" onClick={() => setInviting(true)} disabled={!lab.active}>
            Invite a user
          </Button>
        </div>
        {!lab.active ? (
          <p className="mt-1 text-sm text-slate-600">
            This lab is deactivated; reactivate it before inviting anyone.
          </p>
        ) : null}
        <div className="mt-3">
          {users.isError ? (
            <Alert tone="error" title="The users could not be loaded">
              {errorMessage(users.error)}
            </Alert>
          ) : (
            <DataTable
              table={table}
              caption={`Users of ${lab.code}`}
              emptyMessage={users.isPending ? 'Loading…' : 'Nobody has been invited to this lab yet.'}
              rowClassName={(user) => (user.active || user.invitationPending ? '' : 'text-slate-500')}
            />
          )}
        </div>
      </div>
      <InviteUserDialog lab={lab} open={inviting} onClose={() => setInviting(false)} />
      <ConfirmDialog
        open={change !== null}
        onClose={closeChange}
        title={change?.title ?? ''}
        confirmLabel={change?.confirmLabel ?? ''}
        tone={change?.danger ? 'danger' : 'primary'}
        reason="optional"
        isPending={update.isPending}
        error={update.error ? errorMessage(update.error) : null}
        onConfirm={(reason) => {
          if (!change) return;
          update.mutate(
            { labId: lab.id, userId: change.user.id, body: { ...change.body, reason: reason || undefined } },
            {
              onSuccess: () => {
                showToast(change.done);
                closeChange();
              },
            },
          );
        }}
      >
        <p>{change?.text}</p>
      </ConfirmDialog>
    </section>
  );
}
