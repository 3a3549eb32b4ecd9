/**
 * `npx tsx bench/shallow.ts [count] [kind]`: the one-receiver layered model near the surface on TRAINING
 * seeds: per survey the true shallow layers, the fitted layers and intercept, for the top receivers
 * the time's error against the true refracted-ray time (what the intercept should hold) and the fit's
 * residual, and the shallow intervals' errors.
 */
import { layerObservations } from '../src/core/velocity/layerMethod';
import { defaultSettings } from '../src/core/settings';
import { isOnsetPick } from '../src/core/catalogue/methods';
import { layeredRay } from '../src/core/survey/rays';
import { bankCase, type BankKind, layerModelOf, prepareCase, seeds } from './bank';

const count = Number(process.argv[2] ?? 12);
const kind = (process.argv[3] ?? 'one-receiver') as BankKind;
const testKind = kind === 'cone-0.5m' ? 'seismic-cone' : kind === 'two-receiver' ? 'downhole-pair' : 'downhole';
const st = defaultSettings();
for (const s of seeds('training', count)) {
  const c = bankCase(kind, s);
  const p = prepareCase(c);
  const d = p.derived;
  const r = layerModelOf(p);
  const onsets = new Map(d.picks.filter((x) => x.wave === 'S' && isOnsetPick(x)).map((x) => [x.stationKey, x]));
  const xc = new Map(d.delays.filter((x) => x.wave === 'S' && x.method === 'xcorr').map((x) => [x.pairKey, x]));
  const obs = layerObservations(testKind, p.pairs, onsets, xc as never, st.intervals.triggerOffsetSdS);
  const trueTop = c.model.layers.filter((l) => l.topM < 6).map((l) => `${l.topM.toFixed(2)}:${l.vsMps.toFixed(0)}`);
  console.log(
    `seed ${s} true ${trueTop.join(' ')}  offset ${(c.geometry as { sourceOffsetM?: number }).sourceOffsetM}`,
  );
  const f = r.fit;
  if (!f) {
    console.log('  no fit', r.reason);
    continue;
  }
  console.log(
    `  fit ${f.layers
      .filter((l) => l.topM < 8)
      .map((l) => `${l.topM.toFixed(2)}:${l.vsMps.toFixed(0)}(${l.receivers})`)
      .join(
        ' ',
      )}  icpt ${((f.interceptS ?? 0) * 1e3).toFixed(3)} ms  chi2/dof ${(f.chi2 / f.dof).toFixed(2)} ${f.notes.filter((n) => !n.startsWith('trigger')).join(';')}`,
  );
  const truth = c.model.layers.map((l) => ({ topM: l.topM, velocityMps: l.vsMps }));
  const row = obs
    .slice(0, 6)
    .map(
      (o, i) =>
        `${o.depthBM}:${((o.timeS - layeredRay(truth, 0, o.depthBM, o.offsetM).timeS) * 1e3).toFixed(2)}/${(f.residualsS[i] * 1e3).toFixed(2)}`,
    );
  console.log(`  time error / residual, ms: ${row.join(' ')}`);
  const ivs = p.perMethod.filter((iv) => iv.method === 'layer-model' && iv.topM < 5);
  console.log(
    `  ${ivs.map((iv) => `${iv.topM}-${iv.bottomM}: ${iv.vsMps.toFixed(0)}/${iv.trueVsMps.toFixed(0)} (${((100 * (iv.vsMps - iv.trueVsMps)) / iv.trueVsMps).toFixed(0)}%)`).join('  ')}`,
  );
}
