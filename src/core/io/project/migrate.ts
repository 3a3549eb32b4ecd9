/**
 * Version 1 -> version 2 of project.json (docs/project-format.md, "Migration from version 1"):
 * receivers named 'R', 'upper'/'lower' or by hole id become slots r0, r1; `assignedBy` becomes each
 * value's source ('manual' -> 'user'); station and interval keys in the edits are rewritten to slots and
 * LOGGED depths in whole millimetres. A v1 file opens to the same profile.
 */
import type { Component, Survey } from '../../model';
import { BorewaveError } from '../../errors';
import { emptyEdits, mergeSettings, type SettingsPatch, type UserEdits } from '../../settings';
import { toProjectJson, type ProjectDocument } from './document';
import type { ProjectJson } from './schema';
import {
  intervalKey,
  pickEditKey,
  receiverSlot,
  stationKey,
  stationWaveKey,
  type ReceiverSlot,
  type StationKey,
} from '../../keys';

type Json = Record<string, unknown>;

interface V1Survey {
  kind: string;
  receiverSpacingM?: number;
  receiverHoleIds?: string[];
}

/** The slot a v1 receiver name stands for (null = unknown name). */
export function v1ReceiverSlot(survey: V1Survey, receiver: string): ReceiverSlot | null {
  if (survey.kind === 'crosshole') {
    const i = (survey.receiverHoleIds ?? []).indexOf(receiver);
    return i >= 0 ? receiverSlot(i) : null;
  }
  if (receiver === 'R' || receiver === 'upper') return 'r0';
  if (receiver === 'lower') return 'r1';
  return null;
}

/** A v1 station key `<receiver>@<depth, 3 decimals>:<component>` as a v2 key (null when it is not one). */
export function v1StationKey(survey: V1Survey, key: string): StationKey | null {
  const m = /^(.*)@(-?[0-9]+(?:\.[0-9]+)?):(H1|H2|V)$/s.exec(key);
  if (!m) return null;
  const slot = v1ReceiverSlot(survey, m[1]);
  if (!slot) return null;
  // v1 keyed the lower receiver by its own depth; v2 by the logged (upper) depth.
  const depthM = Number(m[2]) - (slot === 'r1' && survey.kind === 'downhole-pair' ? (survey.receiverSpacingM ?? 0) : 0);
  return stationKey(slot, depthM, m[3] as Component);
}

/** A v1 interval key `<wave>:<station a>><station b>` (hole names may hold '>'): v2 key or null. */
export function v1IntervalKey(survey: V1Survey, key: string) {
  const m = /^(S|P):(.*)$/s.exec(key);
  if (!m) return null;
  const wave = m[1] as 'S' | 'P';
  const rest = m[2];
  for (let i = rest.indexOf('>'); i >= 0; i = rest.indexOf('>', i + 1)) {
    const a = v1StationKey(survey, rest.slice(0, i));
    const b = v1StationKey(survey, rest.slice(i + 1));
    if (a && b) return intervalKey(wave, a, b);
  }
  return null;
}

const SOURCE_OF: Record<string, string> = { header: 'header', filename: 'filename', manual: 'user' };

/**
 * Rewrites the v1 survey and edits in place of a parsed v1 document (receivers, sources, keys); keys
 * that cannot be read are dropped and listed in `dropped`.
 */
export function migrateV1SurveyAndEdits(doc: Json): { dropped: string[] } {
  const dropped: string[] = [];
  const survey = (doc.survey ?? {}) as Json & V1Survey;
  const kind = survey.kind;
  survey.receiverCount = kind === 'downhole' ? 1 : 2;
  survey.coneOffsetM = 0.2;
  const records = Array.isArray(survey.records) ? (survey.records as Json[]) : [];
  for (const r of records) {
    const by = SOURCE_OF[String(r.assignedBy)] ?? 'user';
    r.depthSource = by;
    r.hitSource = by;
    delete r.assignedBy;
    const channels = Array.isArray(r.channels) ? (r.channels as Json[]) : [];
    r.channels = channels.flatMap((c) => {
      const slot = v1ReceiverSlot(survey, String(c.receiver));
      if (!slot) {
        dropped.push(`${String(r.recordId)} channel ${String(c.channel)}`);
        return [];
      }
      return [{ ...c, receiver: slot }];
    });
  }
  const edits = (doc.edits ?? {}) as Json;
  const picks: Record<string, number> = {};
  for (const [k, t] of Object.entries((edits.picks ?? {}) as Record<string, number>)) {
    const parts = /^(.*)\|(S|P)\|(onset|peak|trough|zero-crossing)$/s.exec(k);
    const st = parts && v1StationKey(survey, parts[1]);
    if (parts && st) picks[pickEditKey(st, parts[2] as 'S' | 'P', parts[3])] = t;
    else dropped.push(k);
  }
  const excludedStations: string[] = [];
  for (const k of (edits.excludedStations ?? []) as string[]) {
    const parts = /^(.*)\|(S|P)$/s.exec(k);
    const st = parts && v1StationKey(survey, parts[1]);
    if (parts && st) excludedStations.push(stationWaveKey(st, parts[2] as 'S' | 'P'));
    else dropped.push(k);
  }
  const chosenMethod: Record<string, unknown> = {};
  for (const [k, m] of Object.entries((edits.chosenMethod ?? {}) as Record<string, unknown>)) {
    const ik = v1IntervalKey(survey, k);
    if (ik) chosenMethod[ik] = m;
    else dropped.push(k);
  }
  const excludedIntervals: string[] = [];
  for (const k of (edits.excludedIntervals ?? []) as string[]) {
    const ik = v1IntervalKey(survey, k);
    if (ik) excludedIntervals.push(ik);
    else dropped.push(k);
  }
  doc.edits = { ...edits, picks, excludedStations, chosenMethod, excludedIntervals };
  return { dropped };
}

