/**
 * Bridge from placed records (with sources) to the survey shape the pipeline reads today
 * (model.ts Survey / RecordAssignment). The seismic cone is run as a one- or two-receiver downhole
 * survey at the receiver depths (tip - coneOffsetM), so every path and interval uses the receiver
 * depth. Replace with the version 2 survey once the pipeline reads it.
 */
import type { Borehole, ChannelAssignment, RecordAssignment, SoilColumn, Survey, TestKind } from '../model';
import { receiverDepthFromLogged } from './cone';
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

/** The record's depth as the pipeline reads it: receiver depth (cone: tip - offset; two receivers: the upper one). */
export function legacyRecordDepthM(g: SetupGeometry, loggedDepthM: number): number {
  return Math.round(receiverDepthFromLogged(g, 'r0', loggedDepthM) * 1e6) / 1e6;
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
    depthM: p.depthM ? legacyRecordDepthM(g, p.depthM.value) : null,
    hit: p.hit?.value ?? 'none',
    channels,
    excluded: p.excluded,
    assignedBy: src === 'user' ? 'manual' : src === 'filename' ? 'filename' : 'header',
  };
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
    receiverHoleIds: g.kind === 'crosshole' ? g.receiverHoles.map((h) => h.holeId) : [],
    records: input.records.map((r) => toLegacyRecord(g, r)),
    soil: input.soil,
  };
}
