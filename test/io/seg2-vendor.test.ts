/**
 * SEG-2 files as seismographs write them: keywords outside the published standard (SKEW,
 * TRIGGER_SAMPLE_NO, FIRST_SAMPLE_NO, SCALE_UNIT), repeated keywords, a 24-trace spread record, and
 * hostile numbers. Files are byte-exact fixtures laid out from the block structure of Pullan, S.E.,
 * 1990, Geophysics 55(9), 1260-1271 (seg2-fixtures.ts); the vendor keywords are free strings, which the
 * standard allows. The meaning and sign adopted for them is an assumption documented in
 * docs/seg2-vendor-keywords.md; expected times below follow from that rule by hand.
 */
import { describe, expect, it } from 'vitest';
import { readSeg2 } from '../../src/core/io/seg2';
import { hitFromHeaders } from '../../src/core/setup/depth';
import { errorOf } from '../helpers/errors';
import { buildSeg2, int16Hex, sampleBytes, spreadRecord24, type Order } from './seg2-fixtures';

/** One int16 trace of `ns` samples with the given strings. */
function oneTrace(strings: string[], opts: { ns?: number; revision?: number; fileStrings?: string[] } = {}) {
  const ns = opts.ns ?? 4;
  return buildSeg2({
    order: 'little',
    revision: opts.revision,
    fileStrings: opts.fileStrings ?? [],
    traces: [{ strings, formatCode: 1, sampleCount: ns, data: sampleBytes(int16Hex(new Array(ns).fill(1)), 'little') }],
  });
}

describe('time base: DELAY, SKEW and trigger sample numbers', () => {
  it('SKEW -0.00006 s is added to every sample time: delayS = DELAY + SKEW', () => {
    const r = readSeg2(oneTrace(['SAMPLE_INTERVAL 0.000125', 'DELAY 0', 'SKEW -0.00006']), 'skew.sg2');
    const t = r.traces[0];
    expect(t.delayS).toBeCloseTo(-0.00006, 15);
    expect(t.timeBase).toEqual({
      delayKeywordS: 0,
      skewS: -0.00006,
      triggerIndex: null,
      delaySource: 'DELAY',
      shiftS: -0.00006,
    });
    expect(t.strings.SKEW).toBe('-0.00006'); // raw text kept
  });

  it('SKEW -0.0006 s with a DELAY of -0.001 s: sample 0 at -0.0016 s', () => {
    const t = readSeg2(oneTrace(['SAMPLE_INTERVAL 0.0005', 'DELAY -0.001', 'SKEW -0.0006']), 's.sg2').traces[0];
    expect(t.delayS).toBeCloseTo(-0.0016, 15);
    expect(t.timeBase?.shiftS).toBeCloseTo(-0.0006, 15);
  });

  it('TRIGGER_SAMPLE_NO 21 counted from FIRST_SAMPLE_NO 1 at 0.5 ms: 20 samples (10 ms) before the trigger', () => {
    const t = readSeg2(
      oneTrace(['SAMPLE_INTERVAL 0.0005', 'TRIGGER_SAMPLE_NO 21', 'FIRST_SAMPLE_NO 1'], { ns: 64 }),
      'trig.sg2',
    ).traces[0];
    expect(t.delayS).toBeCloseTo(-0.01, 15);
    expect(t.timeBase).toMatchObject({ triggerIndex: 20, delaySource: 'TRIGGER_SAMPLE_NO' });
  });

  it('FIRST_SAMPLE_NO 0 counts from zero; TRIGGER_SAMPLE_NO alone counts from 1 (assumption)', () => {
    const zero = readSeg2(
      oneTrace(['SAMPLE_INTERVAL 0.001', 'TRIGGER_SAMPLE_NO 5', 'FIRST_SAMPLE_NO 0'], { ns: 16 }),
      'z.sg2',
    ).traces[0];
    expect(zero.delayS).toBeCloseTo(-0.005, 15);
    const one = readSeg2(oneTrace(['SAMPLE_INTERVAL 0.001', 'TRIGGER_SAMPLE_NO 5'], { ns: 16 }), 'o.sg2').traces[0];
    expect(one.delayS).toBeCloseTo(-0.004, 15);
  });

  it('a DELAY that agrees with the trigger sample is not applied twice; one that disagrees is an error', () => {
    const agree = readSeg2(
      oneTrace(['SAMPLE_INTERVAL 0.001', 'DELAY -0.004', 'TRIGGER_SAMPLE_NO 5'], { ns: 16 }),
      'a.sg2',
    ).traces[0];
    expect(agree.delayS).toBeCloseTo(-0.004, 15);
    expect(agree.timeBase?.delaySource).toBe('DELAY');
    const e = errorOf(() =>
      readSeg2(oneTrace(['SAMPLE_INTERVAL 0.001', 'DELAY -0.010', 'TRIGGER_SAMPLE_NO 5'], { ns: 16 }), 'c.sg2'),
    );
    expect(e.code).toBe('SEG2_TRIGGER_CONFLICT');
    expect(e.message).toContain('-0.010');
  });

  it('a trigger sample outside the trace is refused', () => {
    const e = errorOf(() => readSeg2(oneTrace(['SAMPLE_INTERVAL 0.001', 'TRIGGER_SAMPLE_NO 99']), 'x.sg2'));
    expect(e.code).toBe('SEG2_IMPLAUSIBLE_VALUE');
    expect(e.field).toBe('TRIGGER_SAMPLE_NO');
  });

  it('a negative DELAY is a pre-trigger, up to the record length (4 samples x 1 ms = 4 ms)', () => {
    expect(readSeg2(oneTrace(['SAMPLE_INTERVAL 0.001', 'DELAY -0.004']), 'p.sg2').traces[0].delayS).toBe(-0.004);
    const e = errorOf(() => readSeg2(oneTrace(['SAMPLE_INTERVAL 0.001', 'DELAY -10']), 'p.sg2'));
    expect(e.code).toBe('SEG2_IMPLAUSIBLE_VALUE');
    expect(e.field).toBe('DELAY');
    expect(e.message).toContain('"-10"');
  });
});

