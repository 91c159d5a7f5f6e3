// Sign-in with e-mail and password. The contract's loginRequestSchema validates the fields here
// exactly as the API validates them; errors from the API appear above the form.
import { useForm } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import { z } from 'zod';
import {
  fieldErrorSchema,
  loginRequestSchema,
  type LoginRequest,
  type LoginResponse,
} from '@plumbline/contracts';
import { Alert } from '../../../components/ui/alert.tsx';
import { Button } from '../../../components/ui/button.tsx';
import { TextField } from '../../../components/ui/text-field.tsx';
import { isApiError } from '../../../lib/api-client.ts';
import { useSignIn, type SignInInput } from '../../../lib/auth.tsx';

const formFields = ['email', 'password'] as const satisfies readonly (keyof LoginRequest)[];

function isFormField(path: string): path is (typeof formFields)[number] {
  return (formFields as readonly string[]).includes(path);
}

/** After a successful sign-in the session starts; the sign-in route then redirects on its own. */
export function SignInForm({ onSuccess }: { onSuccess?: (response: LoginResponse) => void }) {
  const signIn = useSignIn({ onSuccess });
  const form = useForm<LoginRequest, unknown, SignInInput>({
    resolver: zodResolver(loginRequestSchema),
    defaultValues: { email: '', password: '' },
  });
  const { errors } = form.formState;

  const onSubmit = form.handleSubmit((values) => {
    signIn.mutate(values, {
      onError: (error) => {
        // A validation_failed answer names its fields; show each message beside its field.
        if (!isApiError(error) || error.code !== 'validation_failed') return;
        const fieldErrors = z.array(fieldErrorSchema).safeParse(error.details);
        if (!fieldErrors.success) return;
        for (const fieldError of fieldErrors.data) {
          if (isFormField(fieldError.path)) form.setError(fieldError.path, { message: fieldError.message });
        }
      },
    });
  });

  const serverError = signIn.error
    ? isApiError(signIn.error)
      ? signIn.error.message
      : 'Signing in failed for an unexpected reason. Try again.'
    : null;

  return (
    <form noValidate onSubmit={onSubmit} className="flex flex-col gap-5" aria-label="Sign in">
      {serverError ? (
        <Alert tone="error" title="You are not signed in">
          {serverError}
        </Alert>
      ) : null}
      <TextField
        label="E-mail address"
        type="email"
        autoComplete="username"
        inputMode="email"
        spellCheck={false}
        error={errors.email?.message}
        {...form.register('email')}
      />
      <TextField
        label="Password"
        type="password"
        autoComplete="current-password"
        error={errors.password?.message}
        {...form.register('password')}
      />
      <Button type="submit" isLoading={signIn.isPending} className="mt-1 w-full">
        Sign in
      </Button>
    </form>
  );
}
