import { bankCase, prepareCase } from './bank';
for (const seed of [1000, 1004, 1005]) {
  const c = bankCase('cone-0.5m', seed);
  for (const k of ['cone-0.5m', 'one-receiver'] as const) {
    const p = prepareCase({ ...c, kind: k });
    const e = p.perMethod
      .filter((x) => x.method === 'layer-model')
      .map((x) => (100 * Math.abs(x.vsMps - x.trueVsMps)) / x.trueVsMps)
      .sort((a, b) => a - b);
    console.log(
      seed,
      k,
      p.derived.layering.fit?.layers.length,
      'median',
      e[Math.floor(e.length / 2)].toFixed(2),
      'trig-intercept',
      p.derived.layering.fit?.interceptS,
      p.derived.layering.fit?.notes.join(';'),
    );
  }
}
