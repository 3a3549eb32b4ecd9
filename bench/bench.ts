/**
 * `npm run bench [-- --json]`: speed and accuracy figures of the whole pipeline on forward-model
 * surveys. Figures, not pass/fail: targets are compared in the printed table.
 *
 * Surveys: a dense downhole survey (0.1 m steps, 350 depths x 2 hits x 3 components = 2,100 traces of
 * 4,096 samples), twice: attenuation off (the pulse keeps its shape; accuracy figures in the JSON) and
 * on (to show onset- and correlation-based delays drifting apart with depth); the demo crosshole set;
 * and a 60-depth downhole survey for the per-edit timings (derive, Monte Carlo).
 * Then the bank of random layered earths (bench/bank.ts): accuracy and calibration per test kind and
 * method on training and held-out seeds (JSON keys `bank` and `calibration`), and the field Q recovery of
 * same-hit surveys (JSON key `fieldQ`: per kind, scope interval/layer, training and held-out). The joint
 * travel-time inversion is one of the methods (rows `joint`; same-hit kinds also `joint-le`/`joint-whole`
 * and `xcorr-le`/`xcorr-whole`: delays on the onset-aligned leading edge the other way round from the default).
 * Then the command line against a numpy/scipy pipeline (bench/anchor.ts: cliVsScipyRatio) and the
 * browser figures from a Playwright run (bench/browser.ts; `--no-browser` skips them).
 */
import { bankReport, printBank } from './bank';
import { intervalKey, pickEditKey } from '../src/core/keys';
import { performance } from 'node:perf_hooks';
import Papa from 'papaparse';
import { cliVsScipy, type SurveyName } from './anchor';
import { browserFigures } from './browser';
import { readSeg2, writeSeg2 } from '../src/core/io/seg2';
import { allowsDecimalComma, parseCell, readDelimitedText, splitTextRows } from '../src/core/io/text';
import type { WaveRecord } from '../src/core/model';
import { autoPick, derive, prepare } from '../src/core/pipeline';
import { analyseStation, pairDelays, pairDelaysFromAnalysis } from '../src/core/picking/autopick';
import { defaultSettings, emptyEdits, type IntervalMethod } from '../src/core/settings';
import { siteUncertainty } from '../src/core/site/montecarlo';
import { classCalibration } from '../src/core/synth/calibration';
import {
  demoCrossholeGeometry,
  demoCrossholeOptions,
  demoEarthModel,
  synthesizeSurvey,
  toSeg2Input,
  type SynthResult,
} from '../src/core/synth';

const json = process.argv.includes('--json');
/** --quick: the bank with 2 seeds per split and no dense speed surveys; --bank-only: the bank alone; --bank-seeds N. */
const quick = process.argv.includes('--quick');
const bankOnly = process.argv.includes('--bank-only');
const seedArg = process.argv.indexOf('--bank-seeds');
const bankSeeds = seedArg > 0 ? Number(process.argv[seedArg + 1]) : quick ? 2 : 4;
const log = (s: string) => {
  if (!json) process.stdout.write(s + '\n');
};

function time<T>(f: () => T): { value: T; ms: number } {
  const t0 = performance.now();
  const value = f();
  return { value, ms: performance.now() - t0 };
}

function quantile(xs: number[], q: number): number {
  if (!xs.length) return NaN;
  const s = [...xs].sort((a, b) => a - b);
  const pos = (s.length - 1) * q;
  const lo = Math.floor(pos);
  const hi = Math.ceil(pos);
  return s[lo] + (s[hi] - s[lo]) * (pos - lo);
}

function denseDownhole(attenuation: boolean): SynthResult {
  const depthsM = Array.from({ length: 350 }, (_, i) => Math.round((1 + i * 0.1) * 10) / 10);
  return synthesizeSurvey(
    demoEarthModel(),
    { kind: 'downhole', holeId: 'DH1', depthsM, sourceOffsetM: 2 },
    {
      seed: attenuation ? 71 : 70,
      sampleIntervalS: 5e-5,
      samplesPerTrace: 4096,
      sFrequencyHz: 100,
      pFrequencyHz: 400,
      attenuation,
      snr: 25, // realistic field noise for a good hammer source (common practice)
      maxTriggerDelayS: 0, // accuracy is of the picking; trigger jitter is a separate error
    },
  );
}

