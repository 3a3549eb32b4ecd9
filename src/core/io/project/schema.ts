/**
 * project.json version 2 as a schema (docs/project-format.md): every key known (unknown keys are
 * rejected with the path named), every number finite, every setting bounded. The document types are
 * inferred from the schema, so the reader and the writer cannot drift from it. Validation by valibot.
 */
import * as v from 'valibot';
import { INTERVAL_METHODS, ONSET_PICKERS } from '../../catalogue/methods';
import { TEST_KINDS } from '../../catalogue/testKinds';
import { parseStationKey } from '../../keys';

export const PROJECT_FORMAT = 'borewave-project';
export const PROJECT_VERSION = 2;

/** Limits a document may not exceed (a hostile or broken file must fail cleanly, not exhaust memory). */
export const DOCUMENT_LIMITS = {
  maxFiles: 5000,
  maxRecords: 5000,
  maxBoreholes: 100,
  maxDeviationStations: 10000,
  maxLayers: 500,
  maxBoundaries: 500,
  maxEdits: 100000,
  maxMonteCarloDraws: 100000,
  maxTextLength: 10000,
  /** Deepest depth accepted anywhere, m. */
  maxDepthM: 5000,
} as const;

const L = DOCUMENT_LIMITS;
const text = v.pipe(v.string(), v.maxLength(L.maxTextLength));
const finite = v.pipe(v.number(), v.finite());
const nonNegative = v.pipe(v.number(), v.finite(), v.minValue(0));
const positive = v.pipe(v.number(), v.finite(), v.gtValue(0));
const depthM = v.pipe(v.number(), v.finite(), v.minValue(0), v.maxValue(L.maxDepthM));
const velocityRange = v.pipe(
  v.tuple([positive, positive]),
  v.check(([lo, hi]) => lo < hi, 'the lower velocity must be below the upper'),
);

export const VALUE_SOURCES = ['user', 'log', 'filename', 'header', 'data', 'default'] as const;
const source = v.picklist(VALUE_SOURCES);
const slot = v.pipe(v.string(), v.regex(/^r(0|[1-9][0-9]?)$/, 'is not a receiver slot r0, r1, ...'));
const component = v.picklist(['H1', 'H2', 'V']);
const hit = v.picklist(['left', 'right', 'up', 'down', 'none']);

const channelEntry = v.strictObject({
  channel: v.pipe(v.number(), v.integer(), v.minValue(0), v.maxValue(65535)),
  receiver: slot,
  component,
  source,
});

const FILE_ROLES = ['wave', 'deviation', 'record-log'] as const;

const fileEntry = v.strictObject({
  path: v.pipe(
    v.string(),
    v.minLength(1),
    v.maxLength(1000),
    v.check(
      (p) => !p.split('/').some((s) => s === '' || s === '.' || s === '..') && !p.includes('\\'),
      'is not a relative path inside the archive',
    ),
    v.check((p) => p !== 'project.json', 'may not be project.json'),
  ),
  role: v.picklist(FILE_ROLES),
  sampleIntervalS: v.optional(positive),
});

const deviationStation = v.strictObject({ depthAlongM: depthM, eastM: finite, northM: finite });

const borehole = v.strictObject({
  holeId: v.pipe(v.string(), v.minLength(1), v.maxLength(200)),
  collarEastM: finite,
  collarNorthM: finite,
  deviation: v.pipe(v.array(deviationStation), v.maxLength(L.maxDeviationStations)),
  deviationFile: v.nullable(v.string()),
});

const record = v.strictObject({
  recordId: v.pipe(v.string(), v.minLength(1), v.maxLength(200)),
  file: v.pipe(v.string(), v.minLength(1)),
  depthM: v.strictObject({ value: v.nullable(depthM), source }),
  hit: v.strictObject({ value: hit, source }),
  channels: v.pipe(v.array(channelEntry), v.maxLength(1024)),
  excluded: v.boolean(),
});

const SOIL_TYPES = ['clay', 'silt', 'sand', 'silty-sand', 'gravel', 'rock', 'other'] as const;

const soilLayer = v.strictObject({
  topM: depthM,
  bottomM: depthM,
  name: text,
  unitWeightKnM3: v.pipe(v.number(), v.finite(), v.gtValue(0), v.maxValue(40)),
  stressExponent: v.pipe(v.number(), v.finite(), v.minValue(0), v.maxValue(1)),
  poissonRatio: v.pipe(v.number(), v.finite(), v.minValue(0), v.ltValue(0.5)),
  soilType: v.picklist(SOIL_TYPES),
  plasticityIndexPct: v.nullable(v.pipe(v.number(), v.finite(), v.minValue(0), v.maxValue(300))),
  ocr: v.nullable(v.pipe(v.number(), v.finite(), v.minValue(1), v.maxValue(100))),
  finesContentPct: v.nullable(v.pipe(v.number(), v.finite(), v.minValue(0), v.maxValue(100))),
  k0: v.nullable(v.pipe(v.number(), v.finite(), v.gtValue(0), v.maxValue(5))),
  workingStrainPct: v.nullable(v.pipe(v.number(), v.finite(), v.gtValue(0), v.maxValue(10))),
});