const V1_GROUPS: Record<string, [string, string]> = {
  detrend: ['conditioning', 'detrend'],
  taperFraction: ['conditioning', 'taperFraction'],
  bandpassS: ['conditioning', 'bandpassS'],
  bandpassP: ['conditioning', 'bandpassP'],
  useReversedHits: ['conditioning', 'useReversedHits'],
  onsetMethod: ['picking', 'onsetMethod'],
  staS: ['picking', 'staS'],
  ltaS: ['picking', 'ltaS'],
  staLtaThreshold: ['picking', 'staLtaThreshold'],
  phaseBandHz: ['picking', 'phaseBandHz'],
  vsRangeMps: ['picking', 'vsRangeMps'],
  vpRangeMps: ['picking', 'vpRangeMps'],
  profileMethod: ['intervals', 'profileMethod'],
  methodDisagreementShare: ['intervals', 'methodDisagreementShare'],
  rayFit: ['intervals', 'rayFit'],
  triggerDelayS: ['intervals', 'triggerDelayS'],
  positionSdM: ['intervals', 'positionSdM'],
  vs30Rule: ['site', 'vs30Rule'],
  siteAnswers: ['site', 'siteAnswers'],
  monteCarloDraws: ['site', 'monteCarloDraws'],
  monteCarloSeed: ['site', 'monteCarloSeed'],
};

/**
 * Version 1's flat settings grouped by stage; layerBoundariesM becomes layering (user mode when any
 * boundary is set). Unknown v1 keys are listed in `dropped`.
 */
export function groupV1Settings(flat: Record<string, unknown>): {
  settings: Record<string, Record<string, unknown>>;
  dropped: string[];
} {
  const settings: Record<string, Record<string, unknown>> = {};
  const dropped: string[] = [];
  for (const [k, v] of Object.entries(flat)) {
    if (k === 'layerBoundariesM') {
      const list = Array.isArray(v) ? v : [];
      settings.layering = { ...settings.layering, mode: list.length ? 'user' : 'auto', boundariesM: list };
      continue;
    }
    const at = V1_GROUPS[k];
    if (!at) {
      dropped.push(`settings.${k}`);
      continue;
    }
    settings[at[0]] = { ...settings[at[0]], [at[1]]: v };
  }
  return { settings, dropped };
}

/**
 * A whole version-1 project.json as version 2 (checked by the caller against the schema). The shape
 * checks of version 1 come first, so a broken v1 file names its first bad field as before.
 */
export function migrateV1Document(raw: Record<string, unknown>, sourceName: string): ProjectJson {
  const fail = (field: string, problem: string): never => {
    throw new BorewaveError('PROJECT_BAD_FIELD', `project.json: ${field} ${problem}.`, sourceName, field);
  };
  const s = raw.survey as Record<string, unknown> | undefined;
  if (!s || typeof s !== 'object') fail('survey', 'is missing');
  if (!['downhole', 'downhole-pair', 'crosshole'].includes(String(s!.kind)))
    fail('survey.kind', `"${String(s!.kind)}" is not downhole, downhole-pair or crosshole`);
  // No records at all: the files are placed on open (docs/project-format.md, placement inferred).
  const placementInferred = s!.records === undefined;
  if (!placementInferred && !Array.isArray(s!.records)) fail('survey.records', 'is not a list');
  if (!Array.isArray(s!.boreholes)) fail('survey.boreholes', 'is not a list');
  if (!Array.isArray(raw.files)) fail('files', 'is not a list');
  const d = structuredClone(raw);
  migrateV1SurveyAndEdits(d);
  const grouped = groupV1Settings((d.settings ?? {}) as Record<string, unknown>);
  const survey = d.survey as unknown as Survey;
  const doc: ProjectDocument = {
    format: 'borewave-project',
    version: 2,
    savedAt: typeof d.savedAt === 'string' ? d.savedAt : new Date(0).toISOString(),
    survey: {
      ...survey,
      records: survey.records ?? [],
      soil: survey.soil ?? { layers: [], waterTableM: null, waterUnitWeightKnM3: 9.81 },
    },
    settings: mergeSettings(grouped.settings as SettingsPatch),
    edits: { ...emptyEdits(), ...(d.edits as object) } as UserEdits,
    files: (d.files as unknown[]).map(String),
    ...(d.deviationFiles ? { deviationFiles: d.deviationFiles as Record<string, string> } : {}),
    ...(typeof d.notes === 'string' ? { notes: d.notes } : {}),
    ...(d.comparison ? { comparison: d.comparison as ProjectDocument['comparison'] } : {}),
  };
  const json = toProjectJson(doc, 'unknown (saved as version 1)');
  if (placementInferred) delete json.survey.records;
  return json;
}
