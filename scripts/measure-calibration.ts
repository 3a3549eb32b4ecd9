/** `npx tsx scripts/measure-calibration.ts [train|held-out] [count]`: class calibration on a bank of forward-model surveys. */
import { classCalibration } from '../src/core/synth/calibration';

const which = process.argv[2] ?? 'train';
const count = Number(process.argv[3] ?? 12);
const base = which === 'train' ? 500 : 7000;
const seeds = Array.from({ length: count }, (_, i) => base + i);
console.log(which, JSON.stringify(classCalibration(seeds)));
