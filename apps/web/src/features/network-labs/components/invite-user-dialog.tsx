// Invite someone to a lab. Until invitations are e-mailed, the API answers the link itself and the
// coordinator passes it on; the dialog shows it with a copy button and how long it lasts.
import { useId, useState } from 'react';
import { useForm } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import type { z } from 'zod';
import { invitationCreateSchema, type InvitationCreated, type LabListItem } from '@plumbline/contracts';
import { Alert } from '../../../components/ui/alert.tsx';
import { Button } from '../../../components/ui/button.tsx';
import { CopyButton } from '../../../components/ui/copy-button.tsx';
import { Dialog, DialogActions } from '../../../components/ui/dialog.tsx';
import { SelectField } from '../../../components/ui/select-field.tsx';
import { TextField } from '../../../components/ui/text-field.tsx';
import { showToast } from '../../../components/ui/toast.tsx';
import { applyServerFieldErrors, formAlertMessage } from '../../../lib/form-errors.ts';
import { formatDateTime } from '../../../utils/format.ts';
import { useInviteLabUser } from '../api/lab-users.ts';

type FormValues = z.input<typeof invitationCreateSchema>;
const inviteFields = ['email', 'name', 'role'];

export function InviteUserDialog({
  lab,
  open,
  onClose,
}: {
  lab: LabListItem;
  open: boolean;
  onClose: () => void;
}) {
  return (
    <Dialog open={open} onClose={onClose} title={`Invite a user to ${lab.code}`} description={lab.name}>
      <InviteSteps lab={lab} onClose={onClose} />
    </Dialog>
  );
}

function InviteSteps({ lab, onClose }: { lab: LabListItem; onClose: () => void }) {
  const [created, setCreated] = useState<InvitationCreated | null>(null);
  if (created) return <InvitationLink invitation={created} onClose={onClose} />;
  return <InviteForm lab={lab} onClose={onClose} onCreated={setCreated} />;
}

function InviteForm({
  lab,
  onClose,
  onCreated,
}: {
  lab: LabListItem;
  onClose: () => void;
  onCreated: (invitation: InvitationCreated) => void;
}) {
  const invite = useInviteLabUser();
  const form = useForm<FormValues, unknown, z.output<typeof invitationCreateSchema>>({
    resolver: zodResolver(invitationCreateSchema),
    defaultValues: { email: '', name: '', role: 'analyst' },
  });
  const { errors } = form.formState;
  const onSubmit = form.handleSubmit((body) =>
    invite.mutate(
      { labId: lab.id, body },
      {
        onSuccess: (invitation) => {
          showToast(`Invitation for ${invitation.user.email} created.`);
          onCreated(invitation);
        },
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
          <option value="analyst">Analyst: uploads QC data and reads the lab&rsquo;s reports</option>
          <option value="supervisor">Supervisor: also manages the lab&rsquo;s procedures and users</option>
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
      <Alert tone="info" title="E-mail delivery is not configured">
        Plumbline does not send e-mail yet. Send this link to {invitation.user.name} yourself, by a channel
        you trust: whoever opens it can set the password of this account.
      </Alert>
      <div className="mt-5 flex flex-col gap-1.5">
        <label htmlFor={linkId} className="text-sm font-medium text-slate-800">
          Invitation link for {invitation.user.email}
        </label>
        <div className="flex flex-wrap items-center gap-2">
          <input
            id={linkId}
            readOnly
            // The form that had focus is gone: focus (and select) the link, ready to copy.
            autoFocus
            value={invitation.link}
            onFocus={(event) => event.target.select()}
            className="h-10 min-w-0 flex-1 rounded-md border border-slate-300 bg-slate-50 px-3 font-mono text-xs text-slate-800"
          />
          <CopyButton text={invitation.link} label="Copy link" />
        </div>
        <p className="text-xs text-slate-600">
          The link works once, until {formatDateTime(invitation.expiresAt)}. Inviting the same address again
          replaces it.
        </p>
      </div>
      <DialogActions>
        <Button onClick={onClose}>Done</Button>
      </DialogActions>
    </div>
  );
}
