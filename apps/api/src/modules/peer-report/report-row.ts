// One row of the peer report: the comparison of a lab's figures with its peers', and what the row says
// when that comparison cannot be computed. A row never throws: whatever goes wrong in it is shown as
// "cannot be computed" with the reason, and the other rows of the report are unaffected.
import { standing, type Standing } from '@plumbline/stats';
import type { LabFigures, NotComputable, PeerFigures, PeerReportRow } from '@plumbline/contracts';

/** A lab's own figures before they are shown (always in the canonical unit). */
export type Figures = { n: number; mean: number; sd: number; cv: number | null };

export function figuresOf(s: { n: number; mean: number; sd: number }): Figures {
  const cv = Number.isFinite(s.mean) && s.mean !== 0 ? (100 * s.sd) / Math.abs(s.mean) : null;
  return { n: s.n, mean: s.mean, sd: s.sd, cv };
}

/** SDI, CVR and bias %, or why they cannot be computed from these figures. */
export type Comparison = { standing: Standing; problem: null } | { standing: null; problem: string };

const problem = (reason: string): Comparison => ({ standing: null, problem: reason });

const describe = (x: number) => (Number.isNaN(x) ? 'not a number' : `not a finite number (${x})`);

/**
 * Where the lab stands against the peer figures. Each figure that makes SDI, CVR or bias undefined is
 * named in the reason (a peer SD of 0 divides by zero, for example).
 */
export function compare(lab: Figures, peer: PeerFigures): Comparison {
  if (!Number.isFinite(lab.mean)) return problem(`Your mean is ${describe(lab.mean)}.`);
  if (!Number.isFinite(lab.sd)) return problem(`Your SD is ${describe(lab.sd)}.`);
  if (!(lab.n >= 2)) return problem(`Your n is ${lab.n}; at least 2 values are needed.`);
  if (lab.mean === 0) return problem('Your mean is 0, so your CV and the CVR are undefined.');
  if (!Number.isFinite(peer.mean)) return problem(`The peer mean is ${describe(peer.mean)}.`);
  if (!Number.isFinite(peer.sd)) return problem(`The peer SD is ${describe(peer.sd)}.`);
  if (!(peer.sd > 0)) return problem(`The peer SD is ${peer.sd}, so the SDI would divide by zero.`);
  if (!(peer.mean > 0)) return problem(`The peer mean is ${peer.mean}, so the bias % is undefined.`);
  if (peer.withinCv === null || !(peer.withinCv > 0)) {
    return problem(
      `The peers' within-lab CV is ${peer.withinCv ?? 'unknown'}, so the CVR would divide by zero.`,
    );
  }
  let result: Standing;
  try {
    result = standing(lab, { mean: peer.mean, sd: peer.sd, withinCv: peer.withinCv });
  } catch (error) {
    return problem(`The comparison failed: ${(error as Error).message}.`);
  }
  for (const [name, value] of [
    ['SDI', result.sdi],
    ['CVR', result.cvr],
    ['bias %', result.biasPct],
  ] as const) {
    if (!Number.isFinite(value)) return problem(`The ${name} is ${describe(value)}.`);
  }
  return { standing: result, problem: null };
}

const finiteOrNull = (x: number | null) => (x !== null && Number.isFinite(x) ? x : null);

/** Figures as the report sends them: a figure that is not a finite number becomes null (JSON has no Infinity). */
export function labFiguresOut(figures: Figures): LabFigures {
  return {
    n: Number.isFinite(figures.n) ? figures.n : 0,
    mean: finiteOrNull(figures.mean),
    sd: finiteOrNull(figures.sd),
    cv: finiteOrNull(figures.cv),
  };
}

function finiteLabFigures(lab: LabFigures): LabFigures {
  return { n: lab.n, mean: finiteOrNull(lab.mean), sd: finiteOrNull(lab.sd), cv: finiteOrNull(lab.cv) };
}

/** True when every number of the peer figures is finite (else they are left out of the row). */
export function finitePeer(peer: PeerFigures): boolean {
  return [peer.mean, peer.sd, peer.cv ?? 0, peer.withinCv ?? 0].every(Number.isFinite);
}

/**
 * The last line of defence of a row: any figure that is still not a finite number (a unit conversion
 * can overflow) is dropped and the row says why, instead of the whole report failing to serialise.
 */
export function finiteRow(row: PeerReportRow): PeerReportRow {
  const reasons: string[] = [];
  const lab = row.lab;
  const notFinite = (x: number | null) => x !== null && !Number.isFinite(x);
  if (notFinite(lab.mean) || notFinite(lab.sd) || notFinite(lab.cv)) {
    reasons.push('Your figures are not finite numbers in the units shown.');
  }
  const peerOk = row.peer === null || finitePeer(row.peer);
  if (!peerOk) reasons.push('The peer figures are not finite numbers in the units shown.');
  const scores = [row.sdi, row.cvr, row.biasPct, row.sigma];
  if (scores.some((x) => x !== null && !Number.isFinite(x))) {
    reasons.push('A score of the comparison is not a finite number.');
  }
  if (reasons.length === 0) return row;
  return {
    ...row,
    lab: finiteLabFigures(lab),
    peer: peerOk ? row.peer : null,
    sdi: null,
    cvr: null,
    biasPct: null,
    sigma: null,
    flags: row.flags.filter((f) => f.kind === 'exclusion'),
    notComputable: { reason: [row.notComputable?.reason, ...reasons].filter(Boolean).join(' ') },
    cumulative: {
      ...row.cumulative,
      lab: row.cumulative.lab && finiteLabFigures(row.cumulative.lab),
      peer: row.cumulative.peer && finitePeer(row.cumulative.peer) ? row.cumulative.peer : null,
      sdi: finiteOrNull(row.cumulative.sdi),
      cvr: finiteOrNull(row.cumulative.cvr),
    },
  };
}

/** The fields that identify a row; what every row, computed or not, starts with. */
export type RowIdentity = Pick<
  PeerReportRow,
  'procedure' | 'analyte' | 'controlLot' | 'level' | 'unit' | 'canonicalUnit' | 'decimals' | 'source' | 'late'
>;

/**
 * The row of a comparison that failed outright (something threw while building it): the identity, the
 * lab's own figures in the canonical unit when they are finite, and the reason.
 */
export function notComputableRow(identity: RowIdentity, lab: Figures, reason: NotComputable): PeerReportRow {
  return {
    ...identity,
    lab: labFiguresOut(lab),
    peer: null,
    peerNote: 'The peer comparison of this row cannot be computed.',
    sdi: null,
    cvr: null,
    biasPct: null,
    sigma: null,
    tea: null,
    cumulative: { lab: null, peer: null, sdi: null, cvr: null, notComputable: reason },
    excluded: null,
    flags: [],
    notComputable: reason,
  };
}