const survey = v.strictObject({
  name: text,
  siteName: text,
  testDate: v.nullable(v.pipe(v.string(), v.isoDate())),
  kind: v.picklist(TEST_KINDS as readonly string[] as ['downhole', 'downhole-pair', 'crosshole', 'seismic-cone']),
  receiverCount: v.picklist([1, 2]),
  boreholes: v.pipe(v.array(borehole), v.maxLength(L.maxBoreholes)),
  mainHoleId: v.string(),
  receiverHoleIds: v.pipe(v.array(v.string()), v.maxLength(2)),
  sourceOffsetM: nonNegative,
  sourceDepthM: depthM,
  receiverSpacingM: v.pipe(v.number(), v.finite(), v.minValue(0), v.maxValue(100)),
  coneOffsetM: v.pipe(v.number(), v.finite(), v.minValue(0), v.maxValue(10)),
  hitSwap: v.boolean(),
  channelMap: v.pipe(v.array(channelEntry), v.maxLength(1024)),
  records: v.optional(v.pipe(v.array(record), v.maxLength(L.maxRecords))),
  soil: v.strictObject({
    waterTableM: v.nullable(depthM),
    waterUnitWeightKnM3: v.pipe(v.number(), v.finite(), v.gtValue(0), v.maxValue(20)),
    layers: v.pipe(v.array(soilLayer), v.maxLength(L.maxLayers)),
  }),
});

const bandpass = v.nullable(
  v.pipe(
    v.strictObject({
      lowHz: positive,
      highHz: positive,
      order: v.pipe(v.number(), v.integer(), v.minValue(1), v.maxValue(8)),
    }),
    v.check((b) => b.lowHz < b.highHz, 'low corner must be below the high corner'),
  ),
);

const settings = v.strictObject({
  conditioning: v.strictObject({
    detrend: v.boolean(),
    taperFraction: v.pipe(v.number(), v.finite(), v.minValue(0), v.maxValue(0.5)),
    bandpassS: bandpass,
    bandpassP: bandpass,
    useReversedHits: v.boolean(),
    rotateHorizontals: v.boolean(),
  }),
  picking: v.pipe(
    v.strictObject({
      onsetMethod: v.picklist(ONSET_PICKERS),
      staS: v.pipe(v.number(), v.finite(), v.gtValue(0), v.maxValue(10)),
      ltaS: v.pipe(v.number(), v.finite(), v.gtValue(0), v.maxValue(100)),
      staLtaThreshold: v.pipe(v.number(), v.finite(), v.gtValue(0), v.maxValue(1000)),
      phaseBandHz: v.nullable(velocityRange),
      vsRangeMps: velocityRange,
      vpRangeMps: velocityRange,
    }),
    v.forward(
      v.partialCheck(
        [['staS'], ['ltaS']],
        (p) => p.staS < p.ltaS,
        'the short-term window must be shorter than the long-term one',
      ),
      ['staS'],
    ),
  ),
  intervals: v.strictObject({
    profileMethod: v.picklist(INTERVAL_METHODS),
    methodDisagreementShare: v.pipe(v.number(), v.finite(), v.gtValue(0), v.maxValue(10)),
    rayFit: v.boolean(),
    triggerDelayS: v.pipe(v.number(), v.finite(), v.minValue(-1), v.maxValue(1)),
    positionSdM: v.pipe(v.number(), v.finite(), v.minValue(0), v.maxValue(10)),
    triggerOffsetSdS: v.pipe(v.number(), v.finite(), v.minValue(0), v.maxValue(1)),
  }),
  layering: v.strictObject({
    mode: v.picklist(['auto', 'user']),
    boundariesM: v.pipe(v.array(depthM), v.maxLength(L.maxBoundaries)),
    minThicknessM: v.pipe(v.number(), v.finite(), v.gtValue(0), v.maxValue(1000)),
  }),
  site: v.strictObject({
    vs30Rule: v.picklist(['no-extrapolation', 'extend-deepest']),
    siteAnswers: v.record(v.pipe(v.string(), v.maxLength(200)), v.boolean()),
    monteCarloDraws: v.pipe(v.number(), v.integer(), v.minValue(100), v.maxValue(L.maxMonteCarloDraws)),
    monteCarloSeed: v.pipe(v.number(), v.integer(), v.minValue(0), v.maxValue(2 ** 32 - 1)),
  }),
  design: v.strictObject({
    pgaG: v.nullable(v.pipe(v.number(), v.finite(), v.minValue(0), v.maxValue(5))),
    magnitude: v.nullable(v.pipe(v.number(), v.finite(), v.minValue(0), v.maxValue(10))),
    curveModel: v.picklist(['darendeli', 'ishibashi-zhang']),
    loadingFrequencyHz: v.pipe(v.number(), v.finite(), v.gtValue(0), v.maxValue(1000)),
    loadingCycles: v.pipe(v.number(), v.finite(), v.gtValue(0), v.maxValue(1e6)),
  }),
  placement: v.strictObject({
    maxHeaderDepthM: v.pipe(v.number(), v.finite(), v.gtValue(0), v.maxValue(L.maxDepthM)),
    fileNamePattern: v.pipe(v.string(), v.maxLength(500)),
  }),
});

