// The lab's users for its supervisor: who has access and in which role, invitations waiting for an
// answer; invite someone (the link is shown to pass on), change a role, deactivate or reactivate.
import { useId, useState } from 'react';
import { useQuery } from '@tanstack/react-query';
import { useForm } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import type { z } from 'zod';
import { invitationCreateSchema, toCsv, type InvitationCreated, type LabUser } from '@plumbline/contracts';
import { Alert } from '../../../components/ui/alert.tsx';
import { Badge } from '../../../components/ui/badge.tsx';
import { Button } from '../../../components/ui/button.tsx';
import { ConfirmDialog } from '../../../components/ui/confirm-dialog.tsx';
import { CopyButton } from '../../../components/ui/copy-button.tsx';
import { Dialog, DialogActions } from '../../../components/ui/dialog.tsx';
import { SelectField } from '../../../components/ui/select-field.tsx';
import { TextField } from '../../../components/ui/text-field.tsx';
import { showToast } from '../../../components/ui/toast.tsx';
import { saveFile } from '../../../lib/api-client.ts';
import { applyServerFieldErrors, errorMessage, formAlertMessage } from '../../../lib/form-errors.ts';
import { formatDate, formatDateTime } from '../../../utils/format.ts';
import { labAdminKeys } from '../api/lab-admin-keys.ts';
import { useInviteUser, useUpdateUser } from '../api/lab-users.ts';

const roleWords = { analyst: 'Analyst', supervisor: 'Supervisor' } as const;

type Change =
  | { user: LabUser; kind: 'role'; role: 'analyst' | 'supervisor' }
  | { user: LabUser; kind: 'deactivate' }
  | { user: LabUser; kind: 'reactivate' };

function statusOf(user: LabUser): { label: string; tone: 'plumb' | 'brass' | 'muted' } {
  if (user.invitationPending && user.active === false)
    return { label: 'Invited, not yet accepted', tone: 'brass' };
  if (!user.active) return { label: 'Deactivated', tone: 'muted' };
  return { label: 'Active', tone: 'plumb' };
}

