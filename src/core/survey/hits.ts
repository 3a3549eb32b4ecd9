/**
 * Hit directions and the horizontal rotation, solved together from the waveforms.
 *
 * Physics (common practice for reversed-hit surveys; see docs/setup-checks.md):
 * - Two records at one depth whose horizontal motions point the same way are repeats, opposite ways
 *   reversals. The vector correlation sum_t (H1 H1' + H2 H2') / sqrt(E E') does not depend on how the
 *   probe is turned, so it gives the relative hit signs at a depth without knowing the rotation.
 *   Crosshole (vertical hits): the same on the vertical channel.
 * - The shear axis comes from the 2x2 covariance of the horizontals in the shear window (rotation.ts),
 *   known modulo 180 degrees. Turning the axis by 180 degrees and swapping left/right at that depth are
 *   one and the same unknown: one binary state per depth.
 * - The states are chosen together over the depths (dynamic programming on the depth chain) so that
 *   the "left" direction turns smoothly from depth to depth (the probe turns, it does not jump), and,
 *   where the P wave loads the horizontals (shallow, oblique rays), so that "left" stays at a fixed angle
 *   to the horizontal P motion, which points away from the source whatever the probe's azimuth.
 * - The waveform polarity (which sign of the projected pulse is "positive") is fixed by aligning every
 *   depth's pulse with a survey-wide template, so one noisy depth cannot flip the depths below it.
 * Hits come out right up to one global swap, which the user flips in one action (hitSwap).
 */
import type { HitDirection } from '../model';
import {
  accumulateCov,
  burstWindow,
  principalAxis,
  rotateHorizontals,
  smoothEnvelope,
  wrapPi,
  zeroCov,
} from './rotation';

export interface ThreeComponent {
  h1: ArrayLike<number>;
  h2: ArrayLike<number>;
  v: ArrayLike<number>;
}

export interface HitRecordInput {
  recordId: string;
  /** Hit direction from a higher-precedence source (user, log, file name, header); null = to infer. */
  givenHit: HitDirection | null;
  /** Conditioned traces of this record per receiver slot (same sampling within a slot). */
  bySlot: Record<string, ThreeComponent>;
}

export interface DepthGroupInput {
  /** Logged depth of the records, m (two receivers: the upper receiver's depth). */
  depthM: number;
  records: HitRecordInput[];
  /** Per slot: sample-index windows where S and P may arrive (from geometry and the velocity ranges). */
  slots: { slot: string; searchS: [number, number]; searchP: [number, number] | null }[];
}

export interface SolveOptions {
  /** 'horizontal': shear on the horizontals (horizontal beam, downhole); 'vertical': shear on V (crosshole). */
  mode: 'horizontal' | 'vertical';
  sampleIntervalS: number;
  /** One global left/right (or up/down) swap of the hits inferred from data. */
  hitSwap: boolean;
  /** User-fixed azimuths of the "first direction" motion, rad, keyed `${slot}@${depthM.toFixed(3)}`. */
  fixedAzimuthRad?: ReadonlyMap<string, number>;
}

export interface ChannelEnergy {
  h1: number;
  h2: number;
  v: number;
}

export interface SlotSolution {
  slot: string;
  /** Azimuth (rad, receiver frame: 0 along H1, +pi/2 along H2) of the first hit direction's motion; null in vertical mode. */
  azimuthRad: number | null;
  azimuthSource: 'data' | 'user';
  /** Linearity of the horizontal motion in the shear window (0..1). */
  linearity: number;
  /** Shear window used, sample indices [from, to). */
  sWindow: [number, number] | null;
  /** Shear energy per channel in the shear window (reversing part where reversals exist). */
  sEnergy: ChannelEnergy;
  /** P energy per channel in the P window (common part of the hits), null when no P window was found. */
  pEnergy: ChannelEnergy | null;
  /** Shear working signal of each record (the rotated horizontal, or V), keyed by record id. */
  projected: Map<string, Float64Array>;
  /** Azimuth of the horizontal P motion away from the source, rad (receiver frame), and its weight. */
  pRadialRad: number | null;
  pWeight: number;
}

export interface DepthSolution {
  depthM: number;
  hits: Map<string, HitDirection>;
  /** 'given' when every record had a given hit; else 'data'. */
  hitSource: 'given' | 'data';
  /** 0..1: agreement of the records with the depth's consensus, with the template and with the neighbours. */
  confidence: number;
  /** Records that match neither a repeat nor a reversal of the others (|agreement| < 0.3). */
  unexplainedRecords: string[];
  /** Pairs of given hits the data contradict (same direction given, reversed in the data, or the opposite). */
  contradictions: number;
  /** Whether both directions are present among the records. */
  reversedPair: boolean;
  slots: SlotSolution[];
}

