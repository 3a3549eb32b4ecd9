/**
 * The survey set up from the files: every record's depth, hit and channel meanings, each with its
 * source, by the precedence user > log > filename > header > data > default (docs/project-format.md).
 * Pure: the app, the worker and the CLI call this same function.
 */
import type { ErrorInfo } from '../errors';
import type { Component, HitDirection, WaveRecord } from '../model';
import { matchRecordLog, type RecordLog, type RecordLogComponent, type RecordLogRow } from '../io/recordlog';
import { defaultChannel, traceComponent, traceSlotFromText } from './components';
import {
  depthFromNotes,
  depthFromReceiverLocation,
  hitFromHeaders,
  hitWordInFileName,
  placeFromFileName,
} from './depth';
import {
  choosePlaced,
  sourceRank,
  type ChannelPlacement,
  type InferenceSummary,
  type Placed,
  type PlacedRecord,
  type PlacementSettings,
  type PlacementSource,
  type ReceiverSlot,
  type RejectedValue,
  type SetupGeometry,
} from './types';

/**
 * Hook for placement from the waveforms themselves (source 'data'), e.g. hit directions from the
 * polarity of the shear arrival. Not built here: without it hits that nothing names stay unknown.
 */
export type DataPlacementHook = (record: WaveRecord) => { hit?: HitDirection; depthM?: number } | null;

export interface SetupInput {
  records: readonly WaveRecord[];
  geometry: SetupGeometry;
  settings: PlacementSettings;
  log?: RecordLog | null;
  /** Earlier placements (same files): values with source 'user' are kept, record ids reused. */
  previous?: readonly PlacedRecord[];
  dataHook?: DataPlacementHook | null;
}

export interface SetupResult {
  records: PlacedRecord[];
  /** One channel map for all records (the most common placement of each channel). */
  channelMap: ChannelPlacement[];
  rejected: RejectedValue[];
  inferences: InferenceSummary[];
  problems: ErrorInfo[];
}

class Tally {
  private map = new Map<string, InferenceSummary>();
  add(what: InferenceSummary['what'], source: PlacementSource, rule: string, file: string): void {
    const k = `${what}|${source}|${rule}`;
    let s = this.map.get(k);
    if (!s) this.map.set(k, (s = { what, source, rule, count: 0, examples: [] }));
    s.count++;
    if (s.examples.length < 3 && !s.examples.includes(file)) s.examples.push(file);
  }
  list(): InferenceSummary[] {
    const order = ['depth', 'hit', 'receiver', 'component'];
    return [...this.map.values()].sort(
      (a, b) => order.indexOf(a.what) - order.indexOf(b.what) || sourceRank(a.source) - sourceRank(b.source),
    );
  }
}

/** Receiver slot named by a log's receiver text: r0/r1, upper/lower, near/far, or a crosshole hole's user name. */
export function slotFromLogText(text: string | null, g: SetupGeometry): ReceiverSlot | null {
  if (text === null) return null;
  const t = text.trim().toLowerCase();
  if (t === 'r0' || t === 'upper' || t === 'near') return 'r0';
  if (t === 'r1' || t === 'lower' || t === 'far') return 'r1';
  const i = g.receiverHoles.findIndex((h) => h.holeId.trim().toLowerCase() === t);
  return i === 0 ? 'r0' : i === 1 ? 'r1' : null;
}

/** Crosshole: the receiver hole whose collar the trace's RECEIVER_LOCATION x y sit at (within 0.25 m), else null. */
export function slotFromCollar(loc: readonly number[] | undefined, g: SetupGeometry): ReceiverSlot | null {
  if (g.kind !== 'crosshole' || !loc || loc.length < 3) return null;
  const i = g.receiverHoles.findIndex((h) => Math.hypot(loc[0] - h.collarEastM, loc[1] - h.collarNorthM) <= 0.25);
  return i === 0 ? 'r0' : i === 1 ? 'r1' : null;
}

function weaker(a: PlacementSource, b: PlacementSource): PlacementSource {
  return sourceRank(a) >= sourceRank(b) ? a : b;
}

