/**
 * Forward-model survey variants built to break the set-up: every component order, files named by
 * instrument numbering in shuffled order with depths only in a record log, seismograph spread positions
 * in RECEIVER_LOCATION, text files with component column names, crosshole holes with user names (any
 * text), and a seismic-cone sounding at 0.5 m steps with the tip depth logged. Each variant carries the
 * truth (logged depth, hit, channel meanings) the set-up must recover.
 */
import { encodeUtf8 } from '../io/bytes';
import { writeRecordLog } from '../io/recordlog';
import { writeSeg2 } from '../io/seg2';
import type { Borehole, Component, HitDirection, Trace, WaveRecord } from '../model';
import { mulberry32 } from '../random';
import type { ReceiverSlot, SetupKind } from '../setup/types';
import { demoCrossholeHoles, demoEarthModel } from './demo';
import type { EarthModel } from './earth';
import { synthesizeSurvey, toSeg2Input, type SynthGeometry, type SynthOptions, type SynthResult } from './synthesize';

export type LabelStyle =
  /** Component word in each trace's RECEIVER string ("R H1"; crosshole "<hole> V"). */
  | 'receiver-words'
  /** SEG-2 REGISTRATION_DIRECTION X/Y/Z only. */
  | 'registration'
  /** Text files: component column names as Z N E. */
  | 'zne'
  /** Nothing says which channel is which. */
  | 'none';

export type LocationStyle =
  /** RECEIVER_LOCATION = hole collar x y and the logged depth (cone: the tip). */
  | 'depth'
  /** Spread position of each channel: 0, 1, 2 ... */
  | 'spread-index'
  /** Station numbers 1001, 1002 ... per channel. */
  | 'station-numbers'
  /** One station number (1004) on every trace. */
  | 'one-station'
  | 'none';

export interface VariantSpec {
  kind: SetupKind;
  seed: number;
  /** Component order per receiver (a permutation of H1 H2 V; crosshole of V H1). */
  componentOrder: Component[];
  labels: LabelStyle;
  locations: LocationStyle;
  /** 'depth-names' = dh_d3.0_L.sg2; 'instrument' = 1.sg2, 2.sg2 ... in shuffled order. */
  naming: 'depth-names' | 'instrument';
  /** Keep the NOTE lines (hit and depth words). */
  notes: boolean;
  format: 'seg2' | 'text';
  /** Crosshole hole names: source, near, far (any text). */
  holeNames?: [string, string, string];
  /** Seismic cone: receiver above the tip, m. */
  coneOffsetM?: number;
  /** Number of depths (keeps tests small); default 12. */
  depthCount?: number;
  /** Depth step, m; default 1 (cone 0.5). */
  stepM?: number;
  /** Earth model (default the demo's) and source offset (default cone 1 m, others 2 m). */
  model?: EarthModel;
  sourceOffsetM?: number;
  /** Forward-model options over the variant's own (turning probe, hit plan, noise, trigger offsets ...). */
  synth?: Partial<SynthOptions>;
}

export interface VariantChannelTruth {
  channel: number;
  receiver: ReceiverSlot;
  component: Component;
}

export interface VariantRecordTruth {
  file: string;
  /** Record id the forward model gave it (its survey's recordId). */
  synthRecordId: string;
  /** Logged depth: receiver (downhole), upper receiver (pair), tip (cone), test depth (crosshole). */
  loggedDepthM: number;
  /** Depth of each receiver slot, m. */
  receiverDepthsM: Partial<Record<ReceiverSlot, number>>;
  hit: HitDirection;
  channels: VariantChannelTruth[];
}

export interface VariantSurvey {
  spec: VariantSpec;
  files: { name: string; bytes: Uint8Array }[];
  /** Record log CSV (file, depth_m, hit) that an operator would keep. */
  recordLogCsv: string;
  truth: VariantRecordTruth[];
  /** Geometry a user would enter. */
  geometry: {
    sourceOffsetM: number;
    receiverSpacingM: number;
    coneOffsetM: number;
    holes: Borehole[];
  };
  synth: SynthResult;
}

const COMMON = {
  attenuation: true,
  snr: 30,
  maxTriggerDelayS: 1e-4,
  pToSRatio: 0.2,
  receiverRotationRad: 0.1,
  receiverTiltRad: 0.05,
} as const;