function recordsMap(rs: WaveRecord[]): Map<string, WaveRecord> {
  return new Map(rs.map((r) => [r.id, r]));
}

function traceCount(rs: WaveRecord[]): number {
  return rs.reduce((n, r) => n + r.traces.length, 0);
}

/** True S travel time per station key, from the forward model's truth (mean over the station's hits). */
function trueStationTimes(
  res: SynthResult,
  stationKeyOf: (recordId: string, channel: number) => string | null,
): Map<string, number> {
  const sum = new Map<string, { t: number; n: number }>();
  for (const r of res.truth.records) {
    for (const c of r.channels) {
      const k = stationKeyOf(r.recordId, c.channel);
      if (!k) continue;
      const e = sum.get(k) ?? { t: 0, n: 0 };
      e.t += c.sArrivalS;
      e.n++;
      sum.set(k, e);
    }
  }
  return new Map([...sum].map(([k, e]) => [k, e.t / e.n]));
}

function runSurvey(label: string, res: SynthResult) {
  const settings = defaultSettings();
  const records = recordsMap(res.records);
  const traces = traceCount(res.records);
  const mb = (traces * res.records[0].traces[0].samples.length * 4) / 1e6;
  const io = time(() =>
    res.records.map((r) => readSeg2(writeSeg2(toSeg2Input(r), { byteOrder: 'little', formatCode: 4 }), r.fileName)),
  );
  const prep = time(() => prepare(res.survey, records, settings));
  const auto = time(() => autoPick(prep.value, settings));
  const der = time(() => derive(res.survey, prep.value, auto.value, emptyEdits(), settings));
  log(
    `\n${label}: ${res.records.length} records, ${traces} traces (${mb.toFixed(1)} MB of float32 samples), ${prep.value.stations.length} stations, ${prep.value.pairs.length} pairs`,
  );
  log(
    `  write+read SEG-2  ${io.ms.toFixed(0).padStart(7)} ms  ${(traces / (io.ms / 1000)).toFixed(0).padStart(8)} traces/s  ${(mb / (io.ms / 1000)).toFixed(1)} MB/s`,
  );
  log(
    `  prepare           ${prep.ms.toFixed(0).padStart(7)} ms  ${(traces / (prep.ms / 1000)).toFixed(0).padStart(8)} traces/s`,
  );
  log(
    `  auto-pick         ${auto.ms.toFixed(0).padStart(7)} ms  ${(traces / (auto.ms / 1000)).toFixed(0).padStart(8)} traces/s  (target: 2,000-trace survey < 1,500 ms)`,
  );
  log(`  derive            ${der.ms.toFixed(1).padStart(7)} ms`);
  return {
    prep: prep.value,
    auto: auto.value,
    derived: der.value,
    times: { io: io.ms, prepare: prep.ms, autoPick: auto.ms, derive: der.ms },
    traces,
    mb,
  };
}

const METHODS: IntervalMethod[] = ['xcorr', 'phase', 'onset', 'peak', 'trough', 'zero-crossing'];

function accuracy(res: SynthResult, run: ReturnType<typeof runSurvey>, periodS: number) {
  const byRecord = new Map(res.survey.records.map((r) => [r.recordId, r]));
  const keyOf = (recordId: string, channel: number) => {
    const ch = byRecord.get(recordId)?.channels.find((c) => c.channel === channel);
    if (!ch || ch.component !== 'H1') return null;
    return `${ch.receiver}@${byRecord.get(recordId)!.depthM!.toFixed(3)}:H1`;
  };
  const truth = trueStationTimes(res, keyOf);
  const dt = res.records[0].traces[0].sampleIntervalS;
  const out: Record<
    string,
    {
      medianErrMs: number;
      p90ErrMs: number;
      medianErrSamples: number;
      p90ErrSamples: number;
      cycleSkipShare: number;
      n: number;
    }
  > = {};
  for (const m of METHODS) {
    const errs: number[] = [];
    let skips = 0;
    for (const iv of run.derived.intervals) {
      if (iv.wave !== 'S' || iv.method !== m || iv.dtS === null) continue;
      const ta = truth.get(iv.stationA);
      const tb = truth.get(iv.stationB);
      if (ta === undefined || tb === undefined) continue;
      const e = Math.abs(iv.dtS - (tb - ta));
      errs.push(e);
      // A cycle skip: off by about a period of the pulse (more than half a period).
      if (e > periodS / 2) skips++;
    }
    if (!errs.length) continue;
    out[m] = {
      medianErrMs: quantile(errs, 0.5) * 1000,
      p90ErrMs: quantile(errs, 0.9) * 1000,
      medianErrSamples: quantile(errs, 0.5) / dt,
      p90ErrSamples: quantile(errs, 0.9) / dt,
      cycleSkipShare: skips / errs.length,
      n: errs.length,
    };
  }
  return out;
}