const FIRST: Record<SolveOptions['mode'], [HitDirection, HitDirection]> = {
  horizontal: ['left', 'right'],
  vertical: ['down', 'up'],
};

function dotRange(a: ArrayLike<number>, b: ArrayLike<number>, from: number, to: number): number {
  let s = 0;
  for (let i = from; i < to; i++) s += a[i] * b[i];
  return s;
}

function componentsOf(t: ThreeComponent, mode: SolveOptions['mode']): ArrayLike<number>[] {
  return mode === 'horizontal' ? [t.h1, t.h2] : [t.v];
}

/** Signs s_i in {+1,-1} (s_0 = +1) maximising sum_{i<j} c_ij s_i s_j; exhaustive up to 12 records, greedy beyond. */
export function relativeSigns(c: number[][]): number[] {
  const n = c.length;
  if (n <= 1) return n ? [1] : [];
  if (n <= 12) {
    let best = -Infinity;
    let bestMask = 0;
    for (let mask = 0; mask < 1 << (n - 1); mask++) {
      const s = (i: number) => (i === 0 ? 1 : (mask >> (i - 1)) & 1 ? -1 : 1);
      let score = 0;
      for (let i = 0; i < n; i++) for (let j = i + 1; j < n; j++) score += c[i][j] * s(i) * s(j);
      if (score > best) {
        best = score;
        bestMask = mask;
      }
    }
    return Array.from({ length: n }, (_, i) => (i === 0 ? 1 : (bestMask >> (i - 1)) & 1 ? -1 : 1));
  }
  const s = [1];
  for (let i = 1; i < n; i++) {
    let acc = 0;
    for (let j = 0; j < i; j++) acc += c[i][j] * s[j];
    s.push(acc >= 0 ? 1 : -1);
  }
  return s;
}

interface Work {
  input: DepthGroupInput;
  sigma: number[];
  /** Relative signs from the data alone, and the pairwise vector correlations. */
  dataSigma: number[];
  corr: number[][];
  agreement: number[];
  slotWork: {
    slot: string;
    a0: number;
    linearity: number;
    win: [number, number] | null;
    peak: number;
    consensus: Float64Array;
    sEnergy: ChannelEnergy;
    pEnergy: ChannelEnergy | null;
    pRadial: number | null;
    pWeight: number;
    polarity: number;
    templateR: number;
  }[];
}

const CHANNELS = ['h1', 'h2', 'v'] as const;

function energyOf(recs: ThreeComponent[], from: number, to: number, mean: ThreeComponent | null): ChannelEnergy {
  const e = { h1: 0, h2: 0, v: 0 };
  for (const r of recs)
    for (const k of CHANNELS) {
      const x = r[k];
      const m = mean ? mean[k] : null;
      let acc = e[k];
      for (let i = from; i < to; i++) {
        const d = x[i] - (m ? m[i] : 0);
        acc += d * d;
      }
      e[k] = acc;
    }
  return e;
}

function meanOf(recs: ThreeComponent[]): ThreeComponent {
  const n = recs[0].h1.length;
  const m = { h1: new Float64Array(n), h2: new Float64Array(n), v: new Float64Array(n) };
  for (const r of recs)
    for (const k of CHANNELS) {
      const mk = m[k];
      const rk = r[k];
      for (let i = 0; i < n; i++) mk[i] += rk[i];
    }
  for (const k of CHANNELS) {
    const mk = m[k];
    for (let i = 0; i < n; i++) mk[i] /= recs.length;
  }
  return m;
}

