// Home of analysts and supervisors: who they are, which lab, today's date, and where to go next.
import { ContentLayout } from '../../../components/layouts/content-layout.tsx';
import { FactList } from '../../../components/ui/fact-list.tsx';
import { LinkCard } from '../../../components/ui/link-card.tsx';
import { paths } from '../../../config/paths.ts';
import { useSession, useUser } from '../../../lib/auth.tsx';
import { canAccess, roleLabels } from '../../../lib/authorization.ts';
import { formatLongDate, isoDate } from '../../../utils/format.ts';

export default function LabOverviewRoute() {
  const session = useSession();
  const user = useUser();
  if (!session) return null;

  const role = session.user.role;
  const lab = user.data?.lab;
  const today = new Date();
  const labValue = user.isPending ? 'Loading…' : lab ? lab.name : 'No lab assigned';

  return (
    <ContentLayout
      title="Overview"
      area={lab ? `Lab ${lab.code}` : 'My lab'}
      description={`Signed in as ${session.user.name}.`}
    >
      <div className="grid gap-6 lg:grid-cols-[18rem_1fr]">
        <FactList
          title="Your lab"
          facts={[
            { label: 'Lab', value: labValue },
            { label: 'Lab code', value: lab ? <data value={lab.code}>{lab.code}</data> : '—' },
            { label: 'Your role', value: roleLabels[role] },
            { label: 'Today', value: <time dateTime={isoDate(today)}>{formatLongDate(today)}</time> },
          ]}
        />
        <section aria-labelledby="lab-next-steps">
          <h2
            id="lab-next-steps"
            className="text-xs font-semibold tracking-[0.12em] text-slate-500 uppercase"
          >
            Where to go
          </h2>
          <div className="mt-3 grid gap-4 sm:grid-cols-2">
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
            {canAccess(role, 'labManagement') ? (
              <>
                <LinkCard
                  to={paths.lab.procedures.getHref()}
                  title="Procedures"
                  description="Keep your lab's measurement procedures and their short codes up to date."
                />
                <LinkCard
                  to={paths.lab.administration.getHref()}
                  title="Lab administration"
                  description="Manage your lab's users, API tokens and the monthly sign-off."
                />
              </>
            ) : null}
          </div>
        </section>
      </div>
    </ContentLayout>
  );
}