describe('repeated keywords are all kept', () => {
  it('two file NOTE strings: both kept in notes and in fileStringLists; the hit is read from the second', () => {
    const f = oneTrace(['SAMPLE_INTERVAL 0.001'], { fileStrings: ['NOTE operator: crew B', 'NOTE hit left'] });
    const r = readSeg2(f, 'n.sg2');
    expect(r.notes).toEqual(['operator: crew B', 'hit left']);
    expect(r.fileStringLists?.NOTE).toEqual(['operator: crew B', 'hit left']);
    expect(hitFromHeaders(r)?.value).toBe('left');
  });

  it('a trace keyword written twice keeps both values, and a hit word in the first one is found', () => {
    const r = readSeg2(oneTrace(['SAMPLE_INTERVAL 0.001', 'COMMENT hit right', 'COMMENT stack 4']), 'c.sg2');
    expect(r.traces[0].stringLists?.COMMENT).toEqual(['hit right', 'stack 4']);
    expect(r.traces[0].strings.COMMENT).toBe('stack 4');
    expect(hitFromHeaders(r)?.value).toBe('right');
  });
});

describe('a 24-trace spread record', () => {
  it.each(['little', 'big'] as Order[])('reads 24 channels, their positions, SKEW and trigger (%s-endian)', (order) => {
    const r = readSeg2(spreadRecord24(order), 'spread.sg2');
    expect(r.traces).toHaveLength(24);
    expect(r.traces.map((t) => t.channel)).toEqual(Array.from({ length: 24 }, (_, i) => i + 1));
    expect(r.traces[23].receiverLocation).toEqual([0, 0, 24]);
    expect(Array.from(r.traces[9].samples)).toEqual([0, 0, 10, -10, 20, -20, 0, 0]);
    // TRIGGER_SAMPLE_NO 3 from 1: 2 samples before the trigger; SKEW -0.06 ms.
    for (const t of r.traces) expect(t.delayS).toBeCloseTo(-2 * 0.000125 - 0.00006, 15);
    expect(r.traces[0].strings.SCALE_UNIT).toBe('MV');
    expect(r.notes).toEqual(['operator: crew B, calm wind', 'hit left']);
    expect(hitFromHeaders(r)?.value).toBe('left');
  });
});

