// The signed-out frame: a brand panel with the plumb line beside the form, and the footer caution.
import type { ReactNode } from 'react';
import { Head } from '../ui/head.tsx';
import { Logo, PlumbMark } from '../ui/logo.tsx';
import { SiteFooter } from './site-footer.tsx';
import { SkipLink, mainContentId } from './skip-link.tsx';

export function AuthLayout({ title, children }: { title: string; children: ReactNode }) {
  return (
    <div className="flex min-h-dvh flex-col">
      <Head title={title} />
      <SkipLink />
      <div className="flex flex-1 flex-col lg:flex-row">
        <header className="relative overflow-hidden bg-plumb-950 px-8 py-6 text-white lg:flex lg:w-[44%] lg:flex-col lg:px-14 lg:py-12">
          <Logo tone="dark" />
          {/* The motif: one long line from the top edge, ending in the brass weight. */}
          <div
            aria-hidden="true"
            className="pointer-events-none absolute top-0 right-16 hidden h-[58%] flex-col items-center lg:flex"
          >
            <div className="w-px flex-1 bg-gradient-to-b from-plumb-800 to-plumb-300" />
            <PlumbMark className="-mt-[45px] h-20 w-[60px]" lineClassName="text-transparent" />
          </div>
          <div className="mt-auto hidden max-w-md lg:block">
            <p className="text-3xl leading-tight font-semibold text-white">
              Where each lab stands against its peers, month by month.
            </p>
            <p className="mt-4 text-[0.95rem] leading-relaxed text-plumb-100">
              Member laboratories submit their quality-control data; the network pools it by peer group and
              returns peer mean and SD, SDI, CVR, bias and sigma for every measurement procedure and level.
            </p>
            <dl className="mt-10 grid grid-cols-3 gap-6 border-t border-plumb-800 pt-6 text-sm">
              <div>
                <dt className="text-plumb-300">Submit</dt>
                <dd className="mt-1 text-plumb-50">Monthly control data</dd>
              </div>
              <div>
                <dt className="text-plumb-300">Compare</dt>
                <dd className="mt-1 text-plumb-50">Bias against peers</dd>
              </div>
              <div>
                <dt className="text-plumb-300">Review</dt>
                <dd className="mt-1 text-plumb-50">Flags and sign-off</dd>
              </div>
            </dl>
          </div>
        </header>
        <main
          id={mainContentId}
          tabIndex={-1}
          className="flex flex-1 items-center justify-center px-6 py-12 focus:outline-none"
        >
          <div className="w-full max-w-[26rem]">{children}</div>
        </main>
      </div>
      <SiteFooter />
    </div>
  );
}
