import type { Role } from '@plumbline/contracts';

/** Who is calling: a signed-in person, or a lab's machine token pushing files. */
export type Principal =
  | { kind: 'user'; userId: string; role: Role; labId: string | null; jti: string; expiresAt: Date }
  | { kind: 'lab-token'; tokenId: string; role: 'analyst'; labId: string };

declare global {
  // eslint-disable-next-line @typescript-eslint/no-namespace
  namespace Express {
    interface User {
      principal: Principal;
    }
  }
}

export function actorOf(principal: Principal): { actorId: string | null; actorLabel: string | null } {
  return principal.kind === 'user'
    ? { actorId: principal.userId, actorLabel: null }
    : { actorId: null, actorLabel: `lab-token:${principal.tokenId}` };
}
