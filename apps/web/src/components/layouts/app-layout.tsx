// The signed-in frame: header (who and which lab), navigation for the user's role, main, footer.
import { useEffect, useRef, type ReactNode } from 'react';
import { Link, NavLink, useLocation, useNavigate } from 'react-router-dom';
import type { Role } from '@plumbline/contracts';
import { paths } from '../../config/paths.ts';
import { useSession, useSignOut, useUser } from '../../lib/auth.tsx';
import { roleLabels } from '../../lib/authorization.ts';
import { Button } from '../ui/button.tsx';
import { Logo } from '../ui/logo.tsx';
import { navigationFor } from './navigation.ts';
import { SiteFooter } from './site-footer.tsx';
import { SkipLink, mainContentId } from './skip-link.tsx';

function LabBadge() {
  const session = useSession();
  const user = useUser();
  if (session?.user.role === 'coordinator') {
    return <span className="text-sm text-plumb-100">Network coordination</span>;
  }
  const lab = user.data?.lab;
  if (!lab) return <span className="h-4 w-32 animate-pulse rounded bg-plumb-800" aria-hidden="true" />;
  return (
    <span className="flex items-center gap-2 text-sm text-plumb-50">
      <span className="rounded bg-plumb-800 px-1.5 py-0.5 text-xs font-semibold tracking-wide text-brass-200">
        {lab.code}
      </span>
      <span className="max-w-[16rem] truncate">{lab.name}</span>
    </span>
  );
}

function UserMenu() {
  const session = useSession();
  const navigate = useNavigate();
  const signOut = useSignOut({ onSuccess: () => navigate(paths.auth.signIn.getHref(), { replace: true }) });
  if (!session) return null;
  return (
    <div className="flex items-center gap-4">
      <div className="hidden text-right leading-tight sm:block">
        <p className="text-sm font-medium text-white">{session.user.name}</p>
        <p className="text-xs text-plumb-200">{roleLabels[session.user.role]}</p>
      </div>
      <Button variant="inverse" size="sm" isLoading={signOut.isPending} onClick={() => signOut.mutate()}>
        Sign out
      </Button>
    </div>
  );
}

function MainNavigation({ role }: { role: Role }) {
  const sections = navigationFor(role);
  const scroller = useRef<HTMLDivElement>(null);
  const { pathname } = useLocation();

  // On narrow screens the navigation scrolls sideways: bring the current page into view.
  useEffect(() => {
    const container = scroller.current;
    const current = container?.querySelector<HTMLElement>('[aria-current="page"]');
    if (!container || !current || container.scrollWidth <= container.clientWidth) return;
    container.scrollLeft +=
      current.getBoundingClientRect().left - container.getBoundingClientRect().left - 16;
  }, [pathname]);

  return (
    <nav
      aria-label="Main"
      className="border-b border-slate-200 bg-white md:w-60 md:shrink-0 md:border-r md:border-b-0"
    >
      <div
        ref={scroller}
        className="flex gap-1 overflow-x-auto px-4 py-2 md:sticky md:top-0 md:flex-col md:gap-6 md:px-4 md:py-6"
      >
        {sections.map((section) => (
          <div key={section.title} className="shrink-0">
            <p className="hidden px-3 pb-2 text-[0.7rem] font-semibold tracking-[0.14em] text-slate-500 uppercase md:block">
              {section.title}
            </p>
            {/* The list hangs from a thin vertical line; the current page carries the weight. */}
            <ul className="relative flex gap-1 md:flex-col md:gap-0.5 md:before:absolute md:before:top-1 md:before:bottom-1 md:before:left-3 md:before:w-px md:before:bg-plumb-200">
              {section.items.map((item) => (
                <li key={item.to}>
                  <NavLink
                    to={item.to}
                    end={item.end}
                    className={({ isActive }) =>
                      `group relative flex items-center rounded-md px-3 py-1.5 text-sm whitespace-nowrap md:pl-7 ${
                        isActive
                          ? 'bg-plumb-50 font-medium text-plumb-900'
                          : 'text-slate-700 hover:bg-slate-50 hover:text-plumb-900'
                      }`
                    }
                  >
                    {({ isActive }) => (
                      <>
                        <span
                          aria-hidden="true"
                          className={`absolute top-1/2 left-[9px] hidden size-[7px] -translate-y-1/2 rotate-45 md:block ${
                            isActive ? 'bg-brass-500' : 'bg-transparent group-hover:bg-plumb-300'
                          }`}
                        />
                        {item.label}
                      </>
                    )}
                  </NavLink>
                </li>
              ))}
            </ul>
          </div>
        ))}
      </div>
    </nav>
  );
}

export function AppLayout({ children }: { children: ReactNode }) {
  const session = useSession();
  if (!session) return null;
  return (
    <div className="flex min-h-dvh flex-col">
      <SkipLink />
      <header className="bg-plumb-950 text-white">
        <div className="flex h-14 items-center gap-6 px-4 md:px-6">
          <Link to={paths.home.getHref()} className="rounded-sm" aria-label="Plumbline, home">
            <Logo tone="dark" />
          </Link>
          <div className="hidden h-6 w-px bg-plumb-700 md:block" aria-hidden="true" />
          <div className="hidden min-w-0 md:block">
            <LabBadge />
          </div>
          <div className="ml-auto">
            <UserMenu />
          </div>
        </div>
      </header>
      <div className="flex flex-1 flex-col md:flex-row">
        <MainNavigation role={session.user.role} />
        <main id={mainContentId} tabIndex={-1} className="min-w-0 flex-1 focus:outline-none">
          {children}
        </main>
      </div>
      <SiteFooter />
    </div>
  );
}
