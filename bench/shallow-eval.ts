/**
 * `npx tsx bench/shallow-eval.ts [count]`: the pipeline's layer-model intervals (layerMethod.ts, recomputed
 * from each survey's picks and delays, so a change there is measured without re-picking) on TRAINING
 * seeds, kinds from env KINDS (default one-receiver, cone-0.5m, two-receiver): median / P90 |error|
 * overall and over intervals with top < 4 m, within 1/2 sd (the kind's scale), intervals off by > 15%.
 * For a tuning, edit the setting and run again.
 */
import { sdScale } from '../src/core/velocity/sdCalibration';
import { bankCase, type BankKind, layerModelOf, prepareCase, seeds } from './bank';

const count = Number(process.argv[2] ?? 12);
const kinds = (process.env.KINDS ?? 'one-receiver,cone-0.5m,two-receiver').split(',') as BankKind[];
const q = (xs: number[], f: number) => {
  const s = [...xs].sort((a, b) => a - b);
  const pos = (s.length - 1) * f;
  const lo = Math.floor(pos);
  const hi = Math.ceil(pos);
  return s[lo] + (s[hi] - s[lo]) * (pos - lo);
};
const prepared = new Map(kinds.map((k) => [k, seeds('training', count).map((s) => prepareCase(bankCase(k, s)))]));
{
  const parts: string[] = [];
  for (const k of kinds) {
    const tk = k === 'cone-0.5m' ? 'seismic-cone' : k === 'two-receiver' ? 'downhole-pair' : 'downhole';
    const scale = sdScale(tk, 'layer-model');
    const err: number[] = [];
    const shallow: number[] = [];
    const z: number[] = [];
    const worst: string[] = [];
    for (const p of prepared.get(k)!) {
      const r = layerModelOf(p);
      for (const pr of p.pairs) {
        if (pr.wave !== 'S') continue;
        const x = r.byPair.get(pr.key);
        if (!x) continue;
        const t = p.truthOf(pr.topM, pr.bottomM);
        const e = (100 * Math.abs(x.velocityMps - t)) / t;
        err.push(e);
        if (pr.topM < 4) shallow.push(e);
        z.push(Math.abs(x.velocityMps - t) / (x.sdMps * scale));
        if (e > 15) worst.push(`${p.c.seed}:${pr.topM}-${pr.bottomM}:${x.velocityMps.toFixed(0)}/${t.toFixed(0)}`);
      }
    }
    const w = (kk: number) => (z.filter((x) => x <= kk).length / z.length).toFixed(3);
    parts.push(
      `${k.padEnd(12)} med ${q(err, 0.5).toFixed(2)} P90 ${q(err, 0.9).toFixed(2)} | top<4: n ${shallow.length} med ${q(shallow, 0.5).toFixed(2)} P90 ${q(shallow, 0.9).toFixed(2)} | within ${w(1)}/${w(2)} | >15%: ${worst.join(' ')}`,
    );
  }
  console.log(parts.join('\n'));
}