function range(start: number, step: number, count: number): number[] {
  return Array.from({ length: count }, (_, i) => Math.round((start + i * step) * 1000) / 1000);
}

function slotOf(receiver: string, kind: SetupKind, holes: Borehole[]): ReceiverSlot {
  if (kind === 'crosshole') return receiver === holes[2]?.id ? 'r1' : 'r0';
  return receiver === 'lower' ? 'r1' : 'r0';
}

const ZNE: Record<Component, string> = { V: 'Z', H1: 'N', H2: 'E' };
const XYZ: Record<Component, string> = { V: 'Z', H1: 'X', H2: 'Y' };

function shuffle<T>(xs: T[], seed: number): T[] {
  const rng = mulberry32(seed);
  const a = [...xs];
  for (let i = a.length - 1; i > 0; i--) {
    const j = Math.floor(rng.uniform() * (i + 1));
    [a[i], a[j]] = [a[j], a[i]];
  }
  return a;
}

function textFile(rec: WaveRecord, names: string[]): string {
  const t0 = rec.traces[0];
  const lines = [['time_ms', ...names].join(',')];
  for (let i = 0; i < t0.samples.length; i++) {
    const t = (t0.delayS + i * t0.sampleIntervalS) * 1000;
    lines.push([t.toFixed(4), ...rec.traces.map((tr) => tr.samples[i].toPrecision(6))].join(','));
  }
  return `${lines.join('\n')}\n`;
}

