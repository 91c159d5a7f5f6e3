// Every route path of the web app is built here, so links, redirects and the router never retype a URL.
// `path` is the router pattern; `getHref` builds a concrete link.

/** Only same-app paths may be used as a return address after sign-in (no `//host` or `https://`). */
export function isSafeReturnPath(value: string | null | undefined): value is string {
  return (
    typeof value === 'string' && value.startsWith('/') && !value.startsWith('//') && !value.startsWith('/\\')
  );
}

/** Adds the given query parameters (those with a value) to a path. */
function withSearch(path: string, search: Record<string, string | undefined> | undefined): string {
  if (!search) return path;
  const params = new URLSearchParams();
  for (const [key, value] of Object.entries(search)) if (value) params.set(key, value);
  const text = params.toString();
  return text ? `${path}?${text}` : path;
}

export const paths = {
  home: {
    path: '/',
    getHref: () => '/',
  },

  auth: {
    signIn: {
      path: '/sign-in',
      getHref: (redirectTo?: string | null) =>
        isSafeReturnPath(redirectTo) && redirectTo !== '/'
          ? `/sign-in?redirectTo=${encodeURIComponent(redirectTo)}`
          : '/sign-in',
    },
    /** Public: an invited user sets their password (the link the coordinator or a supervisor passes on). */
    acceptInvitation: {
      path: '/invitations/:token',
      getHref: (token: string) => `/invitations/${encodeURIComponent(token)}`,
    },
  },

  // Member-lab area: analysts and supervisors of one lab.
  lab: {
    overview: { path: '/lab', getHref: () => '/lab' },
    uploads: { path: '/lab/uploads', getHref: () => '/lab/uploads' },
    peerReport: {
      path: '/lab/peer-report',
      /** `search` keeps the period, units and filters when coming back from a row's details. */
      getHref: (search?: Record<string, string | undefined>) => withSearch('/lab/peer-report', search),
    },
    /** One report row's details: trend, peer distribution, two-level plot, control chart, comments. */
    reportRow: {
      path: '/lab/peer-report/:procedureId/:controlLotId/:level',
      getHref: (
        row: { procedureId: string; controlLotId: string; level: number | string },
        search?: Record<string, string | undefined>,
      ) =>
        withSearch(
          `/lab/peer-report/${encodeURIComponent(row.procedureId)}/${encodeURIComponent(row.controlLotId)}/${encodeURIComponent(String(row.level))}`,
          search,
        ),
    },
    procedures: { path: '/lab/procedures', getHref: () => '/lab/procedures' },
    /** Sigma, plan in use and recommended QC plan of every procedure and level. */
    qcPlan: { path: '/lab/qc-plan', getHref: () => '/lab/qc-plan' },
    administration: { path: '/lab/administration', getHref: () => '/lab/administration' },
    riStudies: { path: '/lab/reference-intervals', getHref: () => '/lab/reference-intervals' },
    riNewStudy: { path: '/lab/reference-intervals/new', getHref: () => '/lab/reference-intervals/new' },
    riStudy: {
      path: '/lab/reference-intervals/studies/:studyId',
      getHref: (studyId: string) => `/lab/reference-intervals/studies/${encodeURIComponent(studyId)}`,
    },
    riCurrent: {
      path: '/lab/reference-intervals/current',
      getHref: () => '/lab/reference-intervals/current',
    },
    riVerifications: {
      path: '/lab/reference-intervals/verifications',
      getHref: () => '/lab/reference-intervals/verifications',
    },
  },

  // Network area: the coordinator.
  network: {
    overview: { path: '/network', getHref: () => '/network' },
    catalogue: {
      path: '/network/catalogue',
      /** `list` is one of the catalogue lists, e.g. 'control-lots'. */
      getHref: (list?: string) =>
        list ? `/network/catalogue?list=${encodeURIComponent(list)}` : '/network/catalogue',
    },
    labs: {
      path: '/network/labs',
      /** `labId` opens that lab's users. */
      getHref: (labId?: string) =>
        labId ? `/network/labs?lab=${encodeURIComponent(labId)}` : '/network/labs',
    },
    procedures: { path: '/network/procedures', getHref: () => '/network/procedures' },
    peerGroups: { path: '/network/peer-groups', getHref: () => '/network/peer-groups' },
    lotComparisons: { path: '/network/lot-comparisons', getHref: () => '/network/lot-comparisons' },
    cycles: { path: '/network/cycles', getHref: () => '/network/cycles' },
    participation: {
      path: '/network/participation',
      getHref: (period?: string) =>
        period ? `/network/participation?period=${encodeURIComponent(period)}` : '/network/participation',
    },
    auditLog: { path: '/network/audit-log', getHref: () => '/network/audit-log' },
  },
} as const;
