import { bankCase, prepareCase, evaluateCase, DEFAULT_TUNING } from './bench/bank';
import { performance } from 'node:perf_hooks';
for (const k of ['one-receiver','two-receiver','cone-0.5m'] as const) {
  const p = prepareCase(bankCase(k, 1001));
  for (const ps of [0.3, 1]) for (const src of ['onset','xcorr'] as const) {
  const t = performance.now();
  const r = evaluateCase(p, {...DEFAULT_TUNING, penaltyScale: ps, timeSource: src});
  const lm = r.intervals.filter(i=>i.method==='layer-model');
  const e = lm.map(i=>Math.abs(i.vsMps/i.trueVsMps-1)*100).sort((a,b)=>a-b);
  console.log(k, ps, src, 'ms', (performance.now()-t).toFixed(0), 'layers', r.layers, 'med', e[Math.floor(e.length/2)]?.toFixed(2), 'p90', e[Math.floor(e.length*0.9)]?.toFixed(2), r.layerModelNote);
  }
}