function channelsFor(
  rec: WaveRecord,
  g: SetupGeometry,
  logComps: RecordLogComponent[] | null,
  previous: PlacedRecord | undefined,
  tally: Tally,
  problems: ErrorInfo[],
): ChannelPlacement[] {
  const n = rec.traces.length;
  const holeNames = g.kind === 'crosshole' ? g.receiverHoles.map((h) => h.holeId) : [];
  const twoSlots = g.kind === 'crosshole' || g.receiverCount === 2;
  if (logComps && logComps.length !== n) {
    problems.push({
      code: 'LOG_COMPONENTS_COUNT',
      message: `${rec.fileName}: the record log lists ${logComps.length} components but the file has ${n} channels; the log's components are not used for it.`,
      file: rec.fileName,
      field: 'components',
    });
    logComps = null;
  }
  return rec.traces.map((t, i) => {
    const user = previous?.channels.find((c) => c.channel === t.channel && c.source === 'user');
    if (user) {
      tally.add('component', 'user', 'user edit', rec.fileName);
      return { ...user };
    }
    const def = defaultChannel(g.kind, g.receiverCount, i, n);
    // Receiver slot.
    let slot: Placed<ReceiverSlot> = { value: def.receiver, source: 'default' };
    const logSlot = logComps ? slotFromLogText(logComps[i].receiver, g) : null;
    const textSlot = twoSlots ? (traceSlotFromText(t, g) ?? slotFromCollar(t.receiverLocation, g)) : null;
    if (logSlot) slot = { value: logSlot, source: 'log' };
    else if (textSlot) slot = { value: textSlot, source: 'header' };
    if (twoSlots)
      tally.add(
        'receiver',
        slot.source,
        slot.source === 'log' ? 'record log' : slot.source === 'header' ? 'receiver named in RECEIVER' : 'kind default',
        rec.fileName,
      );
    // Component.
    let comp: Placed<Component> = { value: def.component, source: 'default' };
    let rule = 'kind default';
    const fromText = traceComponent(t, holeNames);
    if (logComps) {
      comp = { value: logComps[i].component, source: 'log' };
      rule = 'record log';
    } else if (fromText) {
      comp = { value: fromText.component, source: 'header' };
      rule = fromText.field === 'COLUMN_NAME' ? 'column name' : `component word in ${fromText.field}`;
    }
    tally.add('component', comp.source, rule, rec.fileName);
    return {
      channel: t.channel,
      receiver: slot.value,
      component: comp.value,
      source: twoSlots ? weaker(slot.source, comp.source) : comp.source,
    };
  });
}

function checkDuplicates(rec: WaveRecord, channels: ChannelPlacement[], problems: ErrorInfo[]): void {
  const seen = new Map<string, number>();
  for (const c of channels) {
    const k = `${c.receiver}:${c.component}`;
    const other = seen.get(k);
    if (other !== undefined) {
      problems.push({
        code: 'CHANNEL_DUPLICATE',
        message: `${rec.fileName}: channels ${other} and ${c.channel} are both ${c.component} of receiver ${c.receiver}; set the channel map.`,
        file: rec.fileName,
        field: `channel ${c.channel}`,
      });
    } else seen.set(k, c.channel);
  }
}

function newRecordId(used: Set<string>): string {
  for (let i = used.size + 1; ; i++) {
    const id = `rec-${String(i).padStart(4, '0')}`;
    if (!used.has(id)) {
      used.add(id);
      return id;
    }
  }
}

/** The most common placement of each channel number over the records (ties: first seen). */
export function commonChannelMap(records: readonly PlacedRecord[]): ChannelPlacement[] {
  const counts = new Map<number, Map<string, { c: ChannelPlacement; n: number }>>();
  for (const r of records) {
    for (const c of r.channels) {
      const byKey = counts.get(c.channel) ?? new Map();
      counts.set(c.channel, byKey);
      const k = `${c.receiver}|${c.component}|${c.source}`;
      const e = byKey.get(k) ?? { c, n: 0 };
      e.n++;
      byKey.set(k, e);
    }
  }
  return [...counts.entries()]
    .sort((a, b) => a[0] - b[0])
    .map(([, m]) => {
      let best: { c: ChannelPlacement; n: number } | null = null;
      for (const e of m.values()) if (!best || e.n > best.n) best = e;
      return { ...best!.c };
    });
}

/** Channels of a record that differ from the survey's channel map (what project.json stores per record). */
export function channelOverrides(
  channels: readonly ChannelPlacement[],
  map: readonly ChannelPlacement[],
): ChannelPlacement[] {
  return channels.filter((c) => {
    const m = map.find((x) => x.channel === c.channel);
    return !m || m.receiver !== c.receiver || m.component !== c.component || m.source !== c.source;
  });
}

/** A record's channels: the survey map, with the record's overrides on top (only channels the file has). */
export function resolveChannels(
  channelNumbers: readonly number[],
  map: readonly ChannelPlacement[],
  overrides: readonly ChannelPlacement[],
): ChannelPlacement[] {
  const out: ChannelPlacement[] = [];
  for (const ch of channelNumbers) {
    const c = overrides.find((x) => x.channel === ch) ?? map.find((x) => x.channel === ch);
    if (c) out.push({ ...c });
  }
  return out;
}

/** Apply one channel map to every record in one step (a user edit: source 'user'); records keep their own overrides only where given. */
export function applyChannelMapToAll(
  records: readonly PlacedRecord[],
  map: readonly { channel: number; receiver: ReceiverSlot; component: Component }[],
): PlacedRecord[] {
  return records.map((r) => ({
    ...r,
    channels: r.channels.map((c) => {
      const m = map.find((x) => x.channel === c.channel);
      return m ? { channel: c.channel, receiver: m.receiver, component: m.component, source: 'user' as const } : c;
    }),
  }));
}

