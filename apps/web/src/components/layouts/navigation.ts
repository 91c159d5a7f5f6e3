// The main navigation, grouped in sections. Each item names the access policy of the page it opens,
// so it is shown exactly to the roles the router lets in.
import type { Role } from '@plumbline/contracts';
import { paths } from '../../config/paths.ts';
import { canAccess, type AccessPolicy } from '../../lib/authorization.ts';

export type NavigationItem = {
  label: string;
  to: string;
  policy: AccessPolicy;
  /** Match the path exactly (area home pages), not every page below it. */
  end?: boolean;
};

export type NavigationSection = {
  title: string;
  items: NavigationItem[];
};

export const navigationSections: NavigationSection[] = [
  {
    title: 'My lab',
    items: [
      { label: 'Overview', to: paths.lab.overview.getHref(), policy: 'lab', end: true },
      { label: 'Uploads', to: paths.lab.uploads.getHref(), policy: 'lab' },
      { label: 'Peer report', to: paths.lab.peerReport.getHref(), policy: 'lab' },
      { label: 'QC plan', to: paths.lab.qcPlan.getHref(), policy: 'lab' },
    ],
  },
  {
    title: 'Reference intervals',
    items: [
      { label: 'Studies', to: paths.lab.riStudies.getHref(), policy: 'lab', end: true },
      { label: 'Current intervals', to: paths.lab.riCurrent.getHref(), policy: 'lab' },
      { label: 'Verifications', to: paths.lab.riVerifications.getHref(), policy: 'lab' },
    ],
  },
  {
    title: 'Lab management',
    items: [
      { label: 'Procedures', to: paths.lab.procedures.getHref(), policy: 'labManagement' },
      { label: 'Lab administration', to: paths.lab.administration.getHref(), policy: 'labManagement' },
    ],
  },
  {
    title: 'Network',
    items: [
      { label: 'Network overview', to: paths.network.overview.getHref(), policy: 'network', end: true },
      { label: 'Participation', to: paths.network.participation.getHref(), policy: 'network' },
      { label: 'Cycles', to: paths.network.cycles.getHref(), policy: 'network' },
    ],
  },
  {
    title: 'Set-up',
    items: [
      { label: 'Catalogue', to: paths.network.catalogue.getHref(), policy: 'network' },
      { label: 'Labs', to: paths.network.labs.getHref(), policy: 'network' },
      { label: 'Network procedures', to: paths.network.procedures.getHref(), policy: 'network' },
      { label: 'Peer groups', to: paths.network.peerGroups.getHref(), policy: 'network' },
      { label: 'Lot comparisons', to: paths.network.lotComparisons.getHref(), policy: 'network' },
    ],
  },
  {
    title: 'Oversight',
    items: [{ label: 'Audit log', to: paths.network.auditLog.getHref(), policy: 'network' }],
  },
];

/** The sections and items a role may see; sections left empty are dropped. */
export function navigationFor(role: Role): NavigationSection[] {
  return navigationSections
    .map((section) => ({ ...section, items: section.items.filter((item) => canAccess(role, item.policy)) }))
    .filter((section) => section.items.length > 0);
}
