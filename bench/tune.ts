/**
 * `npx tsx bench/tune.ts [count]`: tunes the layered model on TRAINING seeds only (bench/bank.ts) and
 * prints median / P90 error and calibration per kind for each candidate setting.
 */
import { bankCase, DEFAULT_TUNING, evaluateCase, figures, prepareCase, sdScales, seeds, type BankKind } from './bank';

const count = Number(process.argv[2] ?? 6);
const kindArg = process.argv.indexOf('--kind');
const kinds: BankKind[] =
  kindArg > 0 ? [process.argv[kindArg + 1] as BankKind] : ['one-receiver', 'two-receiver', 'cone-0.5m'];
const prepared = new Map(kinds.map((k) => [k, seeds('training', count).map((s) => prepareCase(bankCase(k, s)))]));
const grid = process.argv.includes('--calibration')
  ? [0, 0.02, 0.04, 0.06, 0.1].map((modelSdShare) => ({ ...DEFAULT_TUNING, modelSdShare }))
  : [0.25, 0.5, 1, 2].flatMap((penaltyScale) =>
      (['onset', 'xcorr'] as const).map((timeSource) => ({ ...DEFAULT_TUNING, penaltyScale, timeSource })),
    );
for (const t of grid) {
  {
    const parts: string[] = [];
    for (const k of kinds) {
      const runs = prepared.get(k)!.map((p) => evaluateCase(p, t));
      const f = figures(runs, sdScales(runs, k));
      for (const m of ['layer-model:tuned', 'layer-blend:tuned']) {
        const x = f[m];
        if (!x) continue;
        parts.push(`${k}/${m} ${x.medianErrPct.toFixed(2)}/${x.p90ErrPct.toFixed(2)} (${x.within1Sd},${x.within2Sd})`);
      }
    }
    console.log(JSON.stringify(t), '\n   ', parts.join('\n    '));
  }
}
