import { isRouteErrorResponse, useRouteError } from 'react-router-dom';
import { SiteFooter } from '../layouts/site-footer.tsx';
import { SkipLink, mainContentId } from '../layouts/skip-link.tsx';
import { Button } from '../ui/button.tsx';
import { Head } from '../ui/head.tsx';
import { Logo } from '../ui/logo.tsx';

/** Last resort when a page fails to load or render: say so plainly and offer a reload. */
export function RouteErrorPage() {
  const error = useRouteError();
  const detail = isRouteErrorResponse(error)
    ? `${error.status} ${error.statusText}`
    : error instanceof Error
      ? error.message
      : undefined;

  return (
    <div className="flex min-h-dvh flex-col">
      <Head title="Something went wrong" />
      <SkipLink />
      <header className="bg-plumb-950 px-6 py-3">
        <Logo tone="dark" />
      </header>
      <main
        id={mainContentId}
        tabIndex={-1}
        className="mx-auto w-full max-w-2xl flex-1 px-6 py-16 focus:outline-none"
      >
        <h1 className="text-2xl font-semibold text-plumb-950">Something went wrong</h1>
        <p className="mt-3 text-slate-700">
          This page could not be shown. Reloading usually helps; if it keeps happening, tell the network
          coordinator what you were doing.
        </p>
        {detail ? (
          <p className="mt-3 rounded-md bg-slate-100 px-3 py-2 font-mono text-xs text-slate-700">{detail}</p>
        ) : null}
        <Button className="mt-6" onClick={() => window.location.reload()}>
          Reload the page
        </Button>
      </main>
      <SiteFooter />
    </div>
  );
}
