/**
 * `npx tsx bench/diagnose.ts <kind> [count] [method]`: the standardised errors |error| / sd of one method
 * on TRAINING seeds, grouped by what the interval holds (a true boundary, a fitted one, depth), to see
 * where the calibration's tails come from.
 */
import { calibrationScale, withinShare } from '../src/core/velocity/sdCalibration';
import { bankCase, type BankKind, prepareCase, seeds } from './bank';

const kind = (process.argv[2] ?? 'one-receiver') as BankKind;
const count = Number(process.argv[3] ?? 4);
const method = process.argv[4] ?? 'layer-model';
const rows: { z: number; pct: number; group: string; line: string }[] = [];
for (const s of seeds('training', count)) {
  const c = bankCase(kind, s);
  const p = prepareCase(c);
  const fitTops = p.derived.layering.fit?.layers.slice(1).map((l) => l.topM) ?? [];
  const errs = p.perMethod
    .filter((iv) => iv.method === method)
    .map((iv) => (100 * Math.abs(iv.vsMps - iv.trueVsMps)) / iv.trueVsMps)
    .sort((x, y) => x - y);
  const r = c.realism;
  console.log(
    `seed ${s}: n ${errs.length} median ${errs[Math.floor(errs.length / 2)]?.toFixed(2)} max ${errs[errs.length - 1]?.toFixed(1)}%  turning ${r.turning} one-hit ${r.oneHitAt.length} missing ${r.missingAt.length} noisy ${r.noisyRecords.length}  layers ${fitTops.length + 1} (true ${c.boundariesM.length + 1})  ${p.derived.layering.reason ?? ''}`,
  );
  for (const iv of p.perMethod) {
    if (iv.method !== method || !iv.sdMps) continue;
    const z = Math.abs(iv.vsMps - iv.trueVsMps) / iv.sdMps;
    const trueB = c.boundariesM.some((b) => b > iv.topM && b < iv.bottomM);
    const nearB = c.boundariesM.some((b) => b > iv.topM - 1 && b < iv.bottomM + 1);
    const fitB = fitTops.some((b) => b > iv.topM && b < iv.bottomM);
    const group = `${trueB ? 'true-b' : nearB ? 'near-b' : 'inside'}${fitB ? '+fit-b' : ''}${iv.topM < 5 ? ' shallow' : ''}`;
    rows.push({
      z,
      pct: (100 * Math.abs(iv.vsMps - iv.trueVsMps)) / iv.trueVsMps,
      group,
      line: `seed ${s} ${iv.topM.toFixed(2)}-${iv.bottomM.toFixed(2)} v ${iv.vsMps.toFixed(1)} true ${iv.trueVsMps.toFixed(1)} sd ${iv.sdMps.toFixed(1)} z ${z.toFixed(2)} ${group}`,
    });
  }
}
const q = (xs: number[], f: number) => {
  const s = [...xs].sort((a, b) => a - b);
  return s[Math.min(s.length - 1, Math.floor(f * (s.length - 1)))];
};
const groups = [...new Set(rows.map((r) => r.group))].sort();
for (const g of groups) {
  const z = rows.filter((r) => r.group === g).map((r) => r.z);
  console.log(
    `${g.padEnd(24)} n=${String(z.length).padStart(4)}  median z ${q(z, 0.5).toFixed(2)}  q68 ${q(z, 0.68).toFixed(2)}  q95 ${q(z, 0.95).toFixed(2)}  >2: ${z.filter((x) => x > 2).length}`,
  );
}
const pct = rows.map((r) => r.pct).sort((a, b) => a - b);
console.log(`pooled |error| median ${q(pct, 0.5).toFixed(2)}% P90 ${q(pct, 0.9).toFixed(2)}%`);
console.log('worst:');
for (const r of [...rows].sort((a, b) => b.z - a.z).slice(0, 15)) console.log('  ', r.line);
const allZ = rows.map((r) => r.z);
const sc = calibrationScale(allZ) ?? 1;
const cov = (k: number) =>
  withinShare(
    allZ.map((z) => ({ errorMps: z, sdMps: sc })),
    k,
  )?.toFixed(3);
console.log(
  `raw within 1/2 sd ${withinShare(
    allZ.map((z) => ({ errorMps: z, sdMps: 1 })),
    1,
  )?.toFixed(3)}/${withinShare(
    allZ.map((z) => ({ errorMps: z, sdMps: 1 })),
    2,
  )?.toFixed(3)}; scale ${sc.toFixed(2)} -> ${cov(1)}/${cov(2)}`,
);
