// Sign-in state for React: the session hooks, the current user (GET /api/me), and the sign-in and
// sign-out mutations. The session itself lives in session.ts (localStorage).
import { useSyncExternalStore } from 'react';
import { queryOptions, useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import type { z } from 'zod';
import {
  loginResponseSchema,
  meResponseSchema,
  type LoginResponse,
  type loginRequestSchema,
} from '@plumbline/contracts';
import { apiRequest } from './api-client.ts';
import {
  endSession,
  getSessionState,
  startSession,
  subscribeToSession,
  type Session,
  type SessionState,
} from './session.ts';

export type { Session, SessionState } from './session.ts';

/** What the sign-in form hands over once the contract schema has validated it. */
export type SignInInput = z.output<typeof loginRequestSchema>;

export const authQueryKeys = {
  all: ['auth'] as const,
  me: () => [...authQueryKeys.all, 'me'] as const,
};

export function getMe(signal?: AbortSignal) {
  return apiRequest('/me', { schema: meResponseSchema, signal });
}

export function meQueryOptions() {
  return queryOptions({
    queryKey: authQueryKeys.me(),
    queryFn: ({ signal }) => getMe(signal),
  });
}

export function useSessionState(): SessionState {
  return useSyncExternalStore(subscribeToSession, getSessionState, getSessionState);
}

/** The signed-in session, or null. Role and user id are known here without waiting for the API. */
export function useSession(): Session | null {
  return useSessionState().session;
}

/** The signed-in user with their lab, from GET /api/me; also confirms the token is still accepted. */
export function useUser() {
  const session = useSession();
  return useQuery({ ...meQueryOptions(), enabled: session !== null });
}

export function signIn(input: SignInInput): Promise<LoginResponse> {
  return apiRequest('/auth/login', { method: 'POST', body: input, schema: loginResponseSchema });
}

export function useSignIn(options: { onSuccess?: (response: LoginResponse) => void } = {}) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: signIn,
    onSuccess: (response) => {
      // Nothing cached for a previous user may show to the next one.
      queryClient.clear();
      startSession(response);
      options.onSuccess?.(response);
    },
  });
}

export function useSignOut(options: { onSuccess?: () => void } = {}) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: async () => {
      try {
        await apiRequest('/auth/logout', { method: 'POST' });
      } catch {
        // The local session ends whatever the API answers: the user asked to leave.
      }
    },
    onSettled: () => {
      endSession('signed-out');
      queryClient.clear();
      options.onSuccess?.();
    },
  });
}
