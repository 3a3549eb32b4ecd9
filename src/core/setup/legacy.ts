/**
 * Bridge from placed records (core/setup, every value with its source) to the survey the pipeline
 * reads (model.ts Survey / RecordAssignment): logged depths (the cone's tip), receiver slots, and the
 * sources in depthSource / hitSource / channel source. An unknown depth is null and an unknown hit
 * 'none', both with source 'default' (nothing placed them).
 */
import { receiverCountOf } from '../catalogue/testKinds';
import type { RecordLog } from '../io/recordlog';
import type { Borehole, ChannelAssignment, RecordAssignment, SoilColumn, Survey, WaveRecord } from '../model';
import { inferSetup, type SetupResult } from './infer';
import type { PlacedRecord, SetupGeometry } from './types';

export interface LegacySurveyInput {
  name: string;
  geometry: SetupGeometry;
  boreholes: Borehole[];
  mainHoleId: string;
  sourceOffsetM: number;
  sourceDepthM: number;
  soil: SoilColumn;
  records: readonly PlacedRecord[];
}

export function toLegacyRecord(p: PlacedRecord): RecordAssignment {
  const channels: ChannelAssignment[] = p.channels.map((c) => ({
    channel: c.channel,
    component: c.component,
    receiver: c.receiver,
    source: c.source,
  }));
  return {
    recordId: p.file,
    depthM: p.depthM ? p.depthM.value : null,
    hit: p.hit?.value ?? 'none',
    channels,
    excluded: p.excluded,
    depthSource: p.depthM?.source ?? 'default',
    hitSource: p.hit?.source ?? 'default',
  };
}

export function toLegacySurvey(input: LegacySurveyInput): Survey {
  const g = input.geometry;
  return {
    name: input.name,
    kind: g.kind,
    receiverCount: g.receiverCount,
    boreholes: input.boreholes,
    mainHoleId: input.mainHoleId,
    sourceOffsetM: input.sourceOffsetM,
    sourceDepthM: input.sourceDepthM,
    receiverSpacingM: g.receiverSpacingM,
    coneOffsetM: g.coneOffsetM,
    receiverHoleIds: g.kind === 'crosshole' ? g.receiverHoles.map((h) => h.holeId) : [],
    records: input.records.map(toLegacyRecord),
    soil: input.soil,
  };
}

/** Set-up geometry of a survey. */
export function setupGeometryOf(survey: Survey): SetupGeometry {
  return {
    kind: survey.kind,
    receiverCount: receiverCountOf(survey) === 2 ? 2 : 1,
    receiverSpacingM: survey.receiverSpacingM,
    coneOffsetM: survey.coneOffsetM,
    receiverHoles: survey.receiverHoleIds.map((id) => {
      const h = survey.boreholes.find((b) => b.id === id);
      return { holeId: id, collarEastM: h?.collarEastM ?? 0, collarNorthM: h?.collarNorthM ?? 0 };
    }),
  };
}

/** The user's own values of an assignment (source 'user') as a placement to keep. */
export function userValuesOf(ra: RecordAssignment): PlacedRecord {
  return {
    recordId: ra.recordId,
    file: ra.recordId,
    depthM: ra.depthM !== null && ra.depthSource === 'user' ? { value: ra.depthM, source: 'user' } : null,
    hit: ra.hitSource === 'user' ? { value: ra.hit, source: 'user' } : null,
    channels: ra.channels
      .filter((c) => c.source === 'user' && (c.receiver === 'r0' || c.receiver === 'r1'))
      .map((c) => ({
        channel: c.channel,
        receiver: c.receiver as 'r0' | 'r1',
        component: c.component,
        source: 'user',
      })),
    excluded: ra.excluded,
  };
}

/**
 * Place records for the app's survey (same core inference as the CLI): the user's earlier values are
 * kept, then the record log, the file-name pattern, the headers and the kind's defaults decide.
 */
export function placeForSurvey(
  survey: Survey,
  records: readonly WaveRecord[],
  opts: { fileNamePattern: string; maxHeaderDepthM?: number; log?: RecordLog | null },
): { assignments: RecordAssignment[]; setup: SetupResult } {
  const setup = inferSetup({
    records,
    geometry: setupGeometryOf(survey),
    settings: { maxHeaderDepthM: opts.maxHeaderDepthM ?? 200, fileNamePattern: opts.fileNamePattern },
    log: opts.log ?? null,
    previous: survey.records.map(userValuesOf),
  });
  return { assignments: setup.records.map(toLegacyRecord), setup };
}
