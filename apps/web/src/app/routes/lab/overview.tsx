// Home of analysts and supervisors: the period being submitted, the latest flags, what needs attention
// next and the latest uploads; then where to go.
import { ContentLayout } from '../../../components/layouts/content-layout.tsx';
import { EmptyState } from '../../../components/ui/empty-state.tsx';
import { FactList } from '../../../components/ui/fact-list.tsx';
import { LinkCard } from '../../../components/ui/link-card.tsx';
import { paths } from '../../../config/paths.ts';
import { LabOverviewDashboard } from '../../../features/lab-overview/components/lab-overview-dashboard.tsx';
import { useSession, useUser } from '../../../lib/auth.tsx';
import { canAccess, roleLabels } from '../../../lib/authorization.ts';
import { formatLongDate, isoDate } from '../../../utils/format.ts';

export default function LabOverviewRoute() {
  const session = useSession();
  const user = useUser();
  if (!session) return null;

  const role = session.user.role;
  const lab = user.data?.lab;
  const manages = canAccess(role, 'labManagement');
  const today = new Date();

  return (
    <ContentLayout
      title="Overview"
      area={lab ? `Lab ${lab.code}` : 'My lab'}
      description={`Signed in as ${session.user.name}.`}
    >
      <div className="grid gap-6 lg:grid-cols-[17rem_minmax(0,1fr)]">
        <FactList
          title="Your lab"
          facts={[
            { label: 'Lab', value: user.isPending ? 'Loading…' : lab ? lab.name : 'No lab assigned' },
            { label: 'Lab code', value: lab ? <data value={lab.code}>{lab.code}</data> : '—' },
            { label: 'Your role', value: roleLabels[role] },
            { label: 'Today', value: <time dateTime={isoDate(today)}>{formatLongDate(today)}</time> },
          ]}
        />
        {session.user.labId ? (
          <LabOverviewDashboard
            labId={session.user.labId}
            links={{
              uploads: paths.lab.uploads.getHref(),
              report: (search) => paths.lab.peerReport.getHref(search),
              procedures: manages ? paths.lab.procedures.getHref() : null,
            }}
          />
        ) : (
          <EmptyState
            title="Your account belongs to no lab"
            description="Ask your network coordinator to add your account to your lab."
          />
        )}
      </div>
      <section aria-labelledby="lab-next-steps" className="mt-10">
        <h2 id="lab-next-steps" className="text-xs font-semibold tracking-[0.12em] text-slate-500 uppercase">
          Where to go
        </h2>
        <div className="mt-3 grid gap-4 sm:grid-cols-2 lg:grid-cols-4">
          <LinkCard
            to={paths.lab.uploads.getHref()}
            title="Uploads"
            description="Submit this month's control data and follow each file through validation."
          />
          <LinkCard
            to={paths.lab.peerReport.getHref()}
            title="Peer report"
            description="See where your lab stands against its peer groups: SDI, CVR, bias and flags."
          />
          {manages ? (
            <>
              <LinkCard
                to={paths.lab.procedures.getHref()}
                title="Procedures"
                description="Keep your lab's measurement procedures and their short codes up to date."
              />
              <LinkCard
                to={paths.lab.administration.getHref()}
                title="Lab administration"
                description="Manage your lab's users and the API tokens of its middleware."
              />
            </>
          ) : null}
        </div>
      </section>
    </ContentLayout>
  );
}
