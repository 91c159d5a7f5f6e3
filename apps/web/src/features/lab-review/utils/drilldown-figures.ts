// Turns the drill-down's wire format into what the charts draw, and names things in words.
import type { Drilldown, PeerTier } from '@plumbline/contracts';
import type { ControlChartPoint } from '../../../components/charts/levey-jennings-chart.tsx';
import type { LabMeanPoint } from '../../../components/charts/peer-distribution-chart.tsx';
import type { TwoLevelPoint } from '../../../components/charts/two-level-sdi-plot.tsx';
import type { UncertaintyComponent } from '../../../components/charts/uncertainty-chart.tsx';

export const tierWords: Record<PeerTier, string> = {
  instrument: 'same instrument model, method and reagent',
  method: 'same method, any instrument model',
  analyte: 'all methods for the analyte',
};

type Target = NonNullable<Drilldown['leveyJennings']['target']>;

export const targetBasisWords: Record<Target['basis'], string> = {
  established: "your lab's cumulative figures from earlier periods of this lot",
  'this-period': "your lab's own figures of this period (no earlier data for this lot)",
  'peer-to-date': "the peer group's figures for this lot to date",
  'peer-period': "the peer group's figures of this period",
};

export function twoLevelPoints(drilldown: Drilldown): TwoLevelPoint[] {
  return (drilldown.twoLevel?.points ?? []).map((p, index) => ({
    key: `lab-${index}`,
    x: p.sdi1,
    y: p.sdi2,
    isOwnLab: p.own,
  }));
}

export function labMeanPoints(drilldown: Drilldown): LabMeanPoint[] {
  return (drilldown.distribution?.labMeans ?? []).map((p, index) => ({
    key: `lab-${index}`,
    mean: p.mean,
    isOwnLab: p.own,
    excluded: p.excluded,
  }));
}

export function controlChartPoints(drilldown: Drilldown): ControlChartPoint[] {
  return drilldown.leveyJennings.points.map((p, index) => ({
    key: `${p.run}-${index}`,
    at: p.measuredAt,
    value: p.value,
    run: p.run,
    rules: p.rules,
  }));
}

export function uncertaintyComponents(u: NonNullable<Drilldown['uncertainty']>): UncertaintyComponent[] {
  return [
    {
      key: 'uRw',
      label: 'u(Rw) within-lab reproducibility',
      valuePct: u.uRw,
      basis: `your CV over ${u.longTerm.periods} period${u.longTerm.periods === 1 ? '' : 's'} (n = ${u.longTerm.n})`,
    },
    {
      key: 'rmsBias',
      label: 'RMS of bias',
      valuePct: u.rmsBias,
      basis: `${u.comparisons.length} peer comparison${u.comparisons.length === 1 ? '' : 's'}`,
    },
    {
      key: 'uRef',
      label: 'u(Cref) peer mean',
      valuePct: u.uRef,
      basis: 'robust SD of the lab means / (peer mean · √labs), averaged',
    },
    { key: 'uBias', label: 'u(bias)', valuePct: u.uBias, basis: '√(RMS bias² + u(Cref)²)' },
    { key: 'uc', label: 'uc combined', valuePct: u.uc, basis: '√(u(Rw)² + u(bias)²)', result: true },
    { key: 'U', label: `U expanded (k = ${u.k})`, valuePct: u.U, basis: `${u.k} × uc`, result: true },
  ];
}
