/**
 * The command line against an independent numpy/scipy pipeline (scripts/scipy_pipeline.py) on the demo
 * surveys: CPU time of `node dist-cli/borewave.cjs profile` (the prebuilt bundle, as `npm run cli`
 * runs it) divided by that of `python3 scripts/scipy_pipeline.py`, each run as its own process, the two
 * alternating, median of the rounds. Also how far the two sets of interval velocities lie apart.
 * Surveys: sample-data/{downhole,downhole-pair,crosshole}/project.zip and a text variant of the
 * downhole demo (the forward model's records written as delimited text, same project.json).
 * Figures, not pass/fail. Needs python3 with numpy and scipy; without them the figures are null with a note.
 */
import { execFileSync, spawnSync } from 'node:child_process';
import { mkdirSync, mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import Papa from 'papaparse';
import { makeDemoProject } from '../src/core/synth/demo';
import { toDelimitedText } from '../src/core/synth/text';
import { toProjectJson } from '../src/core/io/project/document';

const ROOT = join(import.meta.dirname, '..');
const BUNDLE = join(ROOT, 'dist-cli', 'borewave.cjs');
const SCRIPT = join(ROOT, 'scripts', 'scipy_pipeline.py');

export type SurveyName = 'downhole' | 'downholePair' | 'crosshole' | 'text';

export interface Agreement {
  intervals: number;
  within1Percent: number;
  maxRelDiff: number;
}

export interface AnchorFigures {
  cliVsScipyRatio: Record<SurveyName, number> | null;
  cpuMs: Record<SurveyName, { cli: number; scipy: number }> | null;
  /** |V_cli - V_scipy| / V_cli over the cross-correlation intervals both computed (S and P). */
  agreement: Record<SurveyName, Agreement> | null;
  rounds: number;
  note?: string;
}

/** CPU seconds (user + system) of the reaped children of this process, from /proc (clock ticks). */
function childCpuS(): number | null {
  try {
    const f = readFileSync('/proc/self/stat', 'utf8');
    const fields = f.slice(f.lastIndexOf(')') + 2).split(' ');
    // After the command name: field 3 is state; cutime and cstime are fields 16 and 17 (1-based).
    return (Number(fields[16 - 3]) + Number(fields[17 - 3])) / 100;
  } catch {
    return null;
  }
}

/** CPU time of one child process, ms (wall time where /proc is missing). */
function runMs(cmd: string, args: string[]): number {
  const c0 = childCpuS();
  const t0 = performance.now();
  const r = spawnSync(cmd, args, { encoding: 'utf8' });
  const wall = performance.now() - t0;
  if (r.status !== 0) throw new Error(`${cmd} ${args.join(' ')} failed: ${r.stderr || r.error}`);
  const c1 = childCpuS();
  return c0 !== null && c1 !== null ? (c1 - c0) * 1000 : wall;
}

function median(xs: number[]): number {
  const s = [...xs].sort((a, b) => a - b);
  return s.length % 2 ? s[(s.length - 1) / 2] : (s[s.length / 2 - 1] + s[s.length / 2]) / 2;
}

/** The downhole demo with its records as delimited text (a folder holding project.json and .csv files). */
export function textVariant(dir: string): string {
  const demo = makeDemoProject('downhole');
  const rename = (n: string) => n.replace(/\.sg2$/i, '.csv');
  const doc = structuredClone(demo.doc);
  doc.survey.records = doc.survey.records.map((r) => ({ ...r, recordId: rename(r.recordId) }));
  doc.files = doc.files.map(rename);
  mkdirSync(dir, { recursive: true });
  for (const r of demo.result.records) writeFileSync(join(dir, rename(r.fileName)), toDelimitedText(r));
  // the file format (toProjectJson), not the in-memory document
  writeFileSync(join(dir, 'project.json'), JSON.stringify(toProjectJson(doc), null, 1));
  return dir;
}

const key = (wave: string, top: string, bottom: string) =>
  `${wave}|${Number(top).toFixed(3)}|${Number(bottom).toFixed(3)}`;

function agreement(cliDir: string, pyDir: string): Agreement {
  const cli = Papa.parse<Record<string, string>>(readFileSync(join(cliDir, 'intervals.csv'), 'utf8'), {
    header: true,
    skipEmptyLines: true,
    comments: '#',
  }).data;
  const py = Papa.parse<Record<string, string>>(readFileSync(join(pyDir, 'intervals.csv'), 'utf8'), {
    header: true,
    skipEmptyLines: true,
  }).data;
  const pv = new Map(
    py.filter((r) => r.velocity_mps).map((r) => [key(r.wave, r.depth_top_m, r.depth_bottom_m), Number(r.velocity_mps)]),
  );
  const diffs: number[] = [];
  for (const r of cli) {
    if (r.method !== 'xcorr') continue;
    const v = Number(r.wave === 'S' ? r.vs_mps : r.vp_mps);
    const other = pv.get(key(r.wave, r.depth_top_m, r.depth_bottom_m));
    if (!(v > 0) || other === undefined) continue;
    diffs.push(Math.abs(other - v) / v);
  }
  return {
    intervals: diffs.length,
    within1Percent: diffs.filter((d) => d <= 0.01).length,
    maxRelDiff: diffs.length ? Math.max(...diffs) : Number.NaN,
  };
}

export function cliVsScipy(rounds = 3): AnchorFigures {
  const py = spawnSync('python3', ['-c', 'import numpy, scipy'], { encoding: 'utf8' });
  if (py.status !== 0) {
    return {
      cliVsScipyRatio: null,
      cpuMs: null,
      agreement: null,
      rounds: 0,
      note: 'python3 with numpy and scipy is not available: the scipy anchor was skipped',
    };
  }
  execFileSync('node', [join(ROOT, 'scripts', 'build-cli.mjs')], { stdio: 'ignore' });
  const work = mkdtempSync(join(tmpdir(), 'borewave-anchor-'));
  try {
    const inputs: Record<SurveyName, string> = {
      downhole: join(ROOT, 'sample-data', 'downhole', 'project.zip'),
      downholePair: join(ROOT, 'sample-data', 'downhole-pair', 'project.zip'),
      crosshole: join(ROOT, 'sample-data', 'crosshole', 'project.zip'),
      text: textVariant(join(work, 'text-survey')),
    };
    const names = Object.keys(inputs) as SurveyName[];
    const cpu = Object.fromEntries(names.map((n) => [n, { cli: [] as number[], scipy: [] as number[] }]));
    const outCli = (n: SurveyName) => join(work, `cli-${n}`);
    const outPy = (n: SurveyName) => join(work, `py-${n}`);
    for (let r = 0; r < rounds; r++) {
      for (const n of names) {
        // Alternate which goes first so neither always runs on a warmer disk cache.
        const cliRun = () => cpu[n].cli.push(runMs('node', [BUNDLE, 'profile', inputs[n], '--out', outCli(n)]));
        const pyRun = () => cpu[n].scipy.push(runMs('python3', [SCRIPT, inputs[n], '--out', outPy(n)]));
        if (r % 2 === 0) {
          cliRun();
          pyRun();
        } else {
          pyRun();
          cliRun();
        }
      }
    }
    const ratio = {} as Record<SurveyName, number>;
    const cpuMs = {} as Record<SurveyName, { cli: number; scipy: number }>;
    const agree = {} as Record<SurveyName, Agreement>;
    for (const n of names) {
      const c = median(cpu[n].cli);
      const s = median(cpu[n].scipy);
      cpuMs[n] = { cli: Math.round(c), scipy: Math.round(s) };
      ratio[n] = Math.round((c / s) * 1000) / 1000;
      agree[n] = agreement(outCli(n), outPy(n));
    }
    return { cliVsScipyRatio: ratio, cpuMs, agreement: agree, rounds };
  } finally {
    rmSync(work, { recursive: true, force: true });
  }
}
