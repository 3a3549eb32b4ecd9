/**
 * Profile rows: the chosen S intervals with their P partner (a doubtful Vp is left out of Poisson's
 * ratio and the moduli, and said so), stiffness and stresses from the soil column (or the stated
 * defaults when the column is unusable).
 */
import { toErrorInfo, type ErrorInfo } from '../errors';
import type { SoilColumn, Survey } from '../model';
import type { IntervalKey } from '../keys';
import type { IntervalMethod } from '../catalogue/methods';
import { DOUBTFUL_VP_FLAGS } from '../flags';
import type { IntervalValue } from '../velocity/intervals';
import { stiffnessProfile, type StiffnessRow, type VelocityInterval } from './profile';
import { defaultSoilColumn, validateSoilColumn } from './stress';

export interface ProfileRow extends StiffnessRow {
  intervalKey: IntervalKey;
  method: IntervalMethod;
  vpMethod: IntervalMethod | null;
  vpSdMps: number | null;
  /** The 95% range of Vs, m/s (the chosen S interval's low95Mps / high95Mps; null without an sd). */
  vsLow95Mps: number | null;
  vsHigh95Mps: number | null;
}

export function profileRows(
  survey: Survey,
  intervals: readonly IntervalValue[],
  issues: ErrorInfo[],
): { rows: ProfileRow[]; velocity: VelocityInterval[]; soil: SoilColumn } {
  const chosenS = intervals.filter((r) => r.wave === 'S' && r.chosen).sort((a, b) => a.topM - b.topM);
  const chosenP = intervals.filter((r) => r.wave === 'P' && r.chosen);
  const velocity: VelocityInterval[] = chosenS.map((s) => {
    const p = chosenP.find((q) => Math.abs(q.topM - s.topM) < 1e-6 && Math.abs(q.bottomM - s.bottomM) < 1e-6);
    // A doubtful Vp would give a wrong Poisson's ratio and moduli: it is left out of them, and said so.
    const doubtful = p ? p.flags.filter((f) => DOUBTFUL_VP_FLAGS.has(f)) : [];
    const flags = [...s.flags];
    if (doubtful.length) flags.push(`vp left out (${doubtful.join(', ')})`);
    const useVp = p && !doubtful.length;
    return {
      topM: s.topM,
      bottomM: s.bottomM,
      vsMps: s.velocityMps!,
      vsSdMps: s.velocitySdMps ?? 0,
      vpMps: useVp ? p.velocityMps : null,
      vpSdMps: useVp ? p.velocitySdMps : null,
      flags,
    };
  });
  const fallbackSoil = {
    ...defaultSoilColumn(Math.max(30, ...velocity.map((v) => v.bottomM))),
    waterTableM: survey.soil.waterTableM,
  };
  const soilProblems = survey.soil.layers.length ? validateSoilColumn(survey.soil) : [];
  issues.push(...soilProblems);
  // An unusable soil column must not stop the profile: moduli then use the stated defaults, flagged.
  const soil = survey.soil.layers.length && !soilProblems.length ? survey.soil : fallbackSoil;
  let stiff: StiffnessRow[];
  let usedSoil = soil;
  try {
    stiff = stiffnessProfile(velocity, soil);
  } catch (e) {
    issues.push(toErrorInfo(e, 'soil column'));
    stiff = stiffnessProfile(velocity, fallbackSoil);
    usedSoil = fallbackSoil;
  }
  if (soil === fallbackSoil) for (const r of stiff) r.flags.push('default soil column');
  const rows: ProfileRow[] = stiff.map((r, i) => {
    const s = chosenS[i];
    const p = chosenP.find((q) => Math.abs(q.topM - s.topM) < 1e-6 && Math.abs(q.bottomM - s.bottomM) < 1e-6);
    const vpUsed = velocity[i].vpMps !== null;
    return {
      ...r,
      intervalKey: s.key,
      method: s.method,
      vpMethod: vpUsed ? (p?.method ?? null) : null,
      vpSdMps: velocity[i].vpSdMps,
      vsLow95Mps: s.low95Mps,
      vsHigh95Mps: s.high95Mps,
    };
  });
  return { rows, velocity, soil: usedSoil };
}
