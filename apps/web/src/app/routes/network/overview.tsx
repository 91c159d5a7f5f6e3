// Home of the network coordinator: role, today's date, and the areas of the network's work.
import { ContentLayout } from '../../../components/layouts/content-layout.tsx';
import { FactList } from '../../../components/ui/fact-list.tsx';
import { LinkCard } from '../../../components/ui/link-card.tsx';
import { paths } from '../../../config/paths.ts';
import { useSession } from '../../../lib/auth.tsx';
import { roleLabels } from '../../../lib/authorization.ts';
import { formatLongDate, isoDate } from '../../../utils/format.ts';

const areas = [
  {
    to: paths.network.participation.getHref(),
    title: 'Participation',
    description: 'Which labs have submitted for the open cycle, which are late, and outlier labs.',
  },
  {
    to: paths.network.cycles.getHref(),
    title: 'Cycles',
    description: 'Create monthly periods, set submission deadlines, close and reopen them.',
  },
  {
    to: paths.network.peerGroups.getHref(),
    title: 'Peer groups',
    description: 'Group measurement procedures by control lot and level; merge, split, exclude.',
  },
  {
    to: paths.network.catalogue.getHref(),
    title: 'Catalogue',
    description: 'Analytes, methods, instrument models, reagents, control materials and lots.',
  },
  {
    to: paths.network.labs.getHref(),
    title: 'Labs',
    description: 'Enrol member labs, assign their codes and invite their first users.',
  },
  {
    to: paths.network.procedures.getHref(),
    title: 'Network procedures',
    description: 'Which labs run what on which instrument, and procedures that cannot be peered.',
  },
  {
    to: paths.network.auditLog.getHref(),
    title: 'Audit log',
    description: 'Every upload, exclusion and sign-off, with who did it and when.',
  },
];

export default function NetworkOverviewRoute() {
  const session = useSession();
  if (!session) return null;
  const today = new Date();

  return (
    <ContentLayout title="Network overview" area="Network" description={`Signed in as ${session.user.name}.`}>
      <div className="grid gap-6 lg:grid-cols-[18rem_1fr]">
        <FactList
          title="Your access"
          facts={[
            { label: 'Your role', value: roleLabels[session.user.role] },
            { label: 'Scope', value: 'All member labs of the network' },
            { label: 'Today', value: <time dateTime={isoDate(today)}>{formatLongDate(today)}</time> },
          ]}
        />
        <section aria-labelledby="network-areas">
          <h2 id="network-areas" className="text-xs font-semibold tracking-[0.12em] text-slate-500 uppercase">
            Where to go
          </h2>
          <div className="mt-3 grid gap-4 sm:grid-cols-2 xl:grid-cols-3">
            {areas.map((area) => (
              <LinkCard key={area.to} {...area} />
            ))}
          </div>
        </section>
      </div>
    </ContentLayout>
  );
}
