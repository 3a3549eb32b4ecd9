/**
 * Placement from file names (our own pattern language, docs/setup.md) and from SEG-2 headers
 * (Pullan 1990 keywords RECEIVER_LOCATION, UNITS, NOTE), through the one set-up path (core/setup).
 */
import { describe, expect, it } from 'vitest';
import { DEFAULT_NAME_PATTERN, hitFromHeaders, placeFromFileName } from '../../src/core/setup/depth';
import type { WaveRecord } from '../../src/core/model';

const rec = (fileName: string, extra: Partial<WaveRecord> = {}): WaveRecord => ({
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
  })),
  ...extra,
});

describe('file names', () => {
  it('the default pattern reads depth and hit, decimal point or comma', () => {
    expect(placeFromFileName('dh_d12.0_L.sg2', DEFAULT_NAME_PATTERN)).toEqual({
      depthM: { value: 12, source: 'filename' },
      hit: { value: 'left', source: 'filename' },
    });
    expect(placeFromFileName('day2/site_d3,5_right.sg2', DEFAULT_NAME_PATTERN)).toEqual({
      depthM: { value: 3.5, source: 'filename' },
      hit: { value: 'right', source: 'filename' },
    });
  });
  it('feet are converted at 0.3048 m/ft (exact, NIST SP 811)', () => {
    const p = placeFromFileName('HOLE1-10ft-U.dat', '*-{depth_ft}ft-{hit}.dat');
    expect(p.depthM?.value).toBeCloseTo(3.048, 12);
    expect(p.hit?.value).toBe('up');
  });
  it('a name that does not match gives nothing rather than a guess', () => {
    expect(placeFromFileName('random.sg2', DEFAULT_NAME_PATTERN)).toEqual({ depthM: null, hit: null });
  });
});

describe('hit words in headers', () => {
  it('a NOTE line gives the hit, marked as from the header', () => {
    expect(hitFromHeaders(rec('a.sg2', { notes: ['hit right'] }))).toEqual({ value: 'right', source: 'header' });
  });
  it('every value of a repeated trace keyword is searched (common practice: instruments repeat NOTE/COMMENT)', () => {
    const r = rec('b.sg2');
    r.traces[0].strings = { COMMENT: 'stack 4' };
    r.traces[0].stringLists = { COMMENT: ['blow: L', 'stack 4'] };
    expect(hitFromHeaders(r)?.value).toBe('left');
  });
  it('no hit word: nothing, never a guessed direction', () => {
    expect(hitFromHeaders(rec('c.sg2', { notes: ['operator: crew B'] }))).toBeNull();
  });
});
