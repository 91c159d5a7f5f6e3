/** The caution every report carries (the product's standing cautions). */
export const REPORT_CAUTION =
  'These results inform, they do not decide: accepting QC runs, reference intervals and patient reporting remain the responsibility of the laboratory director under local regulation and accreditation. Reference intervals must be reviewed before clinical use.';

export function ReportCaution() {
  return (
    <aside
      aria-label="Caution"
      className="mt-6 rounded-md border-l-4 border-brass-400 bg-brass-100/50 px-4 py-3 text-sm leading-relaxed text-slate-800"
    >
      <p>
        <span className="font-semibold text-brass-700">Caution. </span>
        {REPORT_CAUTION}
      </p>
    </aside>
  );
}