const isStation = (k: string) => parseStationKey(k) !== null;
const stationPart = (k: string, suffix: RegExp) => {
  const m = suffix.exec(k);
  return m !== null && isStation(k.slice(0, m.index));
};
const pickEditKey = v.pipe(
  v.string(),
  v.check((k) => stationPart(k, /\|(S|P)\|(onset|peak|trough|zero-crossing)$/), 'is not a pick edit key'),
);
const stationWaveKey = v.pipe(
  v.string(),
  v.check((k) => stationPart(k, /\|(S|P)$/), 'is not a station-wave key'),
);
const intervalKey = v.pipe(
  v.string(),
  v.check((k) => {
    const m = /^(S|P):([^>]+)>([^>]+)$/.exec(k);
    return m !== null && isStation(m[2]) && isStation(m[3]);
  }, 'is not an interval key'),
);
const receiverDepthKey = v.pipe(v.string(), v.regex(/^r(0|[1-9][0-9]?)@-?[0-9]+$/, 'is not a receiver-depth key'));

const edits = v.strictObject({
  picks: v.record(pickEditKey, v.pipe(v.number(), v.finite())),
  excludedStations: v.pipe(v.array(stationWaveKey), v.maxLength(L.maxEdits)),
  chosenMethod: v.record(intervalKey, v.picklist(INTERVAL_METHODS)),
  excludedIntervals: v.pipe(v.array(intervalKey), v.maxLength(L.maxEdits)),
  azimuthDeg: v.record(receiverDepthKey, v.pipe(v.number(), v.finite(), v.minValue(-360), v.maxValue(360))),
});

const comparison = v.strictObject({
  name: text,
  points: v.pipe(v.array(v.strictObject({ depthM, vsMps: positive })), v.maxLength(10000)),
  source: v.picklist(['vs', 'rayleigh']),
  poissonRatio: v.optional(v.pipe(v.number(), v.finite(), v.minValue(0), v.ltValue(0.5))),
  notes: v.optional(v.array(text)),
});

export const ProjectSchema = v.strictObject({
  format: v.literal(PROJECT_FORMAT),
  version: v.literal(PROJECT_VERSION),
  softwareVersion: v.pipe(v.string(), v.maxLength(200)),
  savedAt: v.pipe(v.string(), v.isoTimestamp()),
  files: v.pipe(
    v.array(fileEntry),
    v.maxLength(L.maxFiles),
    v.check((fs) => new Set(fs.map((f) => f.path)).size === fs.length, 'list a path twice'),
  ),
  survey,
  settings,
  edits,
  view: v.optional(v.record(v.string(), v.unknown())),
  /** Free text the user keeps with the project. */
  notes: v.optional(text),
  /** A profile from another test to compare with (depth and Vs in SI). */
  comparison: v.optional(v.nullable(comparison)),
});

/** project.json version 2, as read and written. */
export type ProjectJson = v.InferOutput<typeof ProjectSchema>;
export type ProjectFileEntry = ProjectJson['files'][number];
export type ProjectRecord = NonNullable<ProjectJson['survey']['records']>[number];
export type ProjectSoilLayer = ProjectJson['survey']['soil']['layers'][number];

export interface SchemaProblem {
  /** Dotted path with indices, e.g. survey.boreholes[0].collarEastM. */
  path: string;
  message: string;
}

function pathOf(issue: v.BaseIssue<unknown>): string {
  let out = '';
  for (const item of issue.path ?? []) {
    const key = (item as { key?: unknown }).key;
    if (typeof key === 'number') out += `[${key}]`;
    else out += out ? `.${String(key)}` : String(key);
  }
  return out || '(document)';
}

/** Validates a parsed JSON value; problems name the path of each bad value (first ones only). */
export function checkProjectJson(
  raw: unknown,
): { ok: true; doc: ProjectJson } | { ok: false; problems: SchemaProblem[] } {
  const r = v.safeParse(ProjectSchema, raw, { abortPipeEarly: true });
  if (r.success) return { ok: true, doc: r.output };
  return { ok: false, problems: r.issues.slice(0, 20).map((i) => ({ path: pathOf(i), message: i.message })) };
}