/** Energy envelope over records and channels, of the deviations from the mean where that holds the reversing wave. */
function shearWindow(
  recs: ThreeComponent[],
  search: [number, number],
  halfWidth: number,
): { win: [number, number] | null; peak: number; mean: ThreeComponent | null; meanAll: ThreeComponent | null } {
  const n = recs[0].h1.length;
  const [a, b] = [Math.max(0, search[0]), Math.min(n, search[1])];
  if (b - a < 4) return { win: null, peak: -1, mean: null, meanAll: null };
  const mean = recs.length > 1 ? meanOf(recs) : null;
  const envDev = new Float64Array(n);
  const envRaw = new Float64Array(n);
  for (const r of recs)
    for (const k of CHANNELS) {
      const x = r[k];
      const m = mean ? mean[k] : null;
      for (let i = a; i < b; i++) {
        envRaw[i] += x[i] * x[i];
        if (m) envDev[i] += (x[i] - m[i]) ** 2;
      }
    }
  let sd = 0;
  let sr = 0;
  for (let i = a; i < b; i++) {
    sd += envDev[i];
    sr += envRaw[i];
  }
  const useDev = mean !== null && sd > 0.2 * sr;
  const env = smoothEnvelope(useDev ? envDev : envRaw, halfWidth);
  const w = burstWindow(env, a, b);
  return w
    ? { win: [w.fromIdx, w.toIdx], peak: w.peakIdx, mean: useDev ? mean : null, meanAll: mean }
    : { win: null, peak: -1, mean: null, meanAll: mean };
}

/** Normalised cross-correlation of a template (centred at tPeak) with x (centred at xPeak) at the lag of largest |r|. */
function alignSign(
  template: ArrayLike<number>,
  tPeak: number,
  x: ArrayLike<number>,
  xPeak: number,
  half: number,
): number {
  const maxLag = Math.max(1, Math.round(half / 2));
  let best = 0;
  for (let lag = -maxLag; lag <= maxLag; lag++) {
    let s = 0;
    let et = 0;
    let ex = 0;
    for (let j = -half; j <= half; j++) {
      const ti = tPeak + j;
      const xi = xPeak + j + lag;
      if (ti < 0 || ti >= template.length || xi < 0 || xi >= x.length) continue;
      s += template[ti] * x[xi];
      et += template[ti] * template[ti];
      ex += x[xi] * x[xi];
    }
    const r = et > 0 && ex > 0 ? s / Math.sqrt(et * ex) : 0;
    if (Math.abs(r) > Math.abs(best)) best = r;
  }
  return best;
}

/**
 * Solves hits and rotation for every depth of one survey. Depth groups may come in any order; the
 * chain follows increasing depth. Pure: inputs are never modified.
 */
export function solveHitsAndRotation(groups: readonly DepthGroupInput[], o: SolveOptions): DepthSolution[] {
  const order = groups.map((g, i) => ({ g, i })).sort((x, y) => x.g.depthM - y.g.depthM);
  const halfWidth = Math.max(1, Math.round(0.001 / o.sampleIntervalS));
  const works: Work[] = order.map(({ g }) => solveDepthLocal(g, o, halfWidth));
  settlePolarity(works, halfWidth);
  const states = chooseStates(works, o);
  const out: DepthSolution[] = works.map((w, k) => finish(w, states[k], o));
  // Neighbour margin enters the confidence of data-inferred hits.
  const back = new Array<DepthSolution>(groups.length);
  order.forEach(({ i }, k) => {
    back[i] = out[k];
  });
  return back;
}