/** With attenuation: cumulative (onset-based minus correlation-based) travel time against depth. */
function drift(run: ReturnType<typeof runSurvey>) {
  const rows = run.derived.intervals.filter((r) => r.wave === 'S').sort((a, b) => a.topM - b.topM);
  const byKey = new Map<string, { onset?: number; xcorr?: number; depth: number; flagged: boolean }>();
  for (const r of rows) {
    const e = byKey.get(r.key) ?? { depth: r.bottomM, flagged: false };
    if (r.method === 'onset' && r.dtS !== null) e.onset = r.dtS;
    if (r.method === 'xcorr' && r.dtS !== null) e.xcorr = r.dtS;
    if (r.chosen && r.flags.includes('methods differ')) e.flagged = true;
    byKey.set(r.key, e);
  }
  let cum = 0;
  const points: { depthM: number; cumulativeMs: number }[] = [];
  let flagged = 0;
  let n = 0;
  for (const e of byKey.values()) {
    n++;
    if (e.flagged) flagged++;
    if (e.onset === undefined || e.xcorr === undefined) continue;
    cum += e.xcorr - e.onset;
    points.push({ depthM: e.depth, cumulativeMs: cum * 1000 });
  }
  const at = (z: number) =>
    points.reduce((best, p) => (Math.abs(p.depthM - z) < Math.abs(best.depthM - z) ? p : best), points[0]);
  return { points: [5, 10, 20, 30].map((z) => at(z)), flaggedShare: flagged / Math.max(1, n) };
}

/** One pair delay as the survey run does it (both traces already analysed), and the public call that analyses both first. */
function pairDelayMs(run: ReturnType<typeof runSurvey>): { inSurveyMs: number; withAnalysisMs: number } {
  const s = run.prep.stations.filter((x) => x.wave === 'S');
  const a = s[100].working;
  const b = s[110].working;
  const settings = defaultSettings();
  const req = {
    pairKey: intervalKey('S', a.stationKey, b.stationKey),
    wave: 'S' as const,
    a: a.stationKey,
    b: b.stationKey,
    minDelayS: 0.0005,
    maxDelayS: 0.02,
  };
  const pick = {
    onsetMethod: settings.picking.onsetMethod,
    staS: settings.picking.staS,
    ltaS: settings.picking.ltaS,
    staLtaThreshold: settings.picking.staLtaThreshold,
    phaseBandHz: null,
  };
  const aa = analyseStation(a, pick);
  const bb = analyseStation(b, pick);
  for (let i = 0; i < 50; i++) pairDelays(a, b, req, pick);
  const n = 500;
  const inner = time(() => {
    for (let i = 0; i < n; i++) pairDelaysFromAnalysis(aa, bb, req, pick);
  });
  const outer = time(() => {
    for (let i = 0; i < n; i++) pairDelays(a, b, req, pick);
  });
  return { inSurveyMs: inner.ms / n, withAnalysisMs: outer.ms / n };
}

