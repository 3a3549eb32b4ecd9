/**
 * Stations and their pairing by test kind (survey/stations.ts, velocity/intervals.ts, the kind
 * catalogue). Geometry by hand: receiver depths from the logged depth (two-receiver probe: lower =
 * upper + spacing; cone: receiver coneOffsetM above the logged tip, docs/project-format.md), keys from
 * slots and logged millimetres, straight paths from Pythagoras.
 */
import { describe, expect, it } from 'vitest';
import { blankSurvey, receiverDepthM } from '../../src/core/catalogue/testKinds';
import { stationKey } from '../../src/core/keys';
import { buildStations } from '../../src/core/survey/stations';
import { pairStations } from '../../src/core/velocity/intervals';
import { defaultSettings } from '../../src/core/settings';
import type { RecordAssignment, Survey, WaveRecord } from '../../src/core/model';

function recordOf(id: string, channels: number): WaveRecord {
  const n = 512;
  return {
    id,
    fileName: id,
    format: 'text',
    fileStrings: {},
    notes: [],
    traces: Array.from({ length: channels }, (_, c) => ({
      channel: c + 1,
      samples: Float32Array.from({ length: n }, (_, i) => Math.sin(i / 7 + c)),
      sampleIntervalS: 1e-4,
      delayS: 0,
      strings: {},
    })),
  };
}

function survey(kind: Survey['kind'], count: number, depths: number[]): { s: Survey; recs: Map<string, WaveRecord> } {
  const s: Survey = { ...blankSurvey(kind), receiverCount: count, coneOffsetM: 0.2, receiverSpacingM: 1 };
  const recs = new Map<string, WaveRecord>();
  s.records = depths.map((d, i): RecordAssignment => {
    const id = `r${i}.txt`;
    recs.set(id, recordOf(id, 3 * count));
    return {
      recordId: id,
      depthM: d,
      hit: 'left',
      channels: Array.from({ length: 3 * count }, (_, c) => ({
        channel: c + 1,
        component: (['H1', 'H2', 'V'] as const)[c % 3],
        receiver: c < 3 ? 'r0' : 'r1',
      })),
      excluded: false,
      depthSource: 'user',
      hitSource: 'user',
    };
  });
  return { s, recs };
}

describe('receiver depths from the logged depth', () => {
  it('probe: r1 a spacing below; cone: receiver 0.2 m above the tip, r0 a spacing higher with two', () => {
    const base = { receiverSpacingM: 1, coneOffsetM: 0.2 };
    expect(receiverDepthM({ ...base, kind: 'downhole-pair', receiverCount: 2 }, 'r1', 5)).toBe(6);
    expect(receiverDepthM({ ...base, kind: 'seismic-cone', receiverCount: 1 }, 'r0', 5)).toBeCloseTo(4.8, 12);
    expect(receiverDepthM({ ...base, kind: 'seismic-cone', receiverCount: 2 }, 'r1', 5)).toBeCloseTo(4.8, 12);
    expect(receiverDepthM({ ...base, kind: 'seismic-cone', receiverCount: 2 }, 'r0', 5)).toBeCloseTo(3.8, 12);
    expect(receiverDepthM({ ...base, kind: 'crosshole', receiverCount: 2 }, 'r1', 5)).toBe(5);
  });
});

describe('stations and pairs', () => {
  it('cone with one receiver: keys on the logged tip depth, path to the receiver 0.2 m above, successive pairs', () => {
    const { s, recs } = survey('seismic-cone', 1, [2, 3, 4]);
    const { stations, issues } = buildStations(s, recs, defaultSettings());
    expect(issues).toEqual([]);
    const st = stations.find((x) => x.wave === 'S' && x.loggedDepthM === 3)!;
    expect(st.key).toBe(stationKey('r0', 3, 'H1'));
    expect(st.depthM).toBeCloseTo(2.8, 12);
    // Source 1 m from the push point at the surface: L = sqrt(1^2 + 2.8^2).
    expect(st.straightPathM).toBeCloseTo(Math.hypot(1, 2.8), 12);
    const pairs = pairStations(s, stations).filter((p) => p.wave === 'S');
    expect(pairs.map((p) => [p.kind, p.topM, p.bottomM].join(' '))).toEqual(['pseudo 1.8 2.8', 'pseudo 2.8 3.8']);
  });
  it('two receivers (probe): one true interval per hit, keys of both ends on the logged depth', () => {
    const { s, recs } = survey('downhole-pair', 2, [2, 3]);
    const { stations } = buildStations(s, recs, defaultSettings());
    const pairs = pairStations(s, stations).filter((p) => p.wave === 'S');
    expect(pairs.map((p) => [p.kind, p.a.key, p.b.key, p.topM, p.bottomM].join(' '))).toEqual([
      `true ${stationKey('r0', 2, 'H1')} ${stationKey('r1', 2, 'H1')} 2 3`,
      `true ${stationKey('r0', 3, 'H1')} ${stationKey('r1', 3, 'H1')} 3 4`,
    ]);
  });
  it('changing the cone offset moves the receivers but keeps every station key', () => {
    const { s, recs } = survey('seismic-cone', 1, [2, 3]);
    const a = buildStations(s, recs, defaultSettings()).stations.map((x) => x.key);
    const b = buildStations({ ...s, coneOffsetM: 0.1 }, recs, defaultSettings());
    expect(b.stations.map((x) => x.key)).toEqual(a);
    expect(b.stations.find((x) => x.loggedDepthM === 2)!.depthM).toBeCloseTo(1.9, 12);
  });
});
