/**
 * The demo scenario: an invented site, "Tillwater Bend", a river terrace with made ground over soft
 * clay, sands and gravels on weathered mudstone. Numbers are ours, chosen inside the typical ranges
 * of docs/methods.md section 5 (memory). Three surveys: downhole, two-receiver downhole, crosshole.
 */
import { TEST_KINDS } from '../catalogue/testKinds';
import { BorewaveError } from '../errors';
import { newProjectDocument, type ProjectDocument, type ProjectFile } from '../io/project';
import { writeSeg2 } from '../io/seg2';
import { encodeUtf8 } from '../io/bytes';
import type { Borehole, ByteOrder, DeviationStation, TestKind } from '../model';
import type { EarthModel } from './earth';
import {
  synthesizeSurvey,
  toSeg2Input,
  type CrossholeGeometry,
  type DownholeGeometry,
  type PairGeometry,
  type SynthGeometry,
  type SynthOptions,
  type SynthResult,
} from './synthesize';

export const DEMO_SITE_NAME = 'Tillwater Bend terrace';

export function demoEarthModel(): EarthModel {
  return {
    name: DEMO_SITE_NAME,
    waterTableM: 2.1,
    waterVpMps: 1500,
    layers: [
      {
        name: 'Made ground (sandy gravel fill)',
        topM: 0,
        thicknessM: 1.6,
        vsMps: 165,
        vpMps: 340,
        unitWeightKnM3: 18.5,
        qS: 15,
        qP: 20,
        behaviour: 'sand-like',
        soil: { soilType: 'gravel' },
      },
      {
        name: 'Soft grey silty clay',
        topM: 1.6,
        thicknessM: 5.4,
        vsMps: 115,
        vpMps: 260,
        unitWeightKnM3: 16.5,
        qS: 20,
        qP: 30,
        behaviour: 'clay-like',
        soil: { soilType: 'clay', plasticityIndexPct: 28 },
      },
      {
        name: 'Medium dense fine sand',
        topM: 7.0,
        thicknessM: 6.5,
        vsMps: 215,
        vpMps: 430,
        unitWeightKnM3: 19.0,
        qS: 25,
        qP: 40,
        behaviour: 'sand-like',
        soil: { soilType: 'sand', finesContentPct: 8 },
      },
      {
        name: 'Dense gravelly sand',
        topM: 13.5,
        thicknessM: 7.5,
        vsMps: 330,
        vpMps: 640,
        unitWeightKnM3: 20.0,
        qS: 30,
        qP: 50,
        behaviour: 'sand-like',
        soil: { soilType: 'sand', finesContentPct: 4 },
      },
      {
        name: 'Very dense sandy gravel',
        topM: 21.0,
        thicknessM: 4.0,
        vsMps: 440,
        vpMps: 850,
        unitWeightKnM3: 21.0,
        qS: 35,
        qP: 60,
        behaviour: 'sand-like',
        soil: { soilType: 'gravel' },
      },
      {
        name: 'Weathered mudstone',
        topM: 25.0,
        thicknessM: Infinity,
        vsMps: 680,
        vpMps: 1900,
        unitWeightKnM3: 22.0,
        qS: 50,
        qP: 80,
        behaviour: 'sand-like',
        soil: { soilType: 'rock' },
      },
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
  return {
    kind: 'downhole-pair',
    holeId: 'DH1',
    upperDepthsM: depthsFrom(1, 1, 29),
    receiverSpacingM: 1.0,
    sourceOffsetM: 2.0,
  };
}

/** Deviation stations every 1.5 m; the drift grows with the square of depth to (eastAtBottomM, northAtBottomM), rounded to mm. */
function driftingStations(lengthM: number, eastAtBottomM: number, northAtBottomM: number): DeviationStation[] {
  return depthsFrom(0, 1.5, lengthM).map((d) => {
    const w = (d / lengthM) ** 2;
    const mm = (x: number) => Math.round(x * 1000) / 1000 + 0; // + 0 turns -0 into 0
    return { depthAlongM: d, eastM: mm(eastAtBottomM * w), northM: mm(northAtBottomM * w) };
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

const COMMON = {
  attenuation: true,
  snr: 25,
  maxTriggerDelayS: 1e-4,
  pToSRatio: 0.2,
  receiverRotationRad: 0.1,
  receiverTiltRad: 0.05,
} as const;

export function demoDownholeOptions(): SynthOptions {
  return {
    ...COMMON,
    seed: 20261,
    sampleIntervalS: 5e-5,
    samplesPerTrace: 3584,
    sFrequencyHz: 100,
    pFrequencyHz: 400,
    surveyName: `${DEMO_SITE_NAME}: downhole DH1`,
  };
}

export function demoPairOptions(): SynthOptions {
  return {
    ...COMMON,
    seed: 20262,
    sampleIntervalS: 5e-5,
    samplesPerTrace: 3584,
    sFrequencyHz: 100,
    pFrequencyHz: 400,
    surveyName: `${DEMO_SITE_NAME}: two-receiver downhole DH1`,
  };
}

export function demoCrossholeOptions(): SynthOptions {
  return {
    ...COMMON,
    seed: 20263,
    sampleIntervalS: 2.5e-5,
    samplesPerTrace: 3072,
    firstSampleS: -0.001,
    sFrequencyHz: 300,
    pFrequencyHz: 1500,
    surveyName: `${DEMO_SITE_NAME}: crosshole B1-B2-B3`,
  };
}

/** How each demo survey is generated and stored (mixed byte orders and SEG-2 format codes on purpose). */
export interface DemoPlan {
  kind: TestKind;
  /** Folder under sample-data/ and name of the copy under public/demo/. */
  folder: string;
  geometry: SynthGeometry;
  options: SynthOptions;
  byteOrder: ByteOrder;
  formatCode: 1 | 2 | 4;
}

const DEMO_PLANS: Partial<Record<TestKind, () => DemoPlan>> = {
  downhole: () => ({
    kind: 'downhole',
    folder: 'downhole',
    geometry: demoDownholeGeometry(),
    options: demoDownholeOptions(),
    byteOrder: 'little',
    formatCode: 4,
  }),
  'downhole-pair': () => ({
    kind: 'downhole-pair',
    folder: 'downhole-pair',
    geometry: demoPairGeometry(),
    options: demoPairOptions(),
    byteOrder: 'big',
    formatCode: 1,
  }),
  crosshole: () => ({
    kind: 'crosshole',
    folder: 'crosshole',
    geometry: demoCrossholeGeometry(),
    options: demoCrossholeOptions(),
    byteOrder: 'big',
    formatCode: 2,
  }),
};

/** Test kinds that have a demo survey, in catalogue order. */
export const DEMO_KINDS: readonly TestKind[] = TEST_KINDS.filter((k) => DEMO_PLANS[k]);

export function demoPlan(kind: TestKind): DemoPlan {
  const plan = DEMO_PLANS[kind];
  if (!plan) throw new BorewaveError('SYNTH_BAD_OPTION', `There is no demo survey of kind ${kind}.`, 'demo', 'kind');
  return plan();
}

export interface DemoProject {
  plan: DemoPlan;
  doc: ProjectDocument;
  /** SEG-2 files, then deviation tables (crosshole). */
  files: ProjectFile[];
  result: SynthResult;
}

/** The demo survey of one kind as a project document plus its files (deterministic). */
export function makeDemoProject(kind: TestKind): DemoProject {
  const plan = demoPlan(kind);
  const model = demoEarthModel();
  const result = synthesizeSurvey(model, plan.geometry, plan.options);
  const files: ProjectFile[] = result.records.map((r) => ({
    name: r.fileName,
    bytes: writeSeg2(toSeg2Input(r), { byteOrder: plan.byteOrder, formatCode: plan.formatCode }),
  }));
  const deviationFiles: Record<string, string> = {};
  if (plan.geometry.kind === 'crosshole') {
    for (const hole of plan.geometry.holes) {
      const name = `${hole.id}_deviation.csv`;
      deviationFiles[hole.id] = name;
      files.push({ name, bytes: encodeUtf8(deviationCsv(hole)) });
    }
  }
  const doc = newProjectDocument(
    result.survey,
    files.map((f) => f.name),
  );
  if (Object.keys(deviationFiles).length > 0) doc.deviationFiles = deviationFiles;
  doc.notes = `Synthetic demo survey of the invented site "${model.name}" (forward model with known arrival times; npm run make-demo). True model: sample-data/README.md.`;
  return { plan, doc, files, result };
}
