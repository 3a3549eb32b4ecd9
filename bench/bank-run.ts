/** `npx tsx bench/bank-run.ts [seeds per split] [--json]`: the bank alone (bench/bank.ts). */
import { bankReport, printBank } from './bank';
const n = Number(process.argv[2] ?? 3);
const rep = bankReport(n);
if (process.argv.includes('--json')) process.stdout.write(JSON.stringify(rep, null, 1) + '\n');
else printBank(rep, (s) => process.stdout.write(s + '\n'));