function perEdit() {
  // 60 depths, 1 m steps: the per-edit path (derive: intervals, profile, stiffness, Vs30, Monte Carlo).
  const res = synthesizeSurvey(
    demoEarthModel(),
    { kind: 'downhole', holeId: 'DH1', depthsM: Array.from({ length: 60 }, (_, i) => 1 + i * 0.5), sourceOffsetM: 2 },
    {
      seed: 5,
      sampleIntervalS: 5e-5,
      samplesPerTrace: 4096,
      sFrequencyHz: 100,
      pFrequencyHz: 400,
      attenuation: true,
      snr: 25,
      maxTriggerDelayS: 1e-4,
    },
  );
  const settings = defaultSettings();
  const prep = prepare(res.survey, recordsMap(res.records), settings);
  const auto = autoPick(prep, settings);
  const edits = emptyEdits();
  const station = prep.stations.find((s) => s.wave === 'S' && s.depthM > 10)!;
  const t0 = auto.picks.find((p) => p.stationKey === station.key)!.timeS;
  derive(res.survey, prep, auto, edits, settings);
  const runs: number[] = [];
  const runsNoMc: number[] = [];
  for (let i = 0; i < 20; i++) {
    edits.picks[pickEditKey(station.key, 'S', 'onset')] = t0 + i * 5e-5;
    runs.push(time(() => derive(res.survey, prep, auto, edits, settings)).ms);
    runsNoMc.push(time(() => derive(res.survey, prep, auto, edits, settings, { monteCarlo: false })).ms);
  }
  const ivs = Array.from({ length: 60 }, (_, i) => ({
    topM: i * 0.5,
    bottomM: (i + 1) * 0.5,
    vsMps: 150 + 5 * i,
    vsSdMps: 10,
  }));
  const mc = time(() =>
    siteUncertainty(ivs, { draws: 10000, seed: 1, toDepthM: 30, rule: 'no-extrapolation', answers: {} }),
  );
  return {
    deriveMedianMs: quantile(runs, 0.5),
    deriveWithoutMcMedianMs: quantile(runsNoMc, 0.5),
    monteCarlo60Ms: mc.ms,
  };
}

/**
 * Delimited text reading: 60 files of 4,096 rows x 4 columns (time in ms + three components, as an
 * instrument's ASCII export of one downhole record). The reader (one pass, numeric fast path, typed
 * arrays) against the previous reader's path (one papaparse call per line, then each cell parsed into
 * per-row arrays) and against one papaparse call for the whole file (dynamicTyping).
 */
function textRead() {
  const res = synthesizeSurvey(
    demoEarthModel(),
    { kind: 'downhole', holeId: 'DH1', depthsM: Array.from({ length: 30 }, (_, i) => 1 + i), sourceOffsetM: 2 },
    {
      seed: 9,
      sampleIntervalS: 5e-5,
      samplesPerTrace: 4096,
      sFrequencyHz: 100,
      pFrequencyHz: 400,
      attenuation: true,
      snr: 25,
      maxTriggerDelayS: 0,
    },
  );
  const texts = res.records.slice(0, 60).map((r) => {
    const lines = ['time_ms,h1,h2,v'];
    const n = r.traces[0].samples.length;
    for (let i = 0; i < n; i++) {
      const t = (r.traces[0].delayS + i * r.traces[0].sampleIntervalS) * 1000;
      lines.push(
        `${t.toFixed(4)},${r.traces
          .slice(0, 3)
          .map((tr) => tr.samples[i].toPrecision(7))
          .join(',')}`,
      );
    }
    return lines.join('\n');
  });
  const best = (f: () => void) => {
    f();
    let m = Infinity;
    for (let k = 0; k < 3; k++) m = Math.min(m, time(f).ms);
    return m;
  };
  const reader = best(() => {
    for (const [i, t] of texts.entries()) readDelimitedText(t, `f${i}.csv`);
  });
  const perLine = best(() => {
    for (const t of texts) {
      const { rows, separator } = splitTextRows(t);
      const dc = allowsDecimalComma(separator);
      const out = rows.slice(1).map((r) => r.cells.map((c) => parseCell(c, dc)));
      if (out.length === 0) throw new Error('no rows');
    }
  });
  const wholeFile = best(() => {
    for (const t of texts) {
      const parsed = Papa.parse<number[]>(t, { dynamicTyping: true, skipEmptyLines: true });
      const rows = parsed.data.slice(1);
      const cols = Array.from({ length: 4 }, () => new Float64Array(rows.length));
      rows.forEach((r, i) => {
        for (let c = 0; c < 4; c++) cols[c][i] = r[c];
      });
    }
  });
  const mb = texts.reduce((s, t) => s + t.length, 0) / 1e6;
  return {
    files: texts.length,
    rows: 4096,
    megabytes: mb,
    readerMs: reader,
    perLinePapaparseMs: perLine,
    wholeFilePapaparseMs: wholeFile,
  };
}

