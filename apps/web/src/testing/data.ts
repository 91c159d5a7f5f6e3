// Invented test users and labs. Ids are fixed UUIDs so a failing test prints readable values.
import type { MeResponse, Role } from '@plumbline/contracts';
import type { Session } from '../lib/session.ts';

const labs = {
  kestrel: { id: '6d1f4f0e-3a51-4c47-9a3e-2b8f0d7c1a11', code: 'L07', name: 'Kestrel Vale Demo Laboratory' },
} as const;

const usersByRole: Record<
  Role,
  { id: string; name: string; email: string; lab: typeof labs.kestrel | null }
> = {
  analyst: {
    id: '0b5a2c1e-8f7d-4e6b-a1c3-5d9e7f2a4b01',
    name: 'Demo Analyst',
    email: 'analyst@kestrel-vale.example',
    lab: labs.kestrel,
  },
  supervisor: {
    id: '0b5a2c1e-8f7d-4e6b-a1c3-5d9e7f2a4b02',
    name: 'Demo Supervisor',
    email: 'supervisor@kestrel-vale.example',
    lab: labs.kestrel,
  },
  coordinator: {
    id: '0b5a2c1e-8f7d-4e6b-a1c3-5d9e7f2a4b03',
    name: 'Demo Coordinator',
    email: 'coordinator@network.example',
    lab: null,
  },
};

export function buildSession(role: Role): Session {
  const user = usersByRole[role];
  return {
    expiresAt: new Date(Date.now() + 60 * 60 * 1000).toISOString(),
    user: { id: user.id, email: user.email, name: user.name, role, labId: user.lab?.id ?? null },
  };
}

export function buildMe(role: Role): MeResponse {
  const user = usersByRole[role];
  return { ...buildSession(role).user, lab: user.lab ? { ...user.lab } : null };
}