function solveDepthLocal(g: DepthGroupInput, o: SolveOptions, halfWidth: number): Work {
  const n = g.records.length;
  // Relative signs: from given hits when every record has one, else from the vector correlation.
  const c: number[][] = Array.from({ length: n }, () => new Array<number>(n).fill(0));
  const windows = new Map<string, ReturnType<typeof shearWindow>>();
  for (const s of g.slots) {
    const recs = g.records.map((r) => r.bySlot[s.slot]).filter(Boolean);
    if (recs.length !== n) continue;
    windows.set(s.slot, shearWindow(recs, s.searchS, halfWidth));
  }
  for (let i = 0; i < n; i++)
    for (let j = i + 1; j < n; j++) {
      let num = 0;
      let ei = 0;
      let ej = 0;
      for (const s of g.slots) {
        const w = windows.get(s.slot)?.win;
        if (!w) continue;
        const ci = componentsOf(g.records[i].bySlot[s.slot], o.mode);
        const cj = componentsOf(g.records[j].bySlot[s.slot], o.mode);
        for (let q = 0; q < ci.length; q++) {
          num += dotRange(ci[q], cj[q], w[0], w[1]);
          ei += dotRange(ci[q], ci[q], w[0], w[1]);
          ej += dotRange(cj[q], cj[q], w[0], w[1]);
        }
      }
      c[i][j] = c[j][i] = ei > 0 && ej > 0 ? num / Math.sqrt(ei * ej) : 0;
    }
  const [first] = FIRST[o.mode];
  const allGiven =
    n > 0 &&
    g.records.every(
      (r) => r.givenHit === 'left' || r.givenHit === 'right' || r.givenHit === 'up' || r.givenHit === 'down',
    );
  const dataSigma = relativeSigns(c);
  const sigma = allGiven ? g.records.map((r) => (r.givenHit === first ? 1 : -1)) : dataSigma;
  // Agreement of each record with the others under the data's own signs (rotation-free).
  const agreement = dataSigma.map((si, i) => {
    if (n === 1) return 1;
    let acc = 0;
    for (let j = 0; j < n; j++) if (j !== i) acc += c[i][j] * si * dataSigma[j];
    return acc / (n - 1);
  });
  const slotWork: Work['slotWork'] = [];
  for (const s of g.slots) {
    const recs = g.records.map((r) => r.bySlot[s.slot]);
    const sw = windows.get(s.slot);
    if (!sw || recs.some((r) => !r)) continue;
    const len = recs[0].h1.length;
    const win = sw.win;
    let a0 = 0;
    let linearity = 0;
    if (o.mode === 'horizontal' && win) {
      const cov = zeroCov();
      recs.forEach((r, i) => {
        // Deviation from the mean (reversing part) where reversals exist: P and common noise drop out.
        if (sw.mean) {
          const m = sw.mean;
          const d1 = new Float64Array(len);
          const d2 = new Float64Array(len);
          for (let t = 0; t < len; t++) {
            d1[t] = r.h1[t] - m.h1[t];
            d2[t] = r.h2[t] - m.h2[t];
          }
          accumulateCov(cov, d1, d2, win[0], win[1]);
        } else accumulateCov(cov, r.h1, r.h2, win[0], win[1]);
        void i;
      });
      ({ azimuthRad: a0, linearity } = principalAxis(cov));
    } else if (o.mode === 'vertical') linearity = 1;
    const consensus = new Float64Array(len);
    recs.forEach((r, i) => {
      const p = o.mode === 'horizontal' ? rotateHorizontals(r.h1, r.h2, a0) : r.v;
      for (let t = 0; t < len; t++) consensus[t] += (sigma[i] * p[t]) / n;
    });
    const sEnergy = win ? energyOf(recs, win[0], win[1], sw.mean) : { h1: 0, h2: 0, v: 0 };
    // P window: strongest burst of the common part before the shear window.
    let pEnergy: ChannelEnergy | null = null;
    let pRadial: number | null = null;
    let pWeight = 0;
    if (s.searchP && win) {
      // The mean of the records (the one shearWindow made when there are several: the same figures).
      const m = recs.length > 1 ? (sw.meanAll ?? meanOf(recs)) : recs[0];
      const env = new Float64Array(len);
      const pEnd = Math.min(win[0], s.searchP[1]);
      for (const k of ['h1', 'h2', 'v'] as const) for (let t = s.searchP[0]; t < pEnd; t++) env[t] += m[k][t] ** 2;
      const pw = pEnd - s.searchP[0] > 4 ? burstWindow(smoothEnvelope(env, halfWidth), s.searchP[0], pEnd, 0.1) : null;
      if (pw) {
        pEnergy = energyOf([m], pw.fromIdx, pw.toIdx, null);
        if (o.mode === 'horizontal') {
          const cov = accumulateCov(zeroCov(), m.h1, m.h2, pw.fromIdx, pw.toIdx);
          let ax = principalAxis(cov).azimuthRad;
          const ph = rotateHorizontals(m.h1, m.h2, ax);
          const hv = dotRange(ph, m.v, pw.fromIdx, pw.toIdx);
          const hh = dotRange(ph, ph, pw.fromIdx, pw.toIdx);
          const vv = dotRange(m.v, m.v, pw.fromIdx, pw.toIdx);
          // Horizontal P in phase with the (downward) vertical P points away from the source.
          if (hv < 0) ax += Math.PI;
          const rho = hh > 0 && vv > 0 ? Math.abs(hv) / Math.sqrt(hh * vv) : 0;
          pRadial = wrapPi(ax);
          pWeight = Math.max(0, rho - 0.3) / 0.7;
        }
      }
    }
    slotWork.push({
      slot: s.slot,
      a0,
      linearity,
      win,
      peak: sw.peak,
      consensus,
      sEnergy,
      pEnergy,
      pRadial,
      pWeight,
      polarity: 1,
      templateR: 0,
    });
  }
  return { input: g, sigma, dataSigma, corr: c, agreement, slotWork };
}

