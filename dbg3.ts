import { bankCase, DEFAULT_TUNING, evaluateCase, prepareCase, seeds } from './bench/bank';
const kind = process.argv[2] as any;
const src = (process.argv[3] ?? 'xcorr') as any;
const cats = new Map<string, {m:string, e:number}[]>();
for (const s of seeds('training', 6)) {
  const p = prepareCase(bankCase(kind, s));
  const r = evaluateCase(p, { ...DEFAULT_TUNING, timeSource: src });
  for (const iv of r.intervals) {
    if (!['layer-model','layer-blend','xcorr','ray-fit','onset'].includes(iv.method)) continue;
    const straddle = p.c.boundariesM.some((b) => b > iv.topM && b < iv.bottomM);
    const near = p.c.boundariesM.some((b) => Math.abs(b - iv.topM) < 1 || Math.abs(b - iv.bottomM) < 1);
    const cat = iv.topM < 3 ? 'shallow<3' : straddle ? 'straddle' : near ? 'near' : 'inside';
    const k = `${iv.method}|${cat}`;
    cats.set(k, [...(cats.get(k) ?? []), { m: iv.method, e: Math.abs(iv.vsMps / iv.trueVsMps - 1) * 100 }]);
  }
}
const q = (xs: number[], f: number) => { const s = [...xs].sort((a,b)=>a-b); return s[Math.floor((s.length-1)*f)]; };
for (const [k, v] of [...cats].sort()) console.log(k.padEnd(26), 'n', String(v.length).padStart(4), 'med', q(v.map(x=>x.e),0.5).toFixed(2), 'p90', q(v.map(x=>x.e),0.9).toFixed(2));
