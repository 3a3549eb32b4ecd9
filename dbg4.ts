import { bankCase, DEFAULT_TUNING, evaluateCase, prepareCase, seeds } from './bench/bank';
const kind = process.argv[2] as any;
for (const s of seeds('training', 4)) {
  const p = prepareCase(bankCase(kind, s));
  const r = evaluateCase(p, DEFAULT_TUNING);
  const xc = r.intervals.filter(i=>i.method==='xcorr');
  for (const iv of r.intervals.filter(i=>i.method==='layer-model')) {
    const z = Math.abs(iv.vsMps - iv.trueVsMps) / iv.sdMps!;
    const x = xc.find(q=>q.topM===iv.topM);
    if (z > 2) console.log(s, iv.topM, iv.bottomM, 'true', iv.trueVsMps.toFixed(0), 'lm', iv.vsMps.toFixed(0), '±', iv.sdMps!.toFixed(1), 'xcorr', x?.vsMps.toFixed(0), '±', x?.sdMps?.toFixed(1), 'bnd', p.c.boundariesM.filter(b=>b>iv.topM-1.5&&b<iv.bottomM+1.5).map(b=>b.toFixed(2)).join(','));
  }
}
