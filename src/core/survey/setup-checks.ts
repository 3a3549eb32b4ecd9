/**
 * Set-up checks, run with every derive: does the way the files were placed (depths, hits, component
 * labels) agree with what the waveforms say? A blocking problem withholds Vs30 and the site classes
 * (the profile stays for inspection); a warning is shown beside the results. The rules and their
 * thresholds are in docs/setup-checks.md (tuned on training seeds of the forward-model variants).
 */
import type { Survey } from '../model';
import type { Settings } from '../settings';
import type { IntervalValue } from '../velocity/intervals';
import type { DepthOrientation } from './orientation';

export interface SetupProblem {
  code: string;
  message: string;
  /** How many depths, records or intervals the problem touches. */
  count: number;
  /** What the user does about it. */
  fix: string;
  blocking: boolean;
}

/** Flags of an interval value that mark it doubtful (counted by the many-flagged warning). */
export const DOUBTFUL_INTERVAL_FLAGS = [
  'low correlation',
  'at lag bound',
  'outside lag bound',
  'methods differ',
  'slow?',
  'fast?',
];

/** Share of the checked receiver depths at which a component check must fail before it blocks. */
export const LABEL_BLOCK_SHARE = 0.3;

function plural(n: number, one: string, many = `${one}s`): string {
  return `${n} ${n === 1 ? one : many}`;
}

/** Depth steps larger than 1.75 times both neighbouring steps (or the typical step at the ends): depths missing in the middle. */
export function missingDepthGaps(depthsM: readonly number[]): { fromM: number; toM: number }[] {
  const d = [...new Set(depthsM.map((x) => Math.round(x * 1000) / 1000))].sort((a, b) => a - b);
  if (d.length < 4) return [];
  const steps = d.slice(1).map((x, i) => x - d[i]);
  const sorted = [...steps].sort((a, b) => a - b);
  const typical = sorted[Math.floor(sorted.length / 2)];
  const gaps: { fromM: number; toM: number }[] = [];
  steps.forEach((s, i) => {
    const prev = i > 0 ? steps[i - 1] : typical;
    const next = i + 1 < steps.length ? steps[i + 1] : typical;
    if (s > 1.75 * prev + 1e-6 && s > 1.75 * next + 1e-6) gaps.push({ fromM: d[i], toM: d[i + 1] });
  });
  return gaps;
}

export interface SetupCheckInput {
  survey: Survey;
  orientation: readonly DepthOrientation[];
  /** Every interval value (only the chosen S ones are counted by the warnings). */
  intervals: readonly IntervalValue[];
  settings: Settings;
}

