// Benchmarks of @plumbline/stats, each against a baseline measured in the same run.
// Run with `npm run bench:stats`.
//   (a) nonparametricInterval with both 90 % confidence intervals on 1,000,000 values, against a
//       plain copy-and-sort of the same values into a Float64Array (target: ratio ≤ 1.5);
//   (b) peerStatistics over 60,000 lab series of 500 labs each (a year of monthly figures for a
//       large network); only the calls themselves are timed.
import { performance } from 'node:perf_hooks';
import {
  nonparametricInterval,
  peerStatistics,
  seededRandom,
  type LabSummary,
} from '../packages/stats/src/index.ts';

function median(samples: number[]): number {
  const sorted = [...samples].sort((a, b) => a - b);
  return sorted[sorted.length >> 1];
}

function timeOnce(work: () => unknown): number {
  const start = performance.now();
  work();
  return performance.now() - start;
}

// (a) Nonparametric interval versus a plain typed-array sort.
const valueCount = 1_000_000;
const random = seededRandom(2024);
const values = Array.from({ length: valueCount }, () => random.normal(140, 2));
let checksum = 0; // keeps the work observable so it cannot be optimised away
const sortOnly = () => {
  const sorted = new Float64Array(values).sort();
  checksum += sorted[0];
};
const interval = () => {
  const result = nonparametricInterval(values);
  checksum += result.lower.value;
};
for (let i = 0; i < 2; i++) {
  sortOnly();
  interval();
}
const rounds = 7;
const sortTimes: number[] = [];
const intervalTimes: number[] = [];
for (let i = 0; i < rounds; i++) {
  sortTimes.push(timeOnce(sortOnly));
  intervalTimes.push(timeOnce(interval));
}
const sortMs = median(sortTimes);
const intervalMs = median(intervalTimes);
const ratio = intervalMs / sortMs;
const result = nonparametricInterval(values);
console.log(
  `(a) nonparametricInterval, ${valueCount.toLocaleString('en')} values, both 90 % CIs (median of ${rounds} runs)`,
);
console.log(`    Float64Array copy + sort: ${sortMs.toFixed(1)} ms`);
console.log(`    nonparametricInterval:    ${intervalMs.toFixed(1)} ms`);
console.log(`    ratio: ${ratio.toFixed(2)} (target ≤ 1.5) ${ratio <= 1.5 ? 'OK' : 'ABOVE TARGET'}`);
console.log(
  `    limits ${result.lower.value.toFixed(3)} [${result.lower.ci?.map((v) => v.toFixed(3)).join(', ')}] – ` +
    `${result.upper.value.toFixed(3)} [${result.upper.ci?.map((v) => v.toFixed(3)).join(', ')}]`,
);

// (b) Peer statistics over 60,000 series of 500 labs; about 1 % of labs are far off so the outlier
// screen has work to do. Series are generated outside the timed calls.
const seriesCount = 60_000;
const labsPerSeries = 500;
const ids = Array.from({ length: labsPerSeries }, (_, i) => `lab-${i + 1}`);
const labRandom = seededRandom(7);
let peerMs = 0;
let excluded = 0;
for (let s = 0; s < seriesCount; s++) {
  const target = 50 + 50 * labRandom.uniform();
  const labs: LabSummary[] = ids.map((id) => {
    const far = labRandom.uniform() < 0.01;
    return {
      id,
      n: 20 + Math.floor(10 * labRandom.uniform()),
      mean: target * (1 + (far ? 0.2 : 0) + 0.02 * labRandom.normal()),
      sd: target * (0.02 + 0.01 * labRandom.uniform()),
    };
  });
  const start = performance.now();
  const statistics = peerStatistics(labs);
  peerMs += performance.now() - start;
  excluded += statistics.excluded.length;
}
console.log(`(b) peerStatistics, ${seriesCount.toLocaleString('en')} series × ${labsPerSeries} labs`);
console.log(
  `    total ${(peerMs / 1000).toFixed(2)} s, ${((1000 * peerMs) / seriesCount).toFixed(1)} µs per series`,
);
console.log(
  `    labs excluded as outliers: ${excluded.toLocaleString('en')} (${((100 * excluded) / (seriesCount * labsPerSeries)).toFixed(2)} %)`,
);
if (checksum === 42) console.log(''); // never true; uses the checksum