/** Build one variant survey (deterministic for its spec). */
export function makeVariantSurvey(spec: VariantSpec): VariantSurvey {
  const model = spec.model ?? demoEarthModel();
  const n = spec.depthCount ?? 12;
  const coneOffsetM = spec.kind === 'seismic-cone' ? (spec.coneOffsetM ?? 0.25) : 0;
  const step = spec.stepM ?? (spec.kind === 'seismic-cone' ? 0.5 : 1);
  const sourceOffsetM = spec.sourceOffsetM ?? (spec.kind === 'seismic-cone' ? 1.0 : 2.0);
  const receiverSpacingM = spec.kind === 'downhole-pair' ? 1.0 : 0;
  let holes: Borehole[] = [];
  let geometry: SynthGeometry;
  // Logged depths (tip for the cone).
  const logged = range(spec.kind === 'crosshole' ? 1.5 : 1, spec.kind === 'crosshole' ? 1.5 : step, n);
  if (spec.kind === 'crosshole') {
    const names = spec.holeNames ?? ['B1', 'B2', 'B3'];
    holes = demoCrossholeHoles().map((h, i) => ({ ...h, id: names[i] }));
    geometry = { kind: 'crosshole', holes: holes as [Borehole, Borehole, Borehole], depthsM: logged };
  } else if (spec.kind === 'downhole-pair') {
    geometry = { kind: 'downhole-pair', holeId: 'DH1', upperDepthsM: logged, receiverSpacingM, sourceOffsetM };
  } else {
    const receiverDepths = logged.map((d) => Math.round((d - coneOffsetM) * 1000) / 1000);
    geometry = {
      kind: 'downhole',
      holeId: spec.kind === 'seismic-cone' ? 'SC1' : 'DH1',
      depthsM: receiverDepths,
      sourceOffsetM,
    };
  }
  const synth = synthesizeSurvey(model, geometry, {
    ...COMMON,
    seed: spec.seed,
    sampleIntervalS: spec.kind === 'crosshole' ? 2.5e-5 : 1e-4,
    samplesPerTrace: spec.kind === 'crosshole' ? 2048 : 1536,
    firstSampleS: spec.kind === 'crosshole' ? -0.001 : 0,
    sFrequencyHz: spec.kind === 'crosshole' ? 300 : 80,
    pFrequencyHz: spec.kind === 'crosshole' ? 1500 : 300,
    surveyName: `Variant ${spec.kind} ${spec.seed}`,
    filePrefix: spec.kind === 'seismic-cone' ? 'scpt' : undefined,
    ...spec.synth,
  });
  const truth: VariantRecordTruth[] = [];
  const out: { rec: WaveRecord; names: string[]; t: VariantRecordTruth }[] = [];
  synth.records.forEach((rec, ri) => {
    const rt = synth.truth.records[ri];
    const loggedDepthM = spec.kind === 'seismic-cone' ? Math.round((rt.depthM + coneOffsetM) * 1000) / 1000 : rt.depthM;
    // Group traces by receiver (synth order: receiver by receiver), then put each group in the wanted order.
    const groups = new Map<string, { trace: Trace; comp: Component }[]>();
    rec.traces.forEach((t, i) => {
      const ct = rt.channels[i];
      groups.set(ct.receiver, [...(groups.get(ct.receiver) ?? []), { trace: t, comp: ct.component }]);
    });
    const traces: Trace[] = [];
    const chTruth: VariantChannelTruth[] = [];
    const colNames: string[] = [];
    const receiverDepthsM: Partial<Record<ReceiverSlot, number>> = {};
    for (const [receiver, list] of groups) {
      const slot = slotOf(receiver, spec.kind, holes);
      const order = spec.componentOrder.filter((c) => list.some((x) => x.comp === c));
      const rest = list.filter((x) => !order.includes(x.comp)).map((x) => x.comp);
      for (const comp of [...order, ...rest]) {
        const src = list.find((x) => x.comp === comp)!;
        const channel = traces.length + 1;
        const recDepth = rt.channels.find((c) => c.receiver === receiver)!.receiverPositionM[2];
        receiverDepthsM[slot] = Math.round(recDepth * 1000) / 1000;
        const strings: Record<string, string> = {};
        if (spec.labels === 'receiver-words') strings.RECEIVER = `${receiver} ${comp}`;
        else if (spec.labels === 'registration') strings.REGISTRATION_DIRECTION = XYZ[comp];
        else if (spec.kind === 'crosshole') strings.RECEIVER = `${receiver}`;
        let loc: number[] | undefined;
        const nominal = src.trace.receiverLocation ?? [0, 0, 0];
        if (spec.locations === 'depth')
          loc = [nominal[0], nominal[1], spec.kind === 'seismic-cone' ? loggedDepthM : nominal[2]];
        else if (spec.locations === 'spread-index') loc = [channel - 1];
        else if (spec.locations === 'station-numbers') loc = [1000 + channel];
        else if (spec.locations === 'one-station') loc = [1004];
        traces.push({ ...src.trace, channel, receiverLocation: loc, strings });
        chTruth.push({ channel, receiver: slot, component: comp });
        const word = spec.labels === 'zne' ? ZNE[comp] : spec.labels === 'none' ? `ch${channel}` : comp;
        colNames.push(spec.kind === 'crosshole' && spec.labels !== 'none' ? `${receiver} ${word}` : word);
      }
    }
    const notes = spec.notes
      ? [`HIT ${rt.hit}`, `${spec.kind === 'seismic-cone' ? 'TIP DEPTH' : 'DEPTH'} ${loggedDepthM.toFixed(2)} M`]
      : [];
    const t: VariantRecordTruth = {
      file: rec.fileName,
      synthRecordId: rec.id,
      loggedDepthM,
      receiverDepthsM,
      hit: rt.hit,
      channels: chTruth,
    };
    out.push({ rec: { ...rec, notes, traces }, names: colNames, t });
  });
  // Names.
  const order = spec.naming === 'instrument' ? shuffle(out, spec.seed + 7) : out;
  const files: { name: string; bytes: Uint8Array }[] = [];
  order.forEach((o, i) => {
    const ext = spec.format === 'text' ? 'csv' : 'sg2';
    const name = spec.naming === 'instrument' ? `${i + 1}.${ext}` : o.rec.fileName.replace(/\.sg2$/, `.${ext}`);
    o.t.file = name;
    const bytes =
      spec.format === 'text'
        ? encodeUtf8(textFile(o.rec, o.names))
        : writeSeg2(toSeg2Input({ ...o.rec, fileStrings: { UNITS: 'METERS' } }), {
            byteOrder: 'little',
            formatCode: 4,
          });
    // toSeg2Input drops RECEIVER_LOCATION strings; the writer writes receiverLocation itself.
    files.push({ name, bytes });
    truth.push(o.t);
  });
  truth.sort((a, b) => a.file.localeCompare(b.file, undefined, { numeric: true }));
  files.sort((a, b) => a.name.localeCompare(b.name, undefined, { numeric: true }));
  const recordLogCsv = writeRecordLog(truth.map((t) => ({ file: t.file, depthM: t.loggedDepthM, hit: t.hit })));
  return {
    spec,
    files,
    recordLogCsv,
    truth,
    geometry: { sourceOffsetM, receiverSpacingM, coneOffsetM, holes },
    synth,
  };
}
