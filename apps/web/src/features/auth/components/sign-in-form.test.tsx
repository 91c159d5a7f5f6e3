import { render, screen, waitFor } from '@testing-library/react';
import userEvent from '@testing-library/user-event';
import { QueryClientProvider } from '@tanstack/react-query';
import { describe, expect, it } from 'vitest';
import { getSession } from '../../../lib/session.ts';
import { buildSession } from '../../../testing/data.ts';
import { mockApi } from '../../../testing/mock-api.ts';
import { createTestQueryClient } from '../../../testing/render-app.tsx';
import { SignInForm } from './sign-in-form.tsx';

function renderForm() {
  const user = userEvent.setup();
  render(
    <QueryClientProvider client={createTestQueryClient()}>
      <SignInForm />
    </QueryClientProvider>,
  );
  return {
    user,
    email: screen.getByLabelText('E-mail address') as HTMLInputElement,
    password: screen.getByLabelText('Password') as HTMLInputElement,
    submit: screen.getByRole('button', { name: 'Sign in' }),
  };
}

describe('sign-in form', () => {
  it('when the e-mail address is not valid, then the field shows an error and nothing is sent', async () => {
    const api = mockApi({});
    const { user, email, password, submit } = renderForm();

    await user.type(email, 'not-an-email');
    await user.type(password, 'some password');
    await user.click(submit);

    expect(await screen.findByText(/enter a valid e-mail address/i)).toBeTruthy();
    expect(email.getAttribute('aria-invalid')).toBe('true');
    expect(password.getAttribute('aria-invalid')).toBeNull();
    expect(api.requests).toHaveLength(0);
  });

  it('when the password is left empty, then the password field asks for it', async () => {
    mockApi({});
    const { user, email, submit } = renderForm();

    await user.type(email, 'analyst@kestrel-vale.example');
    await user.click(submit);

    expect(await screen.findByText(/enter your password/i)).toBeTruthy();
  });

  it('when the API answers 401, then its message is shown and no session starts', async () => {
    const message = 'The e-mail address or password is not correct.';
    mockApi({
      'POST /api/auth/login': { status: 401, body: { error: { code: 'unauthenticated', message } } },
    });
    const { user, email, password, submit } = renderForm();

    await user.type(email, 'analyst@kestrel-vale.example');
    await user.type(password, 'wrong password');
    await user.click(submit);

    const alert = await screen.findByRole('alert');
    expect(alert.textContent).toContain(message);
    expect(getSession()).toBeNull();
  });

  it('when sign-in is locked out after failed attempts (429), then the wait is shown and no session starts', async () => {
    mockApi({
      'POST /api/auth/login': {
        status: 429,
        body: {
          error: {
            code: 'too_many_requests',
            message: 'Too many failed sign-in attempts. Try again in 2 minutes.',
          },
        },
      },
    });
    const { user, email, password, submit } = renderForm();

    await user.type(email, 'analyst@kestrel-vale.example');
    await user.type(password, 'plumbline-demo');
    await user.click(submit);

    expect(await screen.findByText(/Try again in 2 minutes/)).toBeTruthy();
    expect(getSession()).toBeNull();
  });

  it('when the API rejects a field, then its message appears beside that field', async () => {
    mockApi({
      'POST /api/auth/login': {
        status: 400,
        body: {
          error: {
            code: 'validation_failed',
            message: 'The sign-in request is not valid.',
            details: [{ path: 'email', message: 'this e-mail domain is not accepted' }],
          },
        },
      },
    });
    const { user, email, password, submit } = renderForm();

    await user.type(email, 'analyst@kestrel-vale.example');
    await user.type(password, 'plumbline-demo');
    await user.click(submit);

    expect(await screen.findByText(/this e-mail domain is not accepted/i)).toBeTruthy();
    expect(email.getAttribute('aria-invalid')).toBe('true');
  });

  it('when the credentials are accepted, then the session starts for the user and the e-mail was sent in lower case', async () => {
    const session = buildSession('analyst');
    const api = mockApi({ 'POST /api/auth/login': { status: 200, body: session } });
    const { user, email, password, submit } = renderForm();

    await user.type(email, 'Analyst@Kestrel-Vale.example');
    await user.type(password, 'plumbline-demo');
    await user.click(submit);

    await waitFor(() => expect(getSession()?.user.id).toBe(session.user.id));
    expect(api.requests[0]?.body).toEqual({
      email: 'analyst@kestrel-vale.example',
      password: 'plumbline-demo',
    });
  });
});
