import { BANK_KINDS, DEFAULT_TUNING, figures, runBank, type BankKind } from './bank';
import { performance } from 'node:perf_hooks';
const n = Number(process.argv[2] ?? 3);
const kinds = (process.argv[3]?.split(',') ?? BANK_KINDS) as BankKind[];
const t0 = performance.now();
const runs = runBank(kinds, 'training', n, DEFAULT_TUNING);
for (const k of kinds) {
  console.log(k, runs[k].map((r) => r.layerModelNote).filter(Boolean));
  const f = figures(runs[k]);
  for (const [m, x] of Object.entries(f)) console.log('  ', m.padEnd(14), JSON.stringify(x));
}
console.log('ms', performance.now() - t0);