export function LabUsers({ labId, currentUserId }: { labId: string; currentUserId: string }) {
  const headingId = useId();
  const users = useQuery(labAdminKeys.users(labId));
  const update = useUpdateUser();
  const [inviting, setInviting] = useState(false);
  const [change, setChange] = useState<Change | null>(null);

  const closeChange = () => {
    update.reset();
    setChange(null);
  };
  const list = [...(users.data ?? [])].sort(
    (a, b) => Number(b.active) - Number(a.active) || a.name.localeCompare(b.name),
  );

  return (
    <section aria-labelledby={headingId} className="space-y-3">
      <div className="flex flex-wrap items-end justify-between gap-3">
        <div>
          <h2 id={headingId} className="text-lg font-semibold text-plumb-950">
            Users
          </h2>
          <p className="text-sm text-slate-600">
            Analysts upload data and write comments; supervisors also manage the lab and sign the month off.
          </p>
        </div>
        <div className="flex gap-2">
          <Button
            variant="secondary"
            size="sm"
            disabled={list.length === 0}
            onClick={() =>
              saveFile(
                new Blob(
                  [
                    toCsv(
                      ['name', 'email', 'role', 'status', 'since'],
                      list.map((u) => [u.name, u.email, u.role, statusOf(u).label, u.createdAt]),
                    ),
                  ],
                  { type: 'text/csv;charset=utf-8' },
                ),
                'lab-users.csv',
              )
            }
          >
            Download CSV
          </Button>
          <Button size="sm" onClick={() => setInviting(true)}>
            Invite a user
          </Button>
        </div>
      </div>
      {users.isError ? (
        <Alert tone="error" title="The users could not be loaded">
          {errorMessage(users.error)}
        </Alert>
      ) : (
        <div className="overflow-x-auto rounded-lg border border-slate-200 bg-white shadow-xs">
          <table className="w-full text-sm">
            <caption className="sr-only">Users of your lab</caption>
            <thead>
              <tr className="border-b border-slate-200 bg-slate-50 text-left text-xs text-slate-600">
                <th scope="col" className="px-3 py-2 font-semibold">
                  Name
                </th>
                <th scope="col" className="px-3 py-2 font-semibold">
                  Role
                </th>
                <th scope="col" className="px-3 py-2 font-semibold">
                  Status
                </th>
                <th scope="col" className="px-3 py-2 font-semibold">
                  Since
                </th>
                <th scope="col" className="px-3 py-2">
                  <span className="sr-only">Actions</span>
                </th>
              </tr>
            </thead>
            <tbody>
              {users.isPending ? (
                <tr>
                  <td colSpan={5} className="px-3 py-6 text-center text-slate-600">
                    Loading…
                  </td>
                </tr>
              ) : (
                list.map((user) => {
                  const status = statusOf(user);
                  const self = user.id === currentUserId;
                  const otherRole = user.role === 'analyst' ? 'supervisor' : 'analyst';
                  return (
                    <tr
                      key={user.id}
                      className={`border-b border-slate-100 ${user.active ? '' : 'text-slate-500'}`}
                    >
                      <th scope="row" className="px-3 py-2 text-left font-medium">
                        <span className="text-slate-900">{user.name}</span>
                        {self ? <span className="ml-1 text-xs font-normal text-slate-500">(you)</span> : null}
                        <span className="block text-xs font-normal text-slate-600">{user.email}</span>
                      </th>
                      <td className="px-3 py-2">{roleWords[user.role]}</td>
                      <td className="px-3 py-2">
                        <Badge tone={status.tone}>{status.label}</Badge>
                      </td>
                      <td className="px-3 py-2 text-xs whitespace-nowrap">{formatDate(user.createdAt)}</td>
                      <td className="px-3 py-2 text-right whitespace-nowrap">
                        {self ? null : (
                          <span className="inline-flex gap-1">
                            {user.active ? (
                              <Button
                                variant="ghost"
                                size="xs"
                                onClick={() => setChange({ user, kind: 'role', role: otherRole })}
                              >
                                Make {roleWords[otherRole].toLowerCase()}
                              </Button>
                            ) : null}
                            {user.active || user.invitationPending ? (
                              <Button
                                variant="ghost"
                                size="xs"
                                onClick={() => setChange({ user, kind: 'deactivate' })}
                              >
                                {user.invitationPending ? 'Withdraw invitation' : 'Deactivate'}
                              </Button>
                            ) : (
                              <Button
                                variant="ghost"
                                size="xs"
                                onClick={() => setChange({ user, kind: 'reactivate' })}
                              >
                                Reactivate
                              </Button>
                            )}
                          </span>
                        )}
                      </td>
                    </tr>
                  );
                })
              )}
            </tbody>
          </table>
        </div>
      )}
      <InviteDialog labId={labId} open={inviting} onClose={() => setInviting(false)} />
      <ConfirmDialog
        open={change !== null}
        onClose={closeChange}
        title={
          change?.kind === 'role'
            ? `Make ${change.user.name} ${roleWords[change.role].toLowerCase()}?`
            : change?.kind === 'deactivate'
              ? change.user.invitationPending
                ? `Withdraw the invitation of ${change.user.name}?`
                : `Deactivate ${change.user.name}?`
              : `Reactivate ${change?.user.name ?? ''}?`
        }
        confirmLabel={
          change?.kind === 'role'
            ? 'Change role'
            : change?.kind === 'deactivate'
              ? change.user.invitationPending
                ? 'Withdraw'
                : 'Deactivate'
              : 'Reactivate'
        }
        tone={change?.kind === 'deactivate' ? 'danger' : 'primary'}
        reason="optional"
        isPending={update.isPending}
        error={update.error ? errorMessage(update.error) : null}
        onConfirm={(reason) => {
          if (!change) return;
          const body =
            change.kind === 'role'
              ? { role: change.role, reason: reason || undefined }
              : { active: change.kind === 'reactivate', reason: reason || undefined };
          update.mutate(
            { labId, userId: change.user.id, body },
            {
              onSuccess: () => {
                showToast(
                  `${change.user.name}: ${change.kind === 'role' ? `now ${roleWords[change.role].toLowerCase()}` : change.kind === 'deactivate' ? 'access removed' : 'access restored'}.`,
                );
                closeChange();
              },
            },
          );
        }}
      >
        {change?.kind === 'role' ? (
          <p>
            {change.role === 'supervisor'
              ? 'A supervisor can also manage the lab’s users, API tokens and procedures, and sign the monthly review off.'
              : 'An analyst uploads data, reads the reports and writes comments, but no longer manages the lab.'}
          </p>
        ) : change?.kind === 'deactivate' ? (
          <p>
            {change.user.invitationPending
              ? 'The invitation link stops working.'
              : `${change.user.name} can no longer sign in. Their comments and uploads stay.`}
          </p>
        ) : (
          <p>{change?.user.name} can sign in again.</p>
        )}
      </ConfirmDialog>
    </section>
  );
}

