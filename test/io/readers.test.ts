/**
 * Format dispatch (readWaveFile) and the per-file summary used by `inspect`.
 * SEG-2 fixtures follow Pullan, S.E., 1990, Geophysics 55(9), 1260-1271 (see seg2-fixtures.ts).
 * min/max/RMS expectations are computed by hand from the samples (RMS = sqrt(mean(x^2))).
 */
import { describe, expect, it } from 'vitest';
import { readWaveFile, sampleStats, summarizeRecord } from '../../src/core/io/readers';
import { buildSeg2, sampleBytes } from './seg2-fixtures';

const enc = (s: string) => new TextEncoder().encode(s);

function seg2File(order: 'little' | 'big') {
  return buildSeg2({
    order,
    fileStrings: ['UNITS METERS'],
    traces: [
      {
        strings: [
          'SAMPLE_INTERVAL 0.00005',
          'DELAY 0',
          'CHANNEL_NUMBER 1',
          'RECEIVER_LOCATION 0 0 5',
          'SOURCE_LOCATION 2 0 0',
          'DESCALING_FACTOR 0.5',
        ],
        formatCode: 1,
        sampleCount: 4,
        data: sampleBytes(['64 00', '38 ff', '00 00', 'c8 00'], order), // 100, -200, 0, 200
      },
    ],
  });
}

describe('readWaveFile', () => {
  it('detects SEG-2 in both byte orders by the file block id', () => {
    for (const order of ['little', 'big'] as const) {
      const out = readWaveFile(seg2File(order), 'a.dat');
      expect(out.ok).toBe(true);
      if (out.ok) {
        expect(out.record.format).toBe('seg2');
        expect(out.record.byteOrder).toBe(order);
        expect(out.record.id).toBe('a.dat');
      }
    }
  });

  it('reads text files as delimited text', () => {
    const out = readWaveFile(enc('time_ms,a\n0,1\n0.5,2\n'), 'a.csv');
    expect(out.ok && out.record.format).toBe('text');
  });

  it('binary that is neither -> UNKNOWN_FORMAT; empty -> FILE_EMPTY; .sg2 with a wrong id -> SEG2_BAD_BLOCK_ID', () => {
    const bin = Uint8Array.from([0, 1, 2, 3, 0, 0, 0xff, 0x10]);
    const a = readWaveFile(bin, 'x.bin');
    expect(a.ok ? '' : a.error.code).toBe('UNKNOWN_FORMAT');
    const b = readWaveFile(new Uint8Array(0), 'x.sg2');
    expect(b.ok ? '' : b.error.code).toBe('FILE_EMPTY');
    const c = readWaveFile(bin, 'x.sg2');
    expect(c.ok ? '' : c.error.code).toBe('SEG2_BAD_BLOCK_ID');
    expect(c.ok ? '' : c.error.file).toBe('x.sg2');
  });

  it('a batch with one bad file still returns the good ones', () => {
    const good = seg2File('little');
    const bad = good.slice(0, good.length - 3); // truncated data
    const files: [Uint8Array, string][] = [
      [good, '1.sg2'],
      [bad, '2.sg2'],
      [enc('t_s,a\n0,1\n0.001,2\n'), '3.csv'],
    ];
    const out = files.map(([b, n]) => readWaveFile(b, n));
    expect(out.map((o) => o.ok)).toEqual([true, false, true]);
    expect(out[1].ok ? '' : out[1].error.code).toBe('SEG2_TRUNCATED');
  });
});

describe('summarizeRecord', () => {
  it('reports format, byte order, code, positions and stats after the descaling factor', () => {
    const out = readWaveFile(seg2File('big'), 's.sg2');
    if (!out.ok) throw new Error(out.error.message);
    const s = summarizeRecord(out.record);
    if (!s.ok) throw new Error('summary not ok');
    expect(s).toMatchObject({ file: 's.sg2', format: 'seg2', byteOrder: 'big', formatCode: 1 });
    const t = s.traces[0];
    // samples 100, -200, 0, 200 x 0.5 = 50, -100, 0, 100; RMS = sqrt((2500 + 10000 + 0 + 10000) / 4) = 75
    expect(t).toMatchObject({
      channel: 1,
      samples: 4,
      sampleIntervalS: 5e-5,
      delayS: 0,
      min: -100,
      max: 100,
      receiverLocation: [0, 0, 5],
      sourceLocation: [2, 0, 0],
    });
    expect(t.rms).toBeCloseTo(75, 12);
  });

  it('sampleStats of [3, -4] -> min -4, max 3, rms sqrt(12.5)', () => {
    expect(sampleStats([3, -4])).toEqual({ min: -4, max: 3, rms: Math.sqrt(12.5) });
  });
});
