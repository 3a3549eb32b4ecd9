/**
 * Borehole positions from deviation (verticality) surveys, and source/receiver positions for each test
 * kind. Coordinates: east (m), north (m), depth below ground (m, positive down).
 *
 * Deviation interpolation: offsets are linear in depth-along-hole between surveyed stations; the true
 * vertical depth is integrated segment by segment (dz = sqrt(dL^2 - dh^2)). Above the first station the
 * hole runs straight from the collar (0, 0 at depth 0) to it. Beyond the last station the hole continues
 * in the direction of the last surveyed segment (a vertical hole if there is only one station), and the
 * position is flagged 'beyond deviation survey' (common practice: surveys should reach the deepest test).
 */
import { BorewaveError } from '../errors';
import type { Borehole, DeviationStation } from '../model';

export type Vec3 = [number, number, number];

export interface HolePosition {
  pos: Vec3;
  beyondSurvey: boolean;
}

export function distanceM(a: Vec3, b: Vec3): number {
  return Math.hypot(a[0] - b[0], a[1] - b[1], a[2] - b[2]);
}

export function horizontalDistanceM(a: Vec3, b: Vec3): number {
  return Math.hypot(a[0] - b[0], a[1] - b[1]);
}

/** Throws a BorewaveError naming the hole and row when the table is not usable. */
export function validateDeviation(holeId: string, stations: readonly DeviationStation[]): void {
  for (let i = 0; i < stations.length; i++) {
    const s = stations[i];
    if (![s.depthAlongM, s.eastM, s.northM].every(Number.isFinite)) {
      throw new BorewaveError(
        'DEVIATION_NOT_NUMERIC',
        `Deviation survey of ${holeId}: row ${i + 1} has a value that is not a number.`,
        holeId,
        `row ${i + 1}`,
      );
    }
    if (i > 0) {
      const prev = stations[i - 1];
      const dL = s.depthAlongM - prev.depthAlongM;
      if (dL <= 0) {
        throw new BorewaveError(
          'DEVIATION_NOT_MONOTONIC',
          `Deviation survey of ${holeId}: depth ${s.depthAlongM} m on row ${i + 1} is not deeper than ${prev.depthAlongM} m on the row above.`,
          holeId,
          `row ${i + 1}`,
        );
      }
      const dh = Math.hypot(s.eastM - prev.eastM, s.northM - prev.northM);
      if (dh > dL) {
        throw new BorewaveError(
          'DEVIATION_IMPOSSIBLE',
          `Deviation survey of ${holeId}: the hole moves ${dh.toFixed(3)} m sideways over ${dL.toFixed(3)} m of hole between rows ${i} and ${i + 1}.`,
          holeId,
          `row ${i + 1}`,
        );
      }
    }
  }
}

/** Position of the point at depthAlongM along the hole. */
export function positionAlongHole(hole: Borehole, depthAlongM: number): HolePosition {
  const st: DeviationStation[] =
    hole.deviation.length && hole.deviation[0].depthAlongM > 0
      ? [{ depthAlongM: 0, eastM: 0, northM: 0 }, ...hole.deviation]
      : hole.deviation.length
        ? [...hole.deviation]
        : [{ depthAlongM: 0, eastM: 0, northM: 0 }];
  let z = st[0].depthAlongM; // the first station is at the collar or at depth 0 by construction
  let i = 0;
  for (; i + 1 < st.length && st[i + 1].depthAlongM <= depthAlongM; i++) {
    z += verticalRiseM(st[i], st[i + 1]);
  }
  const a = st[i];
  let e = a.eastM;
  let n = a.northM;
  const rest = depthAlongM - a.depthAlongM;
  let beyond = false;
  if (i + 1 < st.length) {
    const b = st[i + 1];
    const f = rest / (b.depthAlongM - a.depthAlongM);
    e += f * (b.eastM - a.eastM);
    n += f * (b.northM - a.northM);
    z += f * verticalRiseM(a, b);
  } else if (i > 0) {
    const p = st[i - 1];
    const dL = a.depthAlongM - p.depthAlongM;
    e += (rest * (a.eastM - p.eastM)) / dL;
    n += (rest * (a.northM - p.northM)) / dL;
    z += (rest * verticalRiseM(p, a)) / dL;
    beyond = rest > 1e-9;
  } else {
    z += rest;
    beyond = rest > 1e-9 && hole.deviation.length > 0;
  }
  return { pos: [hole.collarEastM + e, hole.collarNorthM + n, z], beyondSurvey: beyond };
}

function verticalRiseM(a: DeviationStation, b: DeviationStation): number {
  const dL = b.depthAlongM - a.depthAlongM;
  const dh = Math.hypot(b.eastM - a.eastM, b.northM - a.northM);
  return Math.sqrt(Math.max(0, dL * dL - dh * dh));
}

export function findHole(holes: readonly Borehole[], id: string): Borehole {
  const h = holes.find((b) => b.id === id);
  if (!h)
    throw new BorewaveError(
      'SURVEY_UNKNOWN_HOLE',
      `The survey names borehole "${id}", which is not in its borehole list.`,
      id,
      'boreholes',
    );
  return h;
}