function speedSections() {
  const tr = textRead();
  log(
    `Text reading, ${tr.files} files x ${tr.rows} rows x 4 columns (${tr.megabytes.toFixed(1)} MB): reader ${tr.readerMs.toFixed(0)} ms; previous path (papaparse per line + per-row arrays) ${tr.perLinePapaparseMs.toFixed(0)} ms; one papaparse call per file ${tr.wholeFilePapaparseMs.toFixed(0)} ms`,
  );
  if (process.argv.includes('--text-only')) process.exit(0);

  const clean = denseDownhole(false);
  const cleanRun = runSurvey('Downhole, attenuation off', clean);
  const acc = accuracy(clean, cleanRun, 1 / 100);
  log('  accuracy of S interval delays against the model (attenuation off):');
  for (const [m, a] of Object.entries(acc)) {
    log(
      `    ${m.padEnd(14)} median ${a.medianErrMs.toFixed(4)} ms (${a.medianErrSamples.toFixed(2)} samples)  p90 ${a.p90ErrMs.toFixed(4)} ms (${a.p90ErrSamples.toFixed(2)} samples)  cycle skips ${(a.cycleSkipShare * 100).toFixed(2)}%  n=${a.n}`,
    );
  }
  const att = denseDownhole(true);
  const attRun = runSurvey('Downhole, attenuation on', att);
  const accAtt = accuracy(att, attRun, 1 / 100);
  const dr = drift(attRun);
  log('  with attenuation: cumulative (xcorr - onset) interval time against depth (pulse broadening):');
  for (const p of dr.points) log(`    to ${p.depthM.toFixed(1)} m: ${p.cumulativeMs.toFixed(3)} ms`);
  log(
    `    intervals flagged "methods differ": ${(dr.flaggedShare * 100).toFixed(1)}%; survey-level drift ${attRun.derived.drift ? `${(attRun.derived.drift.share * 100).toFixed(2)}% of travel time, ${attRun.derived.drift.significant ? 'reported (METHOD_DRIFT)' : 'not significant'}` : 'n/a'}`,
  );
  log(
    `    same figures with attenuation off: drift ${cleanRun.derived.drift ? `${(cleanRun.derived.drift.share * 100).toFixed(2)}%, ${cleanRun.derived.drift.significant ? 'reported' : 'not reported'}` : 'n/a'}`,
  );
  for (const [m, a] of Object.entries(accAtt))
    log(
      `    ${m.padEnd(14)} median ${a.medianErrMs.toFixed(4)} ms  p90 ${a.p90ErrMs.toFixed(4)} ms  cycle skips ${(a.cycleSkipShare * 100).toFixed(2)}%`,
    );
  const xh = synthesizeSurvey(demoEarthModel(), demoCrossholeGeometry(), demoCrossholeOptions());
  const xhRun = runSurvey('Crosshole (demo geometry)', xh);
  const pd = pairDelayMs(cleanRun);
  log(
    `\nOne pair delay (xcorr, 4,096-sample traces): ${pd.inSurveyMs.toFixed(3)} ms as in the survey run (target < 0.2 ms); ${pd.withAnalysisMs.toFixed(3)} ms including the analysis of both traces`,
  );
  const pe = perEdit();
  log(
    `Per edit on a 60-depth survey: derive ${pe.deriveMedianMs.toFixed(1)} ms with the Monte Carlo, ${pe.deriveWithoutMcMedianMs.toFixed(1)} ms without (target < 50 ms); Monte Carlo 60 intervals x 10,000 draws ${pe.monteCarlo60Ms.toFixed(1)} ms (target < 50 ms)`,
  );

  return { tr, cleanRun, acc, attRun, accAtt, dr, xhRun, pd, pe };
}

const speed = quick || bankOnly ? null : speedSections();
const bank = bankReport(bankSeeds);
printBank(bank, log);
// Stated site-class probabilities against the model's class on a bank of forward-model surveys
// (held-out seeds 7000-7011; thresholds were tuned on seeds 500-515, scripts/measure-calibration.ts).
const classCal = quick ? null : classCalibration(Array.from({ length: 12 }, (_, i) => 7000 + i));
if (classCal)
  log(
    `Class calibration: ${classCal.surveys} surveys, ${classCal.statedAtLeast90} statements at >= 90%, right in ${(classCal.rightWhenStatedAtLeast90 * 100).toFixed(1)}% (goal >= 90%)`,
  );

