/**
 * Bridge from placed records (with sources) to the survey shape the pipeline reads today
 * (model.ts Survey / RecordAssignment). The seismic cone is run as a one- or two-receiver downhole
 * survey at the receiver depths (tip - coneOffsetM), so every path and interval uses the receiver
 * depth. Replace with the version 2 survey once the pipeline reads it.
 */
import type { RecordLog } from '../io/recordlog';
import type { Borehole, ChannelAssignment, RecordAssignment, SoilColumn, Survey, TestKind, WaveRecord } from '../model';
import { inferSetup, type SetupResult } from './infer';
import type { PlacedRecord, ReceiverSlot, SetupGeometry } from './types';

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

export function legacyKind(g: SetupGeometry): TestKind {
  if (g.kind === 'seismic-cone') return g.receiverCount === 2 ? 'downhole-pair' : 'downhole';
  return g.kind;
}

function legacyReceiver(g: SetupGeometry, slot: ReceiverSlot): string {
  if (g.kind === 'crosshole') return g.receiverHoles[slot === 'r1' ? 1 : 0]?.holeId ?? slot;
  if (legacyKind(g) === 'downhole-pair') return slot === 'r1' ? 'lower' : 'upper';
  return 'R';
}

export function toLegacyRecord(g: SetupGeometry, p: PlacedRecord): RecordAssignment {
  const channels: ChannelAssignment[] = p.channels.map((c) => ({
    channel: c.channel,
    component: c.component,
    receiver: legacyReceiver(g, c.receiver),
  }));
  const src = p.depthM?.source;
  return {
    recordId: p.file,
    // The logged depth (the cone's tip: the survey carries coneOffsetM and the stations subtract it).
    depthM: p.depthM ? p.depthM.value : null,
    hit: p.hit?.value ?? 'none',
    channels,
    excluded: p.excluded,
    assignedBy: src === 'user' ? 'manual' : src === 'filename' ? 'filename' : 'header',
    sources: {
      depth: p.depthM?.source ?? null,
      hit: p.hit?.source ?? null,
      channels: Object.fromEntries(p.channels.map((c) => [c.channel, c.source])),
    },
  };
}

/** Set-up geometry of a survey in the pipeline's shape (kinds without the cone). */
export function setupGeometryOf(survey: Survey): SetupGeometry {
  const cone = (survey.coneOffsetM ?? 0) > 0;
  return {
    kind: cone ? 'seismic-cone' : survey.kind,
    receiverCount: survey.kind === 'downhole' ? 1 : 2,
    receiverSpacingM: survey.receiverSpacingM,
    coneOffsetM: survey.coneOffsetM ?? 0,
    receiverHoles: survey.receiverHoleIds.map((id) => {
      const h = survey.boreholes.find((b) => b.id === id);
      return { holeId: id, collarEastM: h?.collarEastM ?? 0, collarNorthM: h?.collarNorthM ?? 0 };
    }),
  };
}

function slotOfLegacy(survey: Survey, receiver: string): ReceiverSlot {
  if (survey.kind === 'crosshole') return survey.receiverHoleIds.indexOf(receiver) === 1 ? 'r1' : 'r0';
  return receiver === 'lower' ? 'r1' : 'r0';
}

/** The user's own values of an assignment (source 'user', or 'manual' in saves without sources) as a placement to keep. */
export function userValuesOf(survey: Survey, ra: RecordAssignment): PlacedRecord {
  const manual = !ra.sources && ra.assignedBy === 'manual';
  const isUser = (s: string | null | undefined) => s === 'user' || manual;
  return {
    recordId: ra.recordId,
    file: ra.recordId,
    depthM: ra.depthM !== null && isUser(ra.sources?.depth) ? { value: ra.depthM, source: 'user' } : null,
    hit: isUser(ra.sources?.hit) ? { value: ra.hit, source: 'user' } : null,
    channels: ra.channels
      .filter((c) => ra.sources?.channels[c.channel] === 'user')
      .map((c) => ({
        channel: c.channel,
        receiver: slotOfLegacy(survey, c.receiver),
        component: c.component,
        source: 'user',
      })),
    excluded: ra.excluded,
  };
}

/**
 * Place records for the app's survey (same core inference as the CLI): the file-name pattern, the
 * record log and the user's earlier values (kept) decide with the headers; returns the assignments
 * with their sources and the set-up report.
 */
export function placeForSurvey(
  survey: Survey,
  records: readonly WaveRecord[],
  opts: { fileNamePattern: string; maxHeaderDepthM?: number; log?: RecordLog | null },
): { assignments: RecordAssignment[]; setup: SetupResult } {
  const g = setupGeometryOf(survey);
  const previous = survey.records.map((r) => userValuesOf(survey, r));
  const setup = inferSetup({
    records,
    geometry: g,
    settings: { maxHeaderDepthM: opts.maxHeaderDepthM ?? 200, fileNamePattern: opts.fileNamePattern },
    log: opts.log ?? null,
    previous,
  });
  return { assignments: setup.records.map((p) => toLegacyRecord(g, p)), setup };
}

export function toLegacySurvey(input: LegacySurveyInput): Survey {
  const g = input.geometry;
  return {
    name: input.name,
    kind: legacyKind(g),
    boreholes: input.boreholes,
    mainHoleId: input.mainHoleId,
    sourceOffsetM: input.sourceOffsetM,
    sourceDepthM: input.sourceDepthM,
    receiverSpacingM: g.receiverSpacingM,
    ...(g.kind === 'seismic-cone' ? { coneOffsetM: g.coneOffsetM } : {}),
    receiverHoleIds: g.kind === 'crosshole' ? g.receiverHoles.map((h) => h.holeId) : [],
    records: input.records.map((r) => toLegacyRecord(g, r)),
    soil: input.soil,
  };
}