/** Waveform polarity of each depth's consensus pulse against a survey-wide template (three passes). */
function settlePolarity(works: Work[], halfWidth: number): void {
  const items = works.flatMap((w) => w.slotWork.filter((s) => s.win && s.peak >= 0));
  if (!items.length) return;
  const widths = items.map((s) => s.win![1] - s.win![0]).sort((a, b) => a - b);
  const half = Math.max(4 * halfWidth, Math.round(widths[Math.floor(widths.length / 2)] / 2));
  // Start from the strongest pulse.
  let ref = items[0];
  let best = -1;
  for (const s of items) {
    let e = 0;
    for (let t = s.win![0]; t < s.win![1]; t++) e += s.consensus[t] ** 2;
    if (e > best) {
      best = e;
      ref = s;
    }
  }
  let template = Float64Array.from({ length: 2 * half + 1 }, (_, j) => ref.consensus[ref.peak - half + j] ?? 0);
  for (let pass = 0; pass < 3; pass++) {
    const next = new Float64Array(2 * half + 1);
    for (const s of items) {
      const r = alignSign(template, half, s.consensus, s.peak, half);
      s.polarity = r >= 0 ? 1 : -1;
      s.templateR = Math.abs(r);
      // Stack aligned at the envelope peak; normalised so every depth counts alike.
      let e = 0;
      for (let j = -half; j <= half; j++) e += (s.consensus[s.peak + j] ?? 0) ** 2;
      const k = e > 0 ? s.polarity / Math.sqrt(e) : 0;
      for (let j = -half; j <= half; j++) next[j + half] += k * (s.consensus[s.peak + j] ?? 0);
    }
    template = next;
  }
  // Global sign: the template's first strong lobe positive (the source pulse's first motion, common practice).
  let peakAbs = 0;
  for (const x of template) peakAbs = Math.max(peakAbs, Math.abs(x));
  const firstStrong = template.find((x) => Math.abs(x) >= 0.5 * peakAbs) ?? 1;
  if (firstStrong < 0) for (const s of items) s.polarity = -s.polarity;
}

/** Azimuth of the first direction's motion at depth k for state g (+1 keeps the relative signs). */
function azimuthFor(s: Work['slotWork'][number], g: number): number {
  return wrapPi(s.a0 + (s.polarity * g > 0 ? 0 : Math.PI));
}

function unaryCost(w: Work, g: number, o: SolveOptions): number {
  const [first] = FIRST[o.mode];
  let cost = 0;
  // Given hits fix the state.
  const given = w.input.records.findIndex((r) => r.givenHit !== null && r.givenHit !== 'none');
  if (given >= 0) {
    const want = w.input.records[given].givenHit === first ? 1 : -1;
    if (g * w.sigma[given] !== want) cost += 1e6;
  }
  for (const s of w.slotWork) {
    if (o.mode === 'vertical') {
      cost += s.polarity * g > 0 ? 0 : 5 * s.templateR + 1e-3;
      continue;
    }
    const fixed = o.fixedAzimuthRad?.get(`${s.slot}@${w.input.depthM.toFixed(3)}`);
    if (fixed !== undefined) cost += Math.cos(wrapPi(azimuthFor(s, g) - fixed)) > 0 ? 0 : 1e5;
    // "Left" stays 90 degrees clockwise of the horizontal P motion away from the source (a fixed
    // geometric relation for a proper receiver frame; its mirror is the one global swap).
    if (s.pRadial !== null && s.pWeight > 0)
      cost -= 2 * s.pWeight * Math.cos(wrapPi(azimuthFor(s, g) - (s.pRadial - Math.PI / 2)));
  }
  return cost;
}

function pairCost(a: Work, ga: number, b: Work, gb: number, o: SolveOptions): number {
  if (o.mode === 'vertical') return 0;
  let cost = 0;
  for (const sa of a.slotWork) {
    const sb = b.slotWork.find((x) => x.slot === sa.slot);
    if (!sb || !sa.win || !sb.win) continue;
    cost -= sa.linearity * sb.linearity * Math.cos(wrapPi(azimuthFor(sa, ga) - azimuthFor(sb, gb)));
  }
  return cost;
}

