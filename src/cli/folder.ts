/**
 * `cli profile <folder>` on a folder of field files: (a) no project.json, geometry from flags
 * (--kind, --source-offset-m, --receiver-spacing-m, --cone-offset-m, --hole, --records,
 * --file-name-pattern, --max-header-depth-m), or (b) a project.json whose survey has the boreholes and
 * geometry but no `records`. Placement is inferred by the same core code as the app
 * (core/setup/infer.ts); every inference is printed and the completed project.json written to --out.
 */
import { readdirSync, readFileSync, statSync } from 'node:fs';
import { isAbsolute, join, relative, resolve } from 'node:path';
import {
  newProjectDocument,
  parseProjectJson,
  softwareVersion,
  toProjectJson,
  type OpenedProject,
  type ProjectDocument,
} from '../core';
import { decodeUtf8 } from '../core';
import { readDeviationTable } from '../core';
import { readWaveFile } from '../core';
import { looksLikeRecordLog, readRecordLog, type RecordLog } from '../core';
import type { ErrorInfo, PlacementSettings } from '../core';
import type { Borehole, WaveRecord } from '../core';
import { describeInferences, inferSetup, type SetupResult } from '../core';
import { toLegacySurvey } from '../core';
import { defaultPlacementSettings, SETUP_KINDS, type SetupGeometry, type SetupKind } from '../core';
import { DEFAULT_WATER_UNIT_WEIGHT_KNM3 } from '../core';

export interface FolderFlags {
  kind?: string;
  sourceOffsetM?: number;
  receiverSpacingM?: number;
  coneOffsetM?: number;
  receiverCount?: number;
  records?: string;
  fileNamePattern?: string;
  maxHeaderDepthM?: number;
  /** Crosshole holes "name=east,north": source first, then near and far receivers. */
  holes: string[];
}

export interface FolderSetup {
  opened: OpenedProject;
  setup: SetupResult;
  lines: string[];
  issues: ErrorInfo[];
  /** project.json to write to --out (the current format, plus the placement with its sources). */
  completed: unknown;
}

/** Every file under dir (relative paths with '/'), folders included, project.json excluded. */
function listFiles(dir: string, sub = ''): string[] {
  const out: string[] = [];
  for (const name of readdirSync(join(dir, sub)).sort()) {
    const rel = sub ? `${sub}/${name}` : name;
    if (statSync(join(dir, rel)).isDirectory()) out.push(...listFiles(dir, rel));
    else if (rel !== 'project.json') out.push(rel);
  }
  return out;
}

function parseHole(spec: string): Borehole {
  const at = spec.lastIndexOf('=');
  const [e, n] = (at > 0 ? spec.slice(at + 1) : '').split(',').map(Number);
  if (at <= 0 || !Number.isFinite(e) || !Number.isFinite(n))
    throw new Error(`--hole ${spec}: expected name=east,north (m), e.g. R1=3,0`);
  return { id: spec.slice(0, at), collarEastM: e, collarNorthM: n, deviation: [] };
}

function num(v: unknown, fallback: number): number {
  return typeof v === 'number' && Number.isFinite(v) ? v : fallback;
}

