/**
 * The project as the program holds it (ProjectDocument: the survey, settings and edits the pipeline
 * reads, plus the files stored beside them) and its conversion to and from project.json version 2
 * (schema.ts). Records are held by their archive path (one record per file); the file's `recordId`
 * values are made on save (rec-0001 ...), unique and independent of file names.
 */
import type { Borehole, RecordAssignment, SoilLayer, Survey } from '../../model';
import type { ReceiverSlot } from '../../keys';
import { emptyEdits, mergeSettings, type Settings, type SettingsPatch, type UserEdits } from '../../settings';
import type { ComparisonProfile } from '../../site/comparison';
import { BorewaveError } from '../../errors';
import { PROJECT_FORMAT, PROJECT_VERSION, type ProjectJson, type ProjectRecord } from './schema';
import { softwareVersion } from '../../version';

export { PROJECT_FORMAT, PROJECT_VERSION } from './schema';

export interface ProjectDocument {
  format: typeof PROJECT_FORMAT;
  version: number;
  savedAt: string;
  /** The program that saved it (package version and build commit where known). */
  softwareVersion?: string;
  survey: Survey;
  settings: Settings;
  edits: UserEdits;
  /** Paths of the files stored beside project.json (waveforms, deviation tables, record logs), in load order. */
  files: string[];
  /** Deviation table file per borehole id, when loaded from a file. */
  deviationFiles?: Record<string, string>;
  /** Record-log files among `files`. */
  recordLogs?: string[];
  /** Sample interval per text file without a time column (user-given), s. */
  sampleIntervalsS?: Record<string, number>;
  /** Free text the user keeps with the project. */
  notes?: string;
  /** A profile from another test to compare with (depth and Vs, already converted to SI). */
  comparison?: ComparisonProfile | null;
  /** Display preferences kept with the project (never results). */
  view?: Record<string, unknown>;
  /** project.json gave no records: placement is inferred from the files on open. */
  placementInferred?: boolean;
}

export interface ProjectFile {
  name: string;
  bytes: Uint8Array;
}

export function newProjectDocument(survey: Survey, files: string[] = []): ProjectDocument {
  return {
    format: PROJECT_FORMAT,
    version: PROJECT_VERSION,
    savedAt: new Date(0).toISOString(),
    survey,
    settings: mergeSettings({}),
    edits: emptyEdits(),
    files,
  };
}

function recordToJson(r: RecordAssignment, i: number): ProjectRecord {
  return {
    recordId: `rec-${String(i + 1).padStart(4, '0')}`,
    file: r.recordId,
    depthM: { value: r.depthM, source: r.depthSource },
    hit: { value: r.hit, source: r.hitSource },
    channels: r.channels.map((c) => ({
      channel: c.channel,
      receiver: c.receiver,
      component: c.component,
      source: c.source ?? 'default',
    })),
    excluded: r.excluded,
  };
}

function layerToJson(l: SoilLayer): ProjectJson['survey']['soil']['layers'][number] {
  return {
    topM: l.topM,
    bottomM: l.bottomM,
    name: l.name,
    unitWeightKnM3: l.unitWeightKnM3,
    stressExponent: l.stressExponent,
    poissonRatio: l.poissonRatio,
    soilType: l.soilType ?? 'other',
    plasticityIndexPct: l.plasticityIndexPct ?? null,
    ocr: l.ocr ?? null,
    finesContentPct: l.finesContentPct ?? null,
    k0: l.k0 ?? null,
    workingStrainPct: l.workingStrainPct ?? null,
  };
}