export function setupChecks(inp: SetupCheckInput): SetupProblem[] {
  const { survey, orientation, settings } = inp;
  const out: SetupProblem[] = [];
  const horizontalBeam = survey.kind !== 'crosshole';
  // 1. Reversed hits: every kind here expects them (left/right beam; up/down hammer).
  if (settings.conditioning.useReversedHits && orientation.length && !orientation.some((d) => d.reversedPair)) {
    out.push({
      code: 'NO_REVERSED_PAIR',
      message: `No depth has hits in both directions (${horizontalBeam ? 'left and right' : 'up and down'}): the shear wave cannot be told from P and noise.`,
      count: orientation.length,
      fix: 'Set the hits from the data (Geometry: hits "by data"), or give each record its hit direction.',
      blocking: true,
    });
  }
  // 2. Shear energy on the channel labelled vertical (horizontal beam: the shear wave is horizontal).
  const rxDepths = orientation.flatMap((d) => d.receivers.map((r) => ({ d, r })));
  if (horizontalBeam && rxDepths.length) {
    const bad = rxDepths.filter(({ r }) => r.sEnergy.v > r.sEnergy.h1 + r.sEnergy.h2 && r.sEnergy.v > 0);
    if (bad.length >= Math.max(2, LABEL_BLOCK_SHARE * rxDepths.length))
      out.push({
        code: 'SHEAR_ON_VERTICAL',
        message: `The channel labelled V carries more shear energy than the two horizontals at ${plural(bad.length, 'receiver depth')} of ${rxDepths.length}.`,
        count: bad.length,
        fix: 'Check the component of each channel (Geometry: channel map); the vertical is the channel with the least shear wave.',
        blocking: true,
      });
  }
  // 3. Component labels against the data.
  if (horizontalBeam) {
    // P arrives nearly vertically below about three source offsets: it must be strongest on V there.
    const steep = rxDepths.filter(({ r }) => r.pEnergy && r.depthM >= 3 * Math.max(0.5, survey.sourceOffsetM));
    const bad = steep.filter(({ r }) => r.pEnergy!.v < Math.max(r.pEnergy!.h1, r.pEnergy!.h2));
    if (steep.length >= 3 && bad.length >= Math.max(2, LABEL_BLOCK_SHARE * steep.length))
      out.push({
        code: 'LABELS_DISAGREE',
        message: `The P wave is stronger on a channel labelled horizontal than on the one labelled V at ${plural(bad.length, 'depth')} of ${steep.length} where it arrives nearly vertically.`,
        count: bad.length,
        fix: 'Fix the channel map (which channel is H1, H2 and V) for every record.',
        blocking: true,
      });
  } else if (rxDepths.length) {
    // Vertical hits: the reversing shear wave is on V.
    const bad = rxDepths.filter(({ r }) => r.sEnergy.v < Math.max(r.sEnergy.h1, r.sEnergy.h2));
    if (bad.length >= Math.max(2, LABEL_BLOCK_SHARE * rxDepths.length))
      out.push({
        code: 'LABELS_DISAGREE',
        message: `The reversing shear wave is stronger on a channel labelled horizontal than on V at ${plural(bad.length, 'receiver depth')} of ${rxDepths.length}.`,
        count: bad.length,
        fix: 'Fix the channel map (which channel is V and which the radial horizontal) for every record.',
        blocking: true,
      });
  }
  // 4. Records the hits do not explain (neither a repeat nor a reversal of the others at that depth).
  const unexplained = orientation.filter((d) => d.unexplainedRecords.length);
  if (unexplained.length)
    out.push({
      code: 'RECORDS_UNEXPLAINED',
      message: `At ${plural(unexplained.length, 'depth')} (${unexplained
        .slice(0, 4)
        .map((d) => `${d.depthM} m`)
        .join(
          ', ',
        )}${unexplained.length > 4 ? ', ...' : ''}) a record matches neither a repeat nor a reversed hit of the others: more records than the hits explain.`,
      count: unexplained.length,
      fix: 'Check the depth of each record at those depths (a record from another depth?) or exclude the odd one.',
      blocking: true,
    });
  // 5. Given hits contradicted by the data.
  const contra = orientation.filter((d) => d.contradictions > 0);
  if (contra.length)
    out.push({
      code: 'HITS_CONTRADICT_DATA',
      message: `At ${plural(contra.length, 'depth')} the hit directions given disagree with the data (records given the same direction move oppositely, or the reverse).`,
      count: contra.length,
      fix: 'Set the hits from the data (Geometry: hits "by data") or correct them by hand.',
      blocking: true,
    });
  // 6. Depths missing in the middle of the hole.
  const gaps = missingDepthGaps(orientation.map((d) => d.depthM));
  if (gaps.length)
    out.push({
      code: 'DEPTHS_MISSING',
      message: `Depths are missing in the middle of the hole: ${gaps.map((g) => `${g.fromM}-${g.toM} m`).join(', ')}.`,
      count: gaps.length,
      fix: 'Load the missing files, or check the depths given to the records around the gap.',
      blocking: true,
    });
  // Warnings.
  const lowConf = orientation.filter((d) => d.hitSource === 'data' && d.confidence < 0.3);
  if (lowConf.length)
    out.push({
      code: 'HITS_UNCERTAIN',
      message: `Hits inferred from the data are uncertain at ${plural(lowConf.length, 'depth')}.`,
      count: lowConf.length,
      fix: 'Look at those depths on the trace board and set the hits by hand if needed.',
      blocking: false,
    });
  const chosenS = inp.intervals.filter((r) => r.wave === 'S' && r.chosen);
  const flagged = chosenS.filter((r) => r.flags.some((f) => DOUBTFUL_INTERVAL_FLAGS.includes(f)));
  if (chosenS.length >= 4 && flagged.length > 0.25 * chosenS.length)
    out.push({
      code: 'MANY_FLAGGED_INTERVALS',
      message: `${flagged.length} of ${chosenS.length} shear intervals are flagged (low correlation, lag bound, methods differ or implausible).`,
      count: flagged.length,
      fix: 'Review the flagged intervals; a wrong set-up (hits, components, depths) flags many at once.',
      blocking: false,
    });
  const implausible = chosenS.filter(
    (r) =>
      r.velocityMps !== null &&
      (r.velocityMps < settings.picking.vsRangeMps[0] || r.velocityMps > settings.picking.vsRangeMps[1]),
  );
  if (implausible.length)
    out.push({
      code: 'VELOCITY_IMPLAUSIBLE',
      message: `${plural(implausible.length, 'shear interval')} outside the plausible range ${settings.picking.vsRangeMps[0]}-${settings.picking.vsRangeMps[1]} m/s.`,
      count: implausible.length,
      fix: 'Check the picks of those intervals, or widen the plausible range if the ground is unusual.',
      blocking: false,
    });
  return out;
}

/** The short reason shown instead of Vs30 while blocking problems stand. */
export function setupIncompleteText(problems: readonly SetupProblem[]): string | null {
  const b = problems.filter((p) => p.blocking);
  return b.length ? `set-up incomplete: ${b.map((p) => p.message).join(' ')}` : null;
}
