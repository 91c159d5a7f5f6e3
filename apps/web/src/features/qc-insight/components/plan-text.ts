/** A QC plan in words, e.g. "1-3s/2-2s/R-4s, 2 controls per run (Ped 0.93, Pfr 0.010)". */
export function describePlan(plan: {
  rules: string[];
  n: number;
  runs: number;
  ped?: number | null;
  pfr?: number;
}) {
  const runs = plan.runs > 1 ? ` over ${plan.runs} runs` : '';
  const power =
    plan.pfr === undefined
      ? ''
      : ` (Ped ${plan.ped === null || plan.ped === undefined ? '—' : plan.ped.toFixed(2)}, Pfr ${plan.pfr.toFixed(3)})`;
  return `${plan.rules.join('/')}, ${plan.n} control${plan.n === 1 ? '' : 's'} per run${runs}${power}`;
}
