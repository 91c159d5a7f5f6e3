// Who is signed in (user + expiry), kept in localStorage so a reload shows the right home at once.
// The credential itself is an httpOnly cookie set by the API, which page scripts can never read; this
// store holds no secret. A tiny external store: React reads it through useSyncExternalStore (see
// auth.tsx); the API client clears it on a 401. No React here, so both can import it.
import { loginResponseSchema, type LoginResponse } from '@plumbline/contracts';

export type Session = LoginResponse;

/** Why the last session ended; the sign-in page explains an expiry to the user. */
export type SessionEndReason = 'signed-out' | 'expired';

export type SessionState = {
  session: Session | null;
  endReason: SessionEndReason | null;
};

const storageKey = 'plumbline.session';

function isExpired(session: Session, now: Date = new Date()): boolean {
  if (!session.expiresAt) return false;
  const expiresAt = Date.parse(session.expiresAt);
  return Number.isFinite(expiresAt) && expiresAt <= now.getTime();
}

function readStoredSession(): Session | null {
  try {
    const raw = globalThis.localStorage?.getItem(storageKey);
    if (!raw) return null;
    const parsed = loginResponseSchema.safeParse(JSON.parse(raw));
    // A stored value of an older shape is dropped rather than trusted.
    if (!parsed.success || isExpired(parsed.data)) return null;
    return parsed.data;
  } catch {
    return null;
  }
}

function writeStoredSession(session: Session | null): void {
  try {
    if (session) globalThis.localStorage?.setItem(storageKey, JSON.stringify(session));
    else globalThis.localStorage?.removeItem(storageKey);
  } catch {
    // Storage can be unavailable (private mode, quota); the session then lasts for this page only.
  }
}

let state: SessionState = { session: readStoredSession(), endReason: null };
const listeners = new Set<() => void>();

function setState(next: SessionState): void {
  state = next;
  for (const listener of listeners) listener();
}

export function subscribeToSession(listener: () => void): () => void {
  listeners.add(listener);
  return () => listeners.delete(listener);
}

export function getSessionState(): SessionState {
  return state;
}

/** The current session, or null when signed out or when the token has passed its expiry time. */
export function getSession(): Session | null {
  if (state.session && isExpired(state.session)) {
    endSession('expired');
    return null;
  }
  return state.session;
}

export function startSession(session: Session): void {
  writeStoredSession(session);
  setState({ session, endReason: null });
}

export function endSession(reason: SessionEndReason): void {
  if (!state.session && state.endReason === reason) return;
  writeStoredSession(null);
  setState({ session: null, endReason: reason });
}

// Another tab signed in or out: follow it.
if (typeof window !== 'undefined') {
  window.addEventListener('storage', (event) => {
    if (event.key !== storageKey) return;
    const session = readStoredSession();
    setState({ session, endReason: session ? null : 'signed-out' });
  });
}