/** Viterbi over the depth chain with two states per depth. */
function chooseStates(works: Work[], o: SolveOptions): number[] {
  const K = works.length;
  if (!K) return [];
  const G = [1, -1];
  const cost: number[][] = [G.map((g) => unaryCost(works[0], g, o))];
  const from: number[][] = [[0, 0]];
  for (let k = 1; k < K; k++) {
    const row: number[] = [];
    const arg: number[] = [];
    for (const g of G) {
      let best = Infinity;
      let bi = 0;
      G.forEach((gp, pi) => {
        const c = cost[k - 1][pi] + pairCost(works[k - 1], gp, works[k], g, o);
        if (c < best) {
          best = c;
          bi = pi;
        }
      });
      row.push(best + unaryCost(works[k], g, o));
      arg.push(bi);
    }
    cost.push(row);
    from.push(arg);
  }
  const states = new Array<number>(K);
  let s = cost[K - 1][0] <= cost[K - 1][1] ? 0 : 1;
  for (let k = K - 1; k >= 0; k--) {
    states[k] = G[s];
    s = from[k][s];
  }
  // Margins: cost of flipping one depth alone, used in the confidence.
  works.forEach((w, k) => {
    const g = states[k];
    const local = (x: number) =>
      unaryCost(w, x, o) +
      (k > 0 ? pairCost(works[k - 1], states[k - 1], w, x, o) : 0) +
      (k + 1 < K ? pairCost(w, x, works[k + 1], states[k + 1], o) : 0);
    (w as Work & { margin?: number }).margin = local(-g) - local(g);
  });
  return states;
}

function finish(w: Work, g: number, o: SolveOptions): DepthSolution {
  const [first, second] = FIRST[o.mode];
  const swap = o.hitSwap ? -1 : 1;
  const givenAll = w.input.records.every((r) => r.givenHit !== null && r.givenHit !== 'none');
  const anyGiven = w.input.records.some((r) => r.givenHit !== null && r.givenHit !== 'none');
  const hits = new Map<string, HitDirection>();
  w.input.records.forEach((r, i) => {
    const data = w.sigma[i] * g * (anyGiven ? 1 : swap) > 0 ? first : second;
    hits.set(r.recordId, r.givenHit && r.givenHit !== 'none' ? r.givenHit : data);
  });
  let contradictions = 0;
  const recs = w.input.records;
  for (let i = 0; i < recs.length; i++)
    for (let j = i + 1; j < recs.length; j++) {
      const gi = recs[i].givenHit;
      const gj = recs[j].givenHit;
      if (!gi || !gj || gi === 'none' || gj === 'none') continue;
      const sameGiven = gi === gj;
      const sameData = w.corr[i][j] > 0;
      if (sameGiven !== sameData && Math.abs(w.corr[i][j]) > 0.5) contradictions++;
    }
  const slots: SlotSolution[] = w.slotWork.map((s) => {
    const az = o.mode === 'horizontal' ? wrapPi(azimuthFor(s, g) + (o.hitSwap && !anyGiven ? Math.PI : 0)) : null;
    const fixed = o.fixedAzimuthRad?.get(`${s.slot}@${w.input.depthM.toFixed(3)}`);
    const useAz = fixed ?? az;
    const projected = new Map<string, Float64Array>();
    for (const r of w.input.records) {
      const t = r.bySlot[s.slot];
      projected.set(r.recordId, useAz !== null ? rotateHorizontals(t.h1, t.h2, useAz) : Float64Array.from(t.v));
    }
    return {
      slot: s.slot,
      azimuthRad: useAz,
      azimuthSource: fixed !== undefined ? 'user' : 'data',
      linearity: s.linearity,
      sWindow: s.win,
      sEnergy: s.sEnergy,
      pEnergy: s.pEnergy,
      projected,
      pRadialRad: s.pRadial,
      pWeight: s.pWeight,
    };
  });
  const minAgree = Math.min(1, ...w.agreement.map((a) => Math.max(0, a)));
  const tmpl = w.slotWork.length ? Math.max(...w.slotWork.map((s) => s.templateR)) : 0;
  const margin = (w as Work & { margin?: number }).margin ?? 0;
  const marginFactor = givenAll ? 1 : Math.max(0, Math.min(1, margin / 0.5));
  const values = [...hits.values()];
  return {
    depthM: w.input.depthM,
    hits,
    hitSource: givenAll ? 'given' : 'data',
    confidence: Math.max(0, Math.min(1, minAgree * Math.min(1, tmpl / 0.6) * marginFactor)),
    unexplainedRecords:
      recs.length > 1 ? recs.filter((_, i) => Math.abs(w.agreement[i]) < 0.3).map((r) => r.recordId) : [],
    contradictions,
    reversedPair: values.includes(first) && values.includes(second),
    slots,
  };
}
