// An invited user chooses a password (the contract's rule: at least 12 characters), types it twice,
// and is signed in with it straight away.
import { useForm } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import { z } from 'zod';
import { invitationAcceptSchema, type InvitationInfo } from '@plumbline/contracts';
import { Alert } from '../../../components/ui/alert.tsx';
import { Button } from '../../../components/ui/button.tsx';
import { TextField } from '../../../components/ui/text-field.tsx';
import { useSignIn } from '../../../lib/auth.tsx';
import { applyServerFieldErrors, errorMessage, formAlertMessage } from '../../../lib/form-errors.ts';
import { formatDateTime } from '../../../utils/format.ts';
import { useAcceptInvitation } from '../api/invitation.ts';

/** The contract's accept schema plus the repeated password, which only the form needs. */
export const acceptFormSchema = invitationAcceptSchema
  .extend({ repeatPassword: z.string() })
  .refine((values) => values.password === values.repeatPassword, {
    path: ['repeatPassword'],
    message: 'the two passwords are not the same',
  });

type FormValues = z.input<typeof acceptFormSchema>;

export function AcceptInvitationForm({
  token,
  invitation,
  onSignedIn,
}: {
  token: string;
  invitation: InvitationInfo;
  onSignedIn: () => void;
}) {
  const accept = useAcceptInvitation();
  const signIn = useSignIn({ onSuccess: onSignedIn });
  const form = useForm<FormValues, unknown, z.output<typeof acceptFormSchema>>({
    resolver: zodResolver(acceptFormSchema),
    defaultValues: { token, password: '', repeatPassword: '' },
  });
  const { errors } = form.formState;

  const onSubmit = form.handleSubmit(({ password }) =>
    accept.mutate(
      { token, password },
      {
        onSuccess: ({ email }) => signIn.mutate({ email, password }),
        onError: (error) => applyServerFieldErrors(error, form.setError, ['password']),
      },
    ),
  );

  const failure = accept.error ?? signIn.error;
  return (
    <form noValidate onSubmit={onSubmit} className="flex flex-col gap-5" aria-label="Set your password">
      {failure ? (
        <Alert
          tone="error"
          title={accept.error ? 'Your password was not set' : 'Your password is set, but signing in failed'}
        >
          {accept.error ? formAlertMessage(accept.error, ['password']) : errorMessage(failure)}
        </Alert>
      ) : null}
      <dl className="grid grid-cols-[auto_1fr] gap-x-4 gap-y-1 rounded-md bg-plumb-50 px-4 py-3 text-sm">
        <dt className="text-slate-600">Name</dt>
        <dd className="font-medium text-slate-900">{invitation.name}</dd>
        <dt className="text-slate-600">E-mail</dt>
        <dd className="font-medium break-all text-slate-900">{invitation.email}</dd>
        <dt className="text-slate-600">Lab</dt>
        <dd className="font-medium text-slate-900">{invitation.labName}</dd>
      </dl>
      {/* Lets password managers store the password under the right account. */}
      <input type="hidden" name="username" autoComplete="username" value={invitation.email} readOnly />
      <TextField
        label="New password"
        type="password"
        autoComplete="new-password"
        hint="At least 12 characters. A few unrelated words make a good one."
        error={errors.password?.message}
        {...form.register('password')}
      />
      <TextField
        label="Repeat the password"
        type="password"
        autoComplete="new-password"
        error={errors.repeatPassword?.message}
        {...form.register('repeatPassword')}
      />
      <Button type="submit" isLoading={accept.isPending || signIn.isPending} className="mt-1 w-full">
        Set password and sign in
      </Button>
      <p className="text-center text-xs text-slate-600">
        This invitation can be used until {formatDateTime(invitation.expiresAt)}.
      </p>
    </form>
  );
}
