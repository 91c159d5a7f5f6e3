// Which role may open which area. The router's guards and the navigation read the same policies,
// so a link is shown exactly when its page may be opened. The API enforces the same rules (403).
import type { Role } from '@plumbline/contracts';
import { paths } from '../config/paths.ts';

export const accessPolicies = {
  /** A member lab's own pages. */
  lab: ['analyst', 'supervisor'],
  /** Managing a member lab: procedures, users, API tokens. */
  labManagement: ['supervisor'],
  /** The network coordinator's pages. */
  network: ['coordinator'],
} as const satisfies Record<string, readonly Role[]>;

export type AccessPolicy = keyof typeof accessPolicies;

export function canAccess(role: Role, policy: AccessPolicy): boolean {
  return (accessPolicies[policy] as readonly Role[]).includes(role);
}

export function homePathForRole(role: Role): string {
  return role === 'coordinator' ? paths.network.overview.getHref() : paths.lab.overview.getHref();
}

export const roleLabels: Record<Role, string> = {
  analyst: 'Analyst',
  supervisor: 'Supervisor',
  coordinator: 'Network coordinator',
};
