// Every route path of the web app is built here, so links, redirects and the router never retype a URL.
// `path` is the router pattern; `getHref` builds a concrete link.

/** Only same-app paths may be used as a return address after sign-in (no `//host` or `https://`). */
export function isSafeReturnPath(value: string | null | undefined): value is string {
  return (
    typeof value === 'string' && value.startsWith('/') && !value.startsWith('//') && !value.startsWith('/\\')
  );
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
    peerReport: { path: '/lab/peer-report', getHref: () => '/lab/peer-report' },
    procedures: { path: '/lab/procedures', getHref: () => '/lab/procedures' },
    administration: { path: '/lab/administration', getHref: () => '/lab/administration' },
  },

  // Network area: the coordinator.
  network: {
    overview: { path: '/network', getHref: () => '/network' },
    catalogue: {
      path: '/network/catalogue',
      /** `list` is one of the catalogue lists, e.g. 'control-lots'. */
      getHref: (list?: string) => (list ? `/network/catalogue?list=${encodeURIComponent(list)}` : '/network/catalogue'),
    },
    labs: {
      path: '/network/labs',
      /** `labId` opens that lab's users. */
      getHref: (labId?: string) => (labId ? `/network/labs?lab=${encodeURIComponent(labId)}` : '/network/labs'),
    },
    procedures: { path: '/network/procedures', getHref: () => '/network/procedures' },
    peerGroups: { path: '/network/peer-groups', getHref: () => '/network/peer-groups' },
    cycles: { path: '/network/cycles', getHref: () => '/network/cycles' },
    participation: {
      path: '/network/participation',
      getHref: (period?: string) =>
        period ? `/network/participation?period=${encodeURIComponent(period)}` : '/network/participation',
    },
    auditLog: { path: '/network/audit-log', getHref: () => '/network/audit-log' },
  },
} as const;
