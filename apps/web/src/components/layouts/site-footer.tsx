/** On every page, signed in or not: what Plumbline's results are and are not. */
export function SiteFooter() {
  return (
    <footer className="border-t border-slate-200 bg-white">
      <div className="mx-auto flex max-w-6xl flex-col gap-2 px-6 py-5 text-xs leading-relaxed text-slate-600 md:flex-row md:gap-8">
        <p className="shrink-0 font-semibold text-plumb-800">Plumbline</p>
        <p className="max-w-4xl">
          <span className="font-semibold text-slate-800">Caution.</span> Results support, and do not replace,
          the laboratory director&rsquo;s judgement. Acceptance of QC runs, reference intervals and patient
          reporting remain the laboratory director&rsquo;s responsibility under local regulation and
          accreditation. Reference intervals must be reviewed before clinical use.
        </p>
      </div>
    </footer>
  );
}