describe('strict numbers: a typed error naming keyword and value', () => {
  const cases: [string, string[], string, string][] = [
    [
      'hexadecimal channel 0x10',
      ['SAMPLE_INTERVAL 0.001', 'CHANNEL_NUMBER 0x10'],
      'SEG2_BAD_KEYWORD_VALUE',
      'CHANNEL_NUMBER',
    ],
    ['hexadecimal sample interval', ['SAMPLE_INTERVAL 0x10'], 'SEG2_BAD_SAMPLE_INTERVAL', 'SAMPLE_INTERVAL'],
    ['sample interval 1e300', ['SAMPLE_INTERVAL 1e300'], 'SEG2_BAD_SAMPLE_INTERVAL', 'SAMPLE_INTERVAL'],
    ['sample interval 1e-300', ['SAMPLE_INTERVAL 1e-300'], 'SEG2_BAD_SAMPLE_INTERVAL', 'SAMPLE_INTERVAL'],
    ['sample interval Infinity', ['SAMPLE_INTERVAL Infinity'], 'SEG2_BAD_SAMPLE_INTERVAL', 'SAMPLE_INTERVAL'],
    ['fractional channel', ['SAMPLE_INTERVAL 0.001', 'CHANNEL_NUMBER 1.5'], 'SEG2_BAD_CHANNEL', 'CHANNEL_NUMBER'],
    ['delay NaN', ['SAMPLE_INTERVAL 0.001', 'DELAY NaN'], 'SEG2_BAD_KEYWORD_VALUE', 'DELAY'],
    ['skew beyond the record', ['SAMPLE_INTERVAL 0.001', 'SKEW 1'], 'SEG2_IMPLAUSIBLE_VALUE', 'SKEW'],
    ['descaling 0', ['SAMPLE_INTERVAL 0.001', 'DESCALING_FACTOR 0'], 'SEG2_IMPLAUSIBLE_VALUE', 'DESCALING_FACTOR'],
    [
      'receiver at 1e300 m',
      ['SAMPLE_INTERVAL 0.001', 'RECEIVER_LOCATION 0 0 1e300'],
      'SEG2_IMPLAUSIBLE_VALUE',
      'RECEIVER_LOCATION',
    ],
    [
      'fractional trigger sample',
      ['SAMPLE_INTERVAL 0.001', 'TRIGGER_SAMPLE_NO 2.5'],
      'SEG2_BAD_KEYWORD_VALUE',
      'TRIGGER_SAMPLE_NO',
    ],
  ];
  it.each(cases)('%s', (_, strings, code, field) => {
    const e = errorOf(() => readSeg2(oneTrace(strings), 'bad.sg2'));
    expect(e.code).toBe(code);
    expect(e.field).toBe(field);
    const value = strings.find((s) => s.startsWith(field))!.slice(field.length + 1);
    expect(e.message).toContain(value);
  });

  it('duplicate channel numbers are refused', () => {
    const f = buildSeg2({
      order: 'little',
      fileStrings: ['SAMPLE_INTERVAL 0.001'],
      traces: [1, 2].map(() => ({ strings: ['CHANNEL_NUMBER 3'], formatCode: 1, sampleCount: 1, data: [1, 0] })),
    });
    const e = errorOf(() => readSeg2(f, 'dup.sg2'));
    expect(e.code).toBe('SEG2_DUPLICATE_CHANNEL');
    expect(e.message).toContain('CHANNEL_NUMBER 3');
  });

  it('a file with zero traces is an error', () => {
    const f = buildSeg2({ order: 'little', fileStrings: ['NOTE empty'], traces: [] });
    expect(errorOf(() => readSeg2(f, 'zero.sg2')).code).toBe('SEG2_NO_TRACES');
  });

  it.each([0, 2, 99])('revision %i reads as revision 1 with a warning', (revision) => {
    const r = readSeg2(oneTrace(['SAMPLE_INTERVAL 0.001'], { revision }), 'rev.sg2');
    expect(r.warnings?.map((w) => w.code)).toEqual(['SEG2_REVISION']);
    expect(r.warnings?.[0].message).toContain(`revision number ${revision}`);
    expect(r.traces[0].samples.length).toBe(4);
  });

  it('revision 1 carries no warning', () => {
    expect(readSeg2(oneTrace(['SAMPLE_INTERVAL 0.001']), 'ok.sg2').warnings).toBeUndefined();
  });
});
