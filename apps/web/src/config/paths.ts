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
    catalogue: { path: '/network/catalogue', getHref: () => '/network/catalogue' },
    labs: { path: '/network/labs', getHref: () => '/network/labs' },
    peerGroups: { path: '/network/peer-groups', getHref: () => '/network/peer-groups' },
    cycles: { path: '/network/cycles', getHref: () => '/network/cycles' },
    participation: { path: '/network/participation', getHref: () => '/network/participation' },
    auditLog: { path: '/network/audit-log', getHref: () => '/network/audit-log' },
  },
} as const;
