// The audit log. Filters live in the address (?lab=&actor=&kind=&from=&to=&offset=) so a filtered view
// can be reloaded or shared; the labs and people to choose from come from the network-labs feature.
import { useSearchParams } from 'react-router-dom';
import { useQuery } from '@tanstack/react-query';
import { ContentLayout } from '../../../components/layouts/content-layout.tsx';
import type { AuditFilters } from '../../../features/audit-log/api/audit-keys.ts';
import { AuditLog, type AuditOption } from '../../../features/audit-log/components/audit-log.tsx';
import { networkLabsKeys } from '../../../features/network-labs/api/network-labs-keys.ts';
import { useSession } from '../../../lib/auth.tsx';

const param = (value: string | null) => value || undefined;

export default function AuditLogRoute() {
  const session = useSession();
  const [searchParams, setSearchParams] = useSearchParams();
  const filters: AuditFilters = {
    labId: param(searchParams.get('lab')),
    actorId: param(searchParams.get('actor')),
    kind: param(searchParams.get('kind')),
    from: param(searchParams.get('from')),
    to: param(searchParams.get('to')),
  };
  const offset = Math.max(0, Number(searchParams.get('offset')) || 0);

  const labs = useQuery(networkLabsKeys.labs());
  const labUsers = useQuery({
    ...networkLabsKeys.users(filters.labId ?? ''),
    enabled: Boolean(filters.labId),
  });

  const labOptions: AuditOption[] = (labs.data ?? []).map((lab) => ({
    id: lab.id,
    label: `${lab.code} · ${lab.name}`,
  }));
  const actorOptions: AuditOption[] = [];
  if (session) actorOptions.push({ id: session.user.id, label: `You (${session.user.name})` });
  if (filters.labId) {
    for (const user of labUsers.data ?? [])
      actorOptions.push({ id: user.id, label: `${user.name} (${user.email})` });
  }

  const onChange = (next: AuditFilters, nextOffset: number) => {
    const params = new URLSearchParams();
    const entries: [string, string | undefined][] = [
      ['lab', next.labId],
      ['actor', next.actorId],
      ['kind', next.kind],
      ['from', next.from],
      ['to', next.to],
      ['offset', nextOffset > 0 ? String(nextOffset) : undefined],
    ];
    for (const [key, value] of entries) if (value) params.set(key, value);
    setSearchParams(params, { replace: true });
  };

  return (
    <ContentLayout
      title="Audit log"
      area="Network oversight"
      width="wide"
      description="A record of what was done, by whom and when: uploads, changes to the catalogue, labs, users and periods, sign-ins."
    >
      <AuditLog
        filters={filters}
        offset={offset}
        onChange={onChange}
        labs={labOptions}
        actors={actorOptions}
      />
    </ContentLayout>
  );
}
