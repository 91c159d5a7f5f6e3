import { classifyCvr, classifySdi } from '@plumbline/stats';
import type { ReportFlag } from '@plumbline/contracts';

/** What each SDI band means for the lab (thresholds: @plumbline/stats, docs/methods.md §3, common practice). */
const sdiMeaning: Record<ReportFlag['severity'], string> = {
  fine: 'within 1 SD of the peer mean',
  acceptable: 'within 2 SD of the peer mean',
  warning: 'between 2 and 3 SD from the peer mean: review calibration and possible bias',
  action: 'more than 3 SD from the peer mean: investigate the bias',
};

const cvrMeaning: Record<ReportFlag['severity'], string> = {
  fine: 'imprecision no greater than the peers’',
  acceptable: 'imprecision up to 1.5 times the peers’',
  warning: 'imprecision 1.5 to 2 times the peers’: review the method’s precision',
  action: 'imprecision more than twice the peers’: investigate the method’s precision',
};

export function sdiFlag(sdi: number): ReportFlag {
  const severity = classifySdi(sdi);
  return { kind: 'sdi', severity, message: `SDI ${sdi.toFixed(2)}: ${sdiMeaning[severity]}.` };
}

export function cvrFlag(cvr: number): ReportFlag {
  const severity = classifyCvr(cvr);
  return { kind: 'cvr', severity, message: `CVR ${cvr.toFixed(2)}: ${cvrMeaning[severity]}.` };
}

export function exclusionFlag(excluded: { reason: 'outlier' | 'manual'; note: string | null }): ReportFlag {
  if (excluded.reason === 'outlier') {
    return {
      kind: 'exclusion',
      severity: 'action',
      message:
        'Your mean lies outside the robust range of the peer group (x* ± 3s*, ISO 13528 Algorithm A), ' +
        'so your data was left out of the peer figures.',
    };
  }
  return {
    kind: 'exclusion',
    severity: 'warning',
    message: `The network coordinator left your data out of the peer figures${excluded.note ? `: ${excluded.note}` : '.'}`,
  };
}

export const tierDescription = {
  instrument: 'the same instrument model, method and reagent',
  method: 'the same method',
  analyte: 'every procedure for the analyte',
} as const;

export type TierCandidate = { tier: keyof typeof tierDescription; labs: number | null; sufficient: boolean };

/**
 * Says which peer group a row is compared with and why narrower ones were passed over.
 * `candidates` are narrowest first; `labs` null means no figures exist for that tier.
 */
export function peerNote(candidates: readonly TierCandidate[], minLabs: number): string {
  const chosen = candidates.find((c) => c.sufficient);
  const skipped = chosen ? candidates.slice(0, candidates.indexOf(chosen)) : candidates;
  const countOf = (c: TierCandidate) =>
    c.labs === null ? 'no labs' : c.labs === 1 ? '1 lab' : `${c.labs} labs`;
  const skippedText = skipped.map((c) => `${countOf(c)} with ${tierDescription[c.tier]}`).join(', ');
  if (!chosen) {
    if (candidates.every((c) => c.labs === null))
      return 'No peer figures exist yet for this control lot and level.';
    return `Too few labs for a peer comparison (${skippedText}; ${minLabs} needed).`;
  }
  const chosenText = `Compared with ${chosen.labs} labs using ${tierDescription[chosen.tier]}.`;
  if (skipped.length === 0) return chosenText;
  return `Too few labs for a narrower comparison (${skippedText}; ${minLabs} needed). ${chosenText}`;
}
