import { describe, expect, it } from 'vitest';
import {
  assignRecords,
  compileNamePattern,
  DEFAULT_NAME_PATTERN,
  placeFromHeaders,
  placeFromName,
} from '../../src/core/survey/assign';
import type { WaveRecord } from '../../src/core/model';

const rec = (fileName: string, extra: Partial<WaveRecord> = {}, loc?: number[]): WaveRecord => ({
  id: fileName,
  fileName,
  format: 'seg2',
  fileStrings: {},
  notes: [],
  traces: [1, 2, 3].map((c) => ({
    channel: c,
    samples: new Float32Array(4),
    sampleIntervalS: 1e-4,
    delayS: 0,
    strings: {},
    receiverLocation: loc,
  })),
  ...extra,
});

describe('record placement from file names (our pattern language, documented in survey/assign.ts)', () => {
  it('default pattern reads depth and hit', () => {
    expect(placeFromName('dh_d12.0_L.sg2', compileNamePattern(DEFAULT_NAME_PATTERN))).toEqual({
      depthM: 12,
      hit: 'left',
    });
    expect(placeFromName('site_d3,5_right.sg2', compileNamePattern(DEFAULT_NAME_PATTERN))).toEqual({
      depthM: 3.5,
      hit: 'right',
    });
  });
  it('feet are converted at 0.3048 m/ft (exact, NIST SP 811)', () => {
    const p = placeFromName('HOLE1-10ft-U.dat', compileNamePattern('*-{depth_ft}ft-{hit}.dat'));
    expect(p.depthM).toBeCloseTo(3.048, 12);
    expect(p.hit).toBe('up');
  });
  it('a name that does not match gives nothing rather than a guess', () => {
    expect(placeFromName('random.sg2', compileNamePattern(DEFAULT_NAME_PATTERN))).toEqual({ depthM: null, hit: null });
  });
});

describe('record placement from SEG-2 headers (Pullan 1990 keywords RECEIVER_LOCATION, UNITS, NOTE)', () => {
  it('last RECEIVER_LOCATION number is the depth; NOTE gives the hit', () => {
    expect(placeFromHeaders(rec('a.sg2', { notes: ['hit right'] }, [0, 0, 7.5]))).toEqual({
      depthM: 7.5,
      hit: 'right',
    });
  });
  it('UNITS FEET converts', () => {
    expect(placeFromHeaders(rec('a.sg2', { fileStrings: { UNITS: 'FEET' } }, [10])).depthM).toBeCloseTo(3.048, 12);
  });
  it('headers win over the name; a record with neither is left for the user', () => {
    const [a, b] = assignRecords(
      [rec('dh_d3.0_L.sg2', {}, [0, 0, 4]), rec('mystery.sg2')],
      { kind: 'downhole', receiverCount: 1 },
      DEFAULT_NAME_PATTERN,
    );
    expect(a.depthM).toBe(4);
    expect(a.depthSource).toBe('header');
    expect(a.hit).toBe('left');
    expect(b.depthM).toBeNull();
    expect(b.depthSource).toBe('default');
    expect(a.channels.map((c) => c.component)).toEqual(['H1', 'H2', 'V']);
  });
});