/** Place every record (see the module comment). Never throws on bad input: problems are listed. */
export function inferSetup(input: SetupInput): SetupResult {
  const { geometry: g, settings: s } = input;
  const tally = new Tally();
  const rejected: RejectedValue[] = [];
  const problems: ErrorInfo[] = [];
  const prevByFile = new Map((input.previous ?? []).map((p) => [p.file, p]));
  const used = new Set((input.previous ?? []).map((p) => p.recordId));
  let logRows = new Map<string, RecordLogRow>();
  if (input.log) {
    const m = matchRecordLog(
      input.log,
      input.records.map((r) => r.id),
    );
    logRows = m.byFile;
    for (const row of m.unknown) {
      problems.push({
        code: 'LOG_UNKNOWN_FILE',
        message: `${input.log.name} line ${row.line} names ${row.file}, which is not among the loaded files.`,
        file: input.log.name,
        field: `line ${row.line}`,
      });
    }
    for (const row of m.ambiguous) {
      problems.push({
        code: 'LOG_AMBIGUOUS_FILE',
        message: `${input.log.name} line ${row.line} names ${row.file}, which matches several loaded files in different folders; give the folder.`,
        file: input.log.name,
        field: `line ${row.line}`,
      });
    }
  }
  const records: PlacedRecord[] = input.records.map((rec) => {
    // Records are keyed by their id (the unique session path: two files may share a name).
    const prev = prevByFile.get(rec.id);
    const row = logRows.get(rec.id);
    if (input.log && !row) {
      problems.push({
        code: 'LOG_FILE_NOT_LISTED',
        message: `${rec.fileName} is not in the record log ${input.log.name}.`,
        file: rec.fileName,
      });
    }
    const channels = channelsFor(rec, g, row?.components ?? null, prev, tally, problems);
    checkDuplicates(rec, channels, problems);
    // Depth.
    const fromName = placeFromFileName(rec.fileName, s.fileNamePattern);
    const loc = depthFromReceiverLocation(
      rec,
      channels.map((c) => c.receiver),
      g,
      s,
    );
    const note = loc.depthM ? { depthM: null, rejected: [] } : depthFromNotes(rec, s);
    rejected.push(...loc.rejected, ...note.rejected);
    const data = input.dataHook?.(rec) ?? null;
    const userDepth = prev?.depthM?.source === 'user' ? prev.depthM : null;
    const logDepth: Placed<number> | null = row?.depthM != null ? { value: row.depthM, source: 'log' } : null;
    const dataDepth: Placed<number> | null = data?.depthM != null ? { value: data.depthM, source: 'data' } : null;
    const depthM = choosePlaced([userDepth, logDepth, fromName.depthM, loc.depthM ?? note.depthM, dataDepth]);
    const depthRule =
      depthM === null
        ? 'nothing gives a depth'
        : depthM === userDepth
          ? 'user edit'
          : depthM === logDepth
            ? 'record log'
            : depthM === fromName.depthM
              ? 'file-name pattern'
              : depthM === loc.depthM
                ? 'RECEIVER_LOCATION'
                : depthM === dataDepth
                  ? 'waveforms'
                  : 'depth in NOTE';
    tally.add('depth', depthM?.source ?? 'default', depthRule, rec.fileName);
    // Hit.
    const userHit = prev?.hit?.source === 'user' ? prev.hit : null;
    const logHit: Placed<HitDirection> | null = row?.hit ? { value: row.hit, source: 'log' } : null;
    const nameHit = fromName.hit ?? hitWordInFileName(rec.fileName);
    const headerHit = hitFromHeaders(rec);
    const dataHit: Placed<HitDirection> | null = data?.hit ? { value: data.hit, source: 'data' } : null;
    const hit = choosePlaced([userHit, logHit, nameHit, headerHit, dataHit]);
    const hitRule =
      hit === null
        ? 'nothing names the hit (left unknown)'
        : hit === userHit
          ? 'user edit'
          : hit === logHit
            ? 'record log'
            : hit === nameHit
              ? 'file name'
              : hit === headerHit
                ? 'hit word in NOTE/SOURCE'
                : 'waveforms';
    tally.add('hit', hit?.source ?? 'default', hitRule, rec.fileName);
    return {
      recordId: prev?.recordId ?? newRecordId(used),
      file: rec.id,
      depthM,
      hit,
      channels,
      excluded: prev?.excluded ?? false,
    };
  });
  return { records, channelMap: commonChannelMap(records), rejected, inferences: tally.list(), problems };
}

/** One line per inference rule (the CLI prints these; the Records pane shows the same list). */
export function describeInferences(r: SetupResult): string[] {
  const lines = r.inferences.map(
    (i) => `${i.what}: ${i.rule} [${i.source}] x${i.count} (e.g. ${i.examples.join(', ')})`,
  );
  const byRule = new Map<string, RejectedValue[]>();
  for (const x of r.rejected) byRule.set(x.rule, [...(byRule.get(x.rule) ?? []), x]);
  for (const [rule, xs] of byRule) {
    lines.push(
      `header depth rejected: ${rule} x${xs.length} (e.g. ${xs[0].file}: ${xs[0].field} ${xs[0].value}: ${xs[0].message})`,
    );
  }
  return lines;
}