type InviteValues = z.input<typeof invitationCreateSchema>;
const inviteFields = ['email', 'name', 'role'];

function InviteDialog({ labId, open, onClose }: { labId: string; open: boolean; onClose: () => void }) {
  const [created, setCreated] = useState<InvitationCreated | null>(null);
  const close = () => {
    setCreated(null);
    onClose();
  };
  return (
    <Dialog open={open} onClose={close} title="Invite a user to your lab">
      {created ? (
        <InvitationLink invitation={created} onClose={close} />
      ) : (
        <InviteForm labId={labId} onClose={close} onCreated={setCreated} />
      )}
    </Dialog>
  );
}

function InviteForm({
  labId,
  onClose,
  onCreated,
}: {
  labId: string;
  onClose: () => void;
  onCreated: (i: InvitationCreated) => void;
}) {
  const invite = useInviteUser();
  const form = useForm<InviteValues, unknown, z.output<typeof invitationCreateSchema>>({
    resolver: zodResolver(invitationCreateSchema),
    defaultValues: { email: '', name: '', role: 'analyst' },
  });
  const { errors } = form.formState;
  const onSubmit = form.handleSubmit((body) =>
    invite.mutate(
      { labId, body },
      {
        onSuccess: onCreated,
        onError: (error) => applyServerFieldErrors(error, form.setError, inviteFields),
      },
    ),
  );
  return (
    <form noValidate onSubmit={onSubmit}>
      {invite.error ? (
        <div className="mb-5">
          <Alert tone="error" title="No invitation was created">
            {formAlertMessage(invite.error, inviteFields)}
          </Alert>
        </div>
      ) : null}
      <div className="grid gap-4">
        <TextField label="Name" autoComplete="off" error={errors.name?.message} {...form.register('name')} />
        <TextField
          label="E-mail address"
          type="email"
          autoComplete="off"
          spellCheck={false}
          error={errors.email?.message}
          {...form.register('email')}
        />
        <SelectField label="Role" error={errors.role?.message} {...form.register('role')}>
          <option value="analyst">Analyst: uploads QC data, reads reports, writes comments</option>
          <option value="supervisor">Supervisor: also manages the lab and signs the month off</option>
        </SelectField>
      </div>
      <DialogActions>
        <Button variant="secondary" onClick={onClose}>
          Cancel
        </Button>
        <Button type="submit" isLoading={invite.isPending}>
          Create invitation
        </Button>
      </DialogActions>
    </form>
  );
}

function InvitationLink({ invitation, onClose }: { invitation: InvitationCreated; onClose: () => void }) {
  const linkId = useId();
  return (
    <div>
      <Alert tone="info" title="Pass this link on yourself">
        Plumbline does not send e-mail yet. Send the link to {invitation.user.name} by a channel you trust:
        whoever opens it can set the password of this account.
      </Alert>
      <div className="mt-5 flex flex-col gap-1.5">
        <label htmlFor={linkId} className="text-sm font-medium text-slate-800">
          Invitation link for {invitation.user.email}
        </label>
        <div className="flex flex-wrap items-center gap-2">
          <input
            id={linkId}
            readOnly
            autoFocus
            value={invitation.link}
            onFocus={(event) => event.target.select()}
            className="h-10 min-w-0 flex-1 rounded-md border border-slate-300 bg-slate-50 px-3 font-mono text-xs text-slate-800"
          />
          <CopyButton text={invitation.link} label="Copy link" />
        </div>
        <p className="text-xs text-slate-600">
          The link works once, until {formatDateTime(invitation.expiresAt)}.
        </p>
      </div>
      <DialogActions>
        <Button onClick={onClose}>Done</Button>
      </DialogActions>
    </div>
  );
}