export function openFieldFolder(dir: string, flags: FolderFlags, callerDir: string): FolderSetup {
  const issues: ErrorInfo[] = [];
  const projectPath = join(dir, 'project.json');
  let raw: Record<string, unknown> | null = null;
  try {
    raw = JSON.parse(readFileSync(projectPath, 'utf8')) as Record<string, unknown>;
  } catch (e) {
    if ((e as NodeJS.ErrnoException).code !== 'ENOENT')
      throw new Error(`${projectPath} is not valid JSON: ${(e as Error).message}`);
  }
  const rs = (raw?.survey ?? {}) as Record<string, unknown>;
  const kindText = flags.kind ?? (typeof rs.kind === 'string' ? rs.kind : undefined);
  if (!kindText) throw new Error(`${dir} has no project.json: give --kind ${SETUP_KINDS.join('|')}`);
  if (!SETUP_KINDS.includes(kindText as SetupKind))
    throw new Error(`--kind ${kindText} is not one of ${SETUP_KINDS.join(', ')}`);
  const kind = kindText as SetupKind;
  const settingsRaw = ((raw?.settings as Record<string, unknown> | undefined)?.placement ?? {}) as Record<
    string,
    unknown
  >;
  const placement: PlacementSettings = {
    ...defaultPlacementSettings(),
    maxHeaderDepthM: flags.maxHeaderDepthM ?? num(settingsRaw.maxHeaderDepthM, 200),
    fileNamePattern:
      flags.fileNamePattern ?? (typeof settingsRaw.fileNamePattern === 'string' ? settingsRaw.fileNamePattern : ''),
  };
  // Boreholes: project.json, else --hole flags, else one vertical hole.
  let boreholes: Borehole[] = Array.isArray(rs.boreholes)
    ? (rs.boreholes as Record<string, unknown>[]).map((b) => ({
        id: String(b.id ?? b.holeId),
        collarEastM: num(b.collarEastM, 0),
        collarNorthM: num(b.collarNorthM, 0),
        deviation: Array.isArray(b.deviation) ? (b.deviation as Borehole['deviation']) : [],
      }))
    : [];
  if (flags.holes.length) boreholes = flags.holes.map(parseHole);
  if (kind === 'crosshole' && boreholes.length < 3)
    throw new Error(
      'crosshole needs three holes: --hole <source>=E,N --hole <near>=E,N --hole <far>=E,N (or a project.json)',
    );
  if (boreholes.length === 0)
    boreholes = [{ id: kind === 'seismic-cone' ? 'SC1' : 'BH1', collarEastM: 0, collarNorthM: 0, deviation: [] }];
  const mainHoleId = typeof rs.mainHoleId === 'string' && !flags.holes.length ? rs.mainHoleId : boreholes[0].id;
  const receiverHoleIds =
    Array.isArray(rs.receiverHoleIds) && !flags.holes.length
      ? (rs.receiverHoleIds as string[])
      : boreholes.slice(1, 3).map((b) => b.id);
  const holeById = new Map(boreholes.map((b) => [b.id, b]));
  const defaultCount = kind === 'downhole' || kind === 'seismic-cone' ? 1 : 2;
  const receiverCount = (flags.receiverCount ?? num(rs.receiverCount, defaultCount)) === 2 ? 2 : 1;
  const geometry: SetupGeometry = {
    kind,
    receiverCount: kind === 'downhole-pair' || kind === 'crosshole' ? 2 : kind === 'downhole' ? 1 : receiverCount,
    receiverSpacingM: flags.receiverSpacingM ?? num(rs.receiverSpacingM, kind === 'downhole-pair' ? 1 : 0),
    coneOffsetM: flags.coneOffsetM ?? num(rs.coneOffsetM, 0),
    receiverHoles: receiverHoleIds.map((id) => {
      const h = holeById.get(id);
      return { holeId: id, collarEastM: h?.collarEastM ?? 0, collarNorthM: h?.collarNorthM ?? 0 };
    }),
  };
  if (kind === 'seismic-cone' && !(geometry.coneOffsetM > 0))
    throw new Error(
      'seismic-cone: give --cone-offset-m (the receiver sits this far above the tip, from the cone specification)',
    );
  const sourceOffsetM = flags.sourceOffsetM ?? num(rs.sourceOffsetM, kind === 'crosshole' ? 0 : Number.NaN);
  if (!Number.isFinite(sourceOffsetM))
    throw new Error(`${kind}: give --source-offset-m (horizontal source offset from the hole, m)`);

  // Deviation files named in project.json (form b) are attachments, not waveforms.
  const deviationFiles = (raw?.deviationFiles ?? {}) as Record<string, string>;
  const attach = new Set(Object.values(deviationFiles));
  for (const [holeId, file] of Object.entries(deviationFiles)) {
    const h = holeById.get(holeId);
    if (!h) continue;
    try {
      h.deviation = readDeviationTable(readFileSync(join(dir, file), 'utf8'), file);
    } catch (e) {
      issues.push({ code: 'DEVIATION_BAD', message: `${file}: ${(e as Error).message}`, file });
    }
  }
  // Record log: --records (relative to the caller's folder), else a CSV in the folder that reads as one.
  let log: RecordLog | null = null;
  let logRel: string | null = null;
  if (flags.records) {
    const path = isAbsolute(flags.records) ? flags.records : resolve(callerDir, flags.records);
    log = readRecordLog(readFileSync(path, 'utf8'), flags.records);
    const rel = relative(dir, path);
    if (!rel.startsWith('..')) logRel = rel.replace(/\\/g, '/');
  }
  const files: { name: string; bytes: Uint8Array }[] = [];
  const records: WaveRecord[] = [];
  for (const name of listFiles(dir)) {
    if (attach.has(name) || name === logRel) continue;
    const bytes = new Uint8Array(readFileSync(join(dir, name)));
    if (/\.(csv|txt)$/i.test(name) && looksLikeRecordLog(decodeUtf8(bytes.subarray(0, 4096)))) {
      if (!log) {
        log = readRecordLog(decodeUtf8(bytes), name);
        logRel = name;
      }
      continue;
    }
    const out = readWaveFile(bytes, name);
    if (out.ok) {
      records.push({ ...out.record, id: name, fileName: name });
      files.push({ name, bytes });
    } else issues.push(out.error);
  }
  const setup = inferSetup({ records, geometry, settings: placement, log });
  const rawSoil = rs.soil as Record<string, unknown> | undefined;
  const soil = {
    layers: Array.isArray(rawSoil?.layers) ? (rawSoil!.layers as never[]) : [],
    waterTableM: typeof rawSoil?.waterTableM === 'number' ? rawSoil.waterTableM : null,
    waterUnitWeightKnM3: num(rawSoil?.waterUnitWeightKnM3, DEFAULT_WATER_UNIT_WEIGHT_KNM3),
  };
  const survey = toLegacySurvey({
    name:
      typeof rs.name === 'string' ? rs.name : (dir.replace(/\\/g, '/').split('/').filter(Boolean).pop() ?? 'survey'),
    geometry,
    boreholes,
    mainHoleId,
    sourceOffsetM,
    sourceDepthM: num(rs.sourceDepthM, 0),
    soil,
    records: setup.records,
  });
  // Settings, edits, notes and comparison of form (b) come through the one project parser (v1 migrated).
  const base = raw ? parseProjectJson(raw, dir) : newProjectDocument(survey);
  const doc: ProjectDocument = {
    ...base,
    survey,
    settings: { ...base.settings, placement },
    files: files.map((f) => f.name),
    ...(Object.keys(deviationFiles).length ? { deviationFiles } : {}),
    placementInferred: false,
  };
  const lines = [
    `set-up: ${records.length} waveform files, kind ${kind}${log ? `, record log ${log.name}` : ''}`,
    ...describeInferences(setup).map((l) => `  ${l}`),
  ];
  issues.push(...setup.problems);
  // Every value's source is in the records (depthSource, hitSource, channel source); rejected header
  // values are printed above, not stored (the project schema takes no extra keys).
  const completed = toProjectJson(doc, softwareVersion());
  const recordMap = new Map(records.map((r) => [r.id, r]));
  const parsed = records.map((r) => ({ name: r.id, outcome: { ok: true as const, record: r } }));
  return {
    opened: { doc, files, missing: [], parsed, records: recordMap, issues: [] },
    setup,
    lines,
    issues,
    completed,
  };
}
