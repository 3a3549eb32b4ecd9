/**
 * The demo scenario: an invented site, "Tillwater Bend", a river terrace with made ground over soft
 * clay, sands and gravels on weathered mudstone. Numbers are ours, chosen inside the typical ranges
 * of shared/domain.md section 5 (memory). Three surveys: downhole, two-receiver downhole, crosshole.
 */
import type { Borehole, DeviationStation } from '../model';
import type { EarthModel } from './earth';
import type { CrossholeGeometry, DownholeGeometry, PairGeometry, SynthOptions } from './synthesize';

export const DEMO_SITE_NAME = 'Tillwater Bend terrace';

export function demoEarthModel(): EarthModel {
  return {
    name: DEMO_SITE_NAME,
    waterTableM: 2.1,
    waterVpMps: 1500,
    layers: [
      { name: 'Made ground (sandy gravel fill)', topM: 0, thicknessM: 1.6, vsMps: 165, vpMps: 340, unitWeightKnM3: 18.5, qS: 15, qP: 20, behaviour: 'sand-like' },
      { name: 'Soft grey silty clay', topM: 1.6, thicknessM: 5.4, vsMps: 115, vpMps: 260, unitWeightKnM3: 16.5, qS: 20, qP: 30, behaviour: 'clay-like' },
      { name: 'Medium dense fine sand', topM: 7.0, thicknessM: 6.5, vsMps: 215, vpMps: 430, unitWeightKnM3: 19.0, qS: 25, qP: 40, behaviour: 'sand-like' },
      { name: 'Dense gravelly sand', topM: 13.5, thicknessM: 7.5, vsMps: 330, vpMps: 640, unitWeightKnM3: 20.0, qS: 30, qP: 50, behaviour: 'sand-like' },
      { name: 'Very dense sandy gravel', topM: 21.0, thicknessM: 4.0, vsMps: 440, vpMps: 850, unitWeightKnM3: 21.0, qS: 35, qP: 60, behaviour: 'sand-like' },
      { name: 'Weathered mudstone', topM: 25.0, thicknessM: Infinity, vsMps: 680, vpMps: 1900, unitWeightKnM3: 22.0, qS: 50, qP: 80, behaviour: 'sand-like' },
    ],
  };
}

function depthsFrom(startM: number, stepM: number, endM: number): number[] {
  const out: number[] = [];
  for (let k = 0; startM + k * stepM <= endM + 1e-9; k++) out.push(Math.round((startM + k * stepM) * 1000) / 1000);
  return out;
}

export function demoDownholeGeometry(): DownholeGeometry {
  return { kind: 'downhole', holeId: 'DH1', depthsM: depthsFrom(1, 1, 30), sourceOffsetM: 2.0 };
}

export function demoPairGeometry(): PairGeometry {
  return { kind: 'downhole-pair', holeId: 'DH1', upperDepthsM: depthsFrom(1, 1, 29), receiverSpacingM: 1.0, sourceOffsetM: 2.0 };
}

/** Deviation stations every 1.5 m; the drift grows with the square of depth to (eastAtBottomM, northAtBottomM), rounded to mm. */
function driftingStations(lengthM: number, eastAtBottomM: number, northAtBottomM: number): DeviationStation[] {
  return depthsFrom(0, 1.5, lengthM).map((d) => {
    const w = (d / lengthM) ** 2;
    return { depthAlongM: d, eastM: Math.round(eastAtBottomM * w * 1000) / 1000, northM: Math.round(northAtBottomM * w * 1000) / 1000 };
  });
}

export function demoCrossholeHoles(): [Borehole, Borehole, Borehole] {
  return [
    { id: 'B1', collarEastM: 0, collarNorthM: 0, deviation: driftingStations(30, 0.18, 0.25) },
    { id: 'B2', collarEastM: 3.0, collarNorthM: 0.05, deviation: driftingStations(30, -0.32, 0.1) },
    { id: 'B3', collarEastM: 6.05, collarNorthM: -0.02, deviation: driftingStations(30, 0.22, -0.28) },
  ];
}

export function demoCrossholeGeometry(): CrossholeGeometry {
  return { kind: 'crosshole', holes: demoCrossholeHoles(), depthsM: depthsFrom(1.5, 1.5, 28.5) };
}

/** Deviation table as CSV text with a header naming units (io/deviation.ts reads it). */
export function deviationCsv(hole: Borehole): string {
  const rows = hole.deviation.map((s) => `${s.depthAlongM.toFixed(2)},${s.eastM.toFixed(3)},${s.northM.toFixed(3)}`);
  return ['depth_along_m,east_m,north_m', ...rows].join('\n') + '\n';
}

const COMMON = { attenuation: true, snr: 25, maxTriggerDelayS: 1e-4, pToSRatio: 0.2, receiverRotationRad: 0.1, receiverTiltRad: 0.05 } as const;

export function demoDownholeOptions(): SynthOptions {
  return { ...COMMON, seed: 20261, sampleIntervalS: 5e-5, samplesPerTrace: 4096, sFrequencyHz: 100, pFrequencyHz: 400, surveyName: `${DEMO_SITE_NAME}: downhole DH1` };
}

export function demoPairOptions(): SynthOptions {
  return { ...COMMON, seed: 20262, sampleIntervalS: 5e-5, samplesPerTrace: 4096, sFrequencyHz: 100, pFrequencyHz: 400, surveyName: `${DEMO_SITE_NAME}: two-receiver downhole DH1` };
}

export function demoCrossholeOptions(): SynthOptions {
  return { ...COMMON, seed: 20263, sampleIntervalS: 2e-5, samplesPerTrace: 4096, firstSampleS: -0.001, sFrequencyHz: 300, pFrequencyHz: 1500, surveyName: `${DEMO_SITE_NAME}: crosshole B1-B2-B3` };
}
