/**
 * Rough timing of the picking engine (not a test): auto-pick of a synthetic survey of 2,000 traces
 * of 4,096 samples with 1,999 neighbour pairs, and single pair-delay calls.
 * Run: npx tsx scripts/measure-picking.ts
 */
import {
  analyseStation,
  autoPickSurvey,
  pairDelays,
  pairDelaysFromAnalysis,
  type PickingSettings,
} from '../src/core/picking/autopick';
import type { DelayRequest, WorkingTrace } from '../src/core/model';
import type { IntervalKey, StationKey } from '../src/core/keys';
import { conditionTrace } from '../src/core/signal/condition';

const nTraces = 2000;
const n = 4096;
const dtS = 1e-4;
const vsMps = 200;
const offsetM = 2;

function lcg(seed: number): () => number {
  let s = seed >>> 0;
  return () => {
    s = (Math.imul(s, 1664525) + 1013904223) >>> 0;
    return s / 4294967296 - 0.5;
  };
}

const rand = lcg(42);
const traces: WorkingTrace[] = [];
for (let k = 0; k < nTraces; k++) {
  const depthM = 1 + (k % 100) * 0.4; // 100 depths, 20 repeats (e.g. hits or components)
  const rM = Math.hypot(offsetM, depthM);
  const onsetS = rM / vsMps;
  const x = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    const t = i * dtS - onsetS;
    x[i] = 0.05 * rand() + (t >= 0 ? Math.sin(2 * Math.PI * 100 * t) * Math.exp(-100 * t) : 0);
  }
  traces.push({
    // Measurement-only keys (S<k>, P<k>): parsed back below, never saved.
    stationKey: `S${k}` as StationKey,
    wave: 'S',
    samples: x,
    sampleIntervalS: dtS,
    delayS: 0,
    searchStartS: rM / 1500,
    searchEndS: Math.min(rM / 50, (n - 1) * dtS),
  });
}
const pairs: DelayRequest[] = [];
for (let k = 0; k + 1 < nTraces; k++) {
  pairs.push({
    pairKey: `P${k}` as IntervalKey,
    wave: 'S',
    a: `S${k}` as StationKey,
    b: `S${k + 1}` as StationKey,
    minDelayS: -0.05,
    maxDelayS: 0.05,
  });
}
const settings: PickingSettings = {
  onsetMethod: 'aic',
  staS: 0.003,
  ltaS: 0.03,
  staLtaThreshold: 3,
  phaseBandHz: null,
};

function time(label: string, runs: number, fn: () => void): number {
  fn(); // warm-up
  const t: number[] = [];
  for (let r = 0; r < runs; r++) {
    const t0 = performance.now();
    fn();
    t.push(performance.now() - t0);
  }
  t.sort((a, b) => a - b);
  const median = t[Math.floor(t.length / 2)];
  console.log(
    `${label}: median ${median.toFixed(3)} ms over ${runs} runs (min ${t[0].toFixed(3)}, max ${t[t.length - 1].toFixed(3)})`,
  );
  return median;
}

time('autoPickSurvey, 2000 traces x 4096 samples + 1999 pairs (xcorr)', 5, () =>
  autoPickSurvey(traces, pairs, settings),
);
time('autoPickSurvey, same with phase band 50-200 Hz', 5, () =>
  autoPickSurvey(traces, pairs, { ...settings, phaseBandHz: [50, 200] }),
);
time('autoPickSurvey, STA/LTA onsets', 5, () => autoPickSurvey(traces, pairs, { ...settings, onsetMethod: 'stalta' }));
const a = analyseStation(traces[50], settings);
const b = analyseStation(traces[51], settings);
const reps = 2000;
const perPair = time(`pairDelaysFromAnalysis x ${reps} (the per-pair cost inside the survey)`, 5, () => {
  for (let r = 0; r < reps; r++) pairDelaysFromAnalysis(a, b, pairs[50], settings);
});
console.log(`  -> ${(perPair / reps).toFixed(4)} ms per pair`);
const perPublic = time(`pairDelays x 200 (public call: analyses both traces first)`, 5, () => {
  for (let r = 0; r < 200; r++) pairDelays(traces[50], traces[51], pairs[50], settings);
});
console.log(`  -> ${(perPublic / 200).toFixed(4)} ms per call`);
time('conditionTrace x 2000 (detrend, 5% taper, 4th-order 20-400 Hz zero-phase band-pass)', 3, () => {
  for (const t of traces)
    conditionTrace(t.samples, dtS, {
      detrend: true,
      taperFraction: 0.05,
      bandpass: { lowHz: 20, highHz: 400, order: 4 },
    });
});
const res = autoPickSurvey(traces, pairs, settings);
console.log(`picks ${res.picks.length}, delays ${res.delays.length}, problems ${res.problems.length}`);
// Accuracy on this synthetic survey (true onset R / Vs; true delay between neighbours from the same formula).
const onsetErrMs = res.picks
  .filter((p) => p.method === 'aic')
  .map((p) => {
    const k = Number(p.stationKey.slice(1));
    return Math.abs(p.timeS - Math.hypot(offsetM, 1 + (k % 100) * 0.4) / vsMps) * 1e3;
  })
  .sort((x, y) => x - y);
const delayErrMs = res.delays
  .filter((d) => Number(d.pairKey.slice(1)) % 100 !== 99) // skip the jump from the deepest back to the shallowest station
  .map((d) => {
    const k = Number(d.pairKey.slice(1));
    const want = (Math.hypot(offsetM, 1 + ((k + 1) % 100) * 0.4) - Math.hypot(offsetM, 1 + (k % 100) * 0.4)) / vsMps;
    return Math.abs(d.delayS - want) * 1e3;
  })
  .sort((x, y) => x - y);
const pct = (v: number[], q: number): string => v[Math.min(v.length - 1, Math.floor(q * v.length))].toFixed(3);
console.log(
  `|onset error| ms: median ${pct(onsetErrMs, 0.5)}, 95% ${pct(onsetErrMs, 0.95)}, max ${pct(onsetErrMs, 1)}`,
);
console.log(
  `|delay error| ms: median ${pct(delayErrMs, 0.5)}, 95% ${pct(delayErrMs, 0.95)}, max ${pct(delayErrMs, 1)}`,
);