/** The document as project.json version 2 (the writer validates it against the schema). */
export function toProjectJson(doc: ProjectDocument, version = softwareVersion()): ProjectJson {
  const s = doc.survey;
  const deviation = new Set(Object.values(doc.deviationFiles ?? {}));
  const logs = new Set(doc.recordLogs ?? []);
  return {
    format: PROJECT_FORMAT,
    version: PROJECT_VERSION,
    softwareVersion: version,
    savedAt: doc.savedAt,
    files: doc.files.map((path) => ({
      path,
      role: deviation.has(path) ? 'deviation' : logs.has(path) ? 'record-log' : 'wave',
      ...(doc.sampleIntervalsS?.[path] !== undefined ? { sampleIntervalS: doc.sampleIntervalsS[path] } : {}),
    })),
    survey: {
      name: s.name,
      siteName: s.siteName ?? '',
      testDate: s.testDate ?? null,
      kind: s.kind,
      receiverCount: s.receiverCount === 2 ? 2 : 1,
      boreholes: s.boreholes.map((h) => ({
        holeId: h.id,
        collarEastM: h.collarEastM,
        collarNorthM: h.collarNorthM,
        deviation: h.deviation.map((d) => ({ ...d })),
        deviationFile: doc.deviationFiles?.[h.id] ?? null,
      })),
      mainHoleId: s.mainHoleId,
      receiverHoleIds: [...s.receiverHoleIds],
      sourceOffsetM: s.sourceOffsetM,
      sourceDepthM: s.sourceDepthM,
      receiverSpacingM: s.receiverSpacingM,
      coneOffsetM: s.coneOffsetM,
      hitSwap: s.hitSwap ?? false,
      channelMap: (s.channelMap ?? []).map((c) => ({ ...c, source: c.source ?? 'default' })),
      records: s.records.map(recordToJson),
      soil: {
        waterTableM: s.soil.waterTableM,
        waterUnitWeightKnM3: s.soil.waterUnitWeightKnM3,
        layers: s.soil.layers.map(layerToJson),
      },
    },
    settings: doc.settings,
    edits: {
      picks: { ...doc.edits.picks },
      excludedStations: [...doc.edits.excludedStations],
      chosenMethod: { ...doc.edits.chosenMethod },
      excludedIntervals: [...doc.edits.excludedIntervals],
      azimuthDeg: { ...(doc.edits.azimuthDeg ?? {}) },
    },
    ...(doc.view ? { view: doc.view } : {}),
    ...(doc.notes !== undefined ? { notes: doc.notes } : {}),
    ...(doc.comparison ? { comparison: doc.comparison } : {}),
  };
}

/**
 * project.json version 2 (already checked against the schema) as the program's document. Records are
 * keyed by their file path; two records naming one file are refused (PROJECT_BAD_FIELD).
 */
export function fromProjectJson(json: ProjectJson, archiveName: string): ProjectDocument {
  const s = json.survey;
  const seen = new Set<string>();
  const records: RecordAssignment[] = (s.records ?? []).map((r, i) => {
    if (seen.has(r.file))
      throw new BorewaveError(
        'PROJECT_BAD_FIELD',
        `project.json: survey.records[${i}].file "${r.file}" is placed twice; one record per file.`,
        archiveName,
        `survey.records[${i}].file`,
      );
    seen.add(r.file);
    return {
      recordId: r.file,
      depthM: r.depthM.value,
      depthSource: r.depthM.source,
      hit: r.hit.value,
      hitSource: r.hit.source,
      channels: r.channels.map((c) => ({
        channel: c.channel,
        receiver: c.receiver as ReceiverSlot,
        component: c.component,
        source: c.source,
      })),
      excluded: r.excluded,
    };
  });
  const deviationFiles: Record<string, string> = {};
  const boreholes: Borehole[] = s.boreholes.map((h) => {
    if (h.deviationFile) deviationFiles[h.holeId] = h.deviationFile;
    return { id: h.holeId, collarEastM: h.collarEastM, collarNorthM: h.collarNorthM, deviation: h.deviation };
  });
  const sampleIntervalsS: Record<string, number> = {};
  for (const f of json.files) if (f.sampleIntervalS !== undefined) sampleIntervalsS[f.path] = f.sampleIntervalS;
  const survey: Survey = {
    name: s.name,
    siteName: s.siteName,
    testDate: s.testDate,
    kind: s.kind,
    receiverCount: s.receiverCount,
    boreholes,
    mainHoleId: s.mainHoleId,
    sourceOffsetM: s.sourceOffsetM,
    sourceDepthM: s.sourceDepthM,
    receiverSpacingM: s.receiverSpacingM,
    coneOffsetM: s.coneOffsetM,
    receiverHoleIds: [...s.receiverHoleIds],
    hitSwap: s.hitSwap,
    channelMap: s.channelMap.map((c) => ({ ...c, receiver: c.receiver as ReceiverSlot })),
    records,
    soil: { ...s.soil, layers: s.soil.layers.map((l) => ({ ...l })) },
  };
  const edits = json.edits as unknown as UserEdits;
  return {
    format: PROJECT_FORMAT,
    version: PROJECT_VERSION,
    savedAt: json.savedAt,
    softwareVersion: json.softwareVersion,
    survey,
    settings: mergeSettings(json.settings as SettingsPatch),
    edits: {
      picks: { ...edits.picks },
      excludedStations: [...edits.excludedStations],
      chosenMethod: { ...edits.chosenMethod },
      excludedIntervals: [...edits.excludedIntervals],
      azimuthDeg: { ...(edits.azimuthDeg ?? {}) },
    },
    files: json.files.map((f) => f.path),
    deviationFiles,
    recordLogs: json.files.filter((f) => f.role === 'record-log').map((f) => f.path),
    ...(Object.keys(sampleIntervalsS).length ? { sampleIntervalsS } : {}),
    ...(json.notes !== undefined ? { notes: json.notes } : {}),
    ...(json.comparison ? { comparison: json.comparison } : {}),
    ...(json.view ? { view: json.view } : {}),
    ...(s.records === undefined ? { placementInferred: true } : {}),
  };
}
