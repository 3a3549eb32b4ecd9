import { bankCase, prepareCase, evaluateCase, DEFAULT_TUNING } from './bench/bank';
const k = (process.argv[2] ?? 'cone-0.5m') as any;
const seed = Number(process.argv[3] ?? 1000);
const src = (process.argv[4] ?? 'onset') as any;
const c = bankCase(k, seed);
console.log(c.model.layers.map(l=>`${l.topM.toFixed(2)}:${l.vsMps.toFixed(0)}/Q${l.qS}`).join(' '), 'wt', c.model.waterTableM);
const r = evaluateCase(prepareCase(c), {...DEFAULT_TUNING, timeSource: src});
const lm = r.intervals.filter(i=>i.method==='layer-model');
const xc = r.intervals.filter(i=>i.method==='xcorr');
for (const i of lm) { const x = xc.find(q=>q.topM===i.topM); console.log(i.topM, i.bottomM, 'true', i.trueVsMps.toFixed(0), 'onsetTrue', i.onsetVsMps?.toFixed(0), 'lm', i.vsMps.toFixed(0), '±', i.sdMps?.toFixed(1), 'xcorr', x?.vsMps.toFixed(0), Math.abs(i.vsMps/i.trueVsMps-1)>0.1?'<<<':''); }