// The command line against the numpy/scipy anchor and the browser figures (full runs only).
const anchor = speed ? cliVsScipy() : null;
if (anchor?.cliVsScipyRatio) {
  log('\nCommand line vs a numpy/scipy pipeline (CPU time, median of alternating runs; target <= 1.0):');
  for (const [k, v] of Object.entries(anchor.cliVsScipyRatio)) {
    const c = anchor.cpuMs![k as SurveyName];
    const a = anchor.agreement![k as SurveyName];
    log(
      `  ${k.padEnd(13)} ratio ${v.toFixed(2)}  (cli ${c.cli} ms, scipy ${c.scipy} ms; intervals within 1%: ${a.within1Percent}/${a.intervals}, max difference ${(a.maxRelDiff * 100).toFixed(3)}%)`,
    );
  }
} else if (anchor) log(`\n${anchor.note}`);
const browser = !speed || process.argv.includes('--no-browser') ? null : browserFigures();
if (browser) {
  log(
    `\nBrowser: first paint ${browser.firstPaintMs} ms; demo click to profile ${browser.demoToProfileMs} ms; 60 files dropped to profile ${browser.dropToProfileMs} ms (target < 1,000 ms); peak memory ${browser.peakMemoryMb} MB${browser.note ? ` (${browser.note})` : ''}`,
  );
}

if (json && !speed) {
  process.stdout.write(
    JSON.stringify(
      {
        bank,
        calibration: bank.calibration,
        defaultMethod: bank.defaultMethod,
        fieldQ: bank.qRecovery,
        classCalibration: classCal,
      },
      null,
      1,
    ) + '\n',
  );
} else if (json && speed) {
  const { tr, cleanRun, xhRun, pd, pe, acc, accAtt, dr, attRun } = speed;
  const stage = (ms: number, traces: number) => ({
    ms: Math.round(ms * 100) / 100,
    tracesPerS: Math.round(traces / (ms / 1000)),
  });
  const doc = {
    stages: {
      seg2WriteRead: stage(cleanRun.times.io, cleanRun.traces),
      prepare: stage(cleanRun.times.prepare, cleanRun.traces),
      autoPick: stage(cleanRun.times.autoPick, cleanRun.traces),
      derive: stage(cleanRun.times.derive, cleanRun.traces),
      crossholeAutoPick: stage(xhRun.times.autoPick, xhRun.traces),
    },
    textRead: tr,
    traces: cleanRun.traces,
    autoPickMs: cleanRun.times.autoPick,
    pairDelayMs: pd.inSurveyMs,
    pairDelayWithAnalysisMs: pd.withAnalysisMs,
    deriveMs60Depths: pe.deriveMedianMs,
    deriveWithoutMonteCarloMs60Depths: pe.deriveWithoutMcMedianMs,
    monteCarloMs60Intervals: pe.monteCarlo60Ms,
    accuracy: acc,
    attenuationOn: {
      accuracy: accAtt,
      cumulativeXcorrMinusOnsetMs: dr.points,
      flaggedMethodsDifferShare: dr.flaggedShare,
      driftShare: attRun.derived.drift?.share ?? null,
      driftReported: attRun.derived.drift?.significant ?? false,
    },
    attenuationOffDriftReported: cleanRun.derived.drift?.significant ?? false,
    bank,
    calibration: bank.calibration,
    defaultMethod: bank.defaultMethod,
    fieldQ: bank.qRecovery,
    classCalibration: classCal,
    cliVsScipyRatio: anchor?.cliVsScipyRatio ?? null,
    cliVsScipy: anchor
      ? { cpuMs: anchor.cpuMs, agreement: anchor.agreement, rounds: anchor.rounds, note: anchor.note }
      : null,
    browser: browser
      ? {
          firstPaintMs: browser.firstPaintMs,
          demoToProfileMs: browser.demoToProfileMs,
          dropToProfileMs: browser.dropToProfileMs,
          peakMemoryMb: browser.peakMemoryMb,
          ...(browser.note ? { note: browser.note } : {}),
          detail: browser.detail,
        }
      : { note: 'skipped (--no-browser)' },
  };
  process.stdout.write(JSON.stringify(doc, null, 1) + '\n');
}
