/**
 * SEG-2 reader and writer against byte-exact fixtures laid out from the published standard:
 * Pullan, S.E., 1990, "Recommended standard for seismic (/radar) data files in the personal computer
 * environment", Geophysics 55(9), 1260-1271. Sample byte patterns were printed with Python's
 * struct.pack (IEEE 754 and two's complement reference encodings).
 */
import { describe, expect, it } from 'vitest';
import { errorOf } from '../helpers/errors';
import { BorewaveError } from '../../src/core/errors';
import { readSeg2, writeSeg2, type Seg2TraceInput } from '../../src/core/io/seg2';
import { buildSeg2, sampleBytes, uint, type FixtureTrace, type Order } from './seg2-fixtures';

function codeOf(f: () => unknown): string {
  try {
    f();
  } catch (e) {
    if (e instanceof BorewaveError) return e.code;
    throw e;
  }
  throw new Error('expected a BorewaveError');
}

const hex = (s: string) =>
  s
    .split(/\s+/)
    .filter(Boolean)
    .map((x) => parseInt(x, 16));

// ------------------------------------------------------------ golden 20-bit vector, literal bytes
// Whole file written out byte by byte (little-endian) from the standard's layout.
const GOLDEN_LE = Uint8Array.from([
  ...hex('55 3a 01 00 04 00 01 00'), // block id 0x3A55 LE, revision 1, M = 4, N = 1
  ...hex('01 00 00 01 0a 00'), // string terminator: 1 byte NUL; line terminator: 1 byte LF
  ...new Array(18).fill(0), // reserved 14-31
  ...hex('28 00 00 00'), // pointer to trace 1 at byte 40
  ...hex('00 00 00 00'), // file strings: zero length word (end of list) + pad
  ...hex('22 44 3c 00 0a 00 00 00 04 00 00 00 03'), // trace id 0x4422, X = 60, Y = 10, NS = 4, format 3
  ...new Array(19).fill(0), // reserved 13-31
  ...hex('18 00'), // string length 24 = 2 + 21 + 1
  ...Array.from('SAMPLE_INTERVAL 0.001', (c) => c.charCodeAt(0)),
  ...hex('00 00 00 00 00'), // NUL terminator, zero length word, pad to X = 60
  ...hex('01 21 64 00 fa ff 03 00 07 00'), // docs/methods.md golden vector
]);

describe('SEG-2 format 3 (20-bit floating point)', () => {
  it('decodes the golden vector 01 21 64 00 FA FF 03 00 07 00 -> [200, -5, 6, 28] (docs/methods.md section 1, calc)', () => {
    expect(GOLDEN_LE.length).toBe(110);
    const r = readSeg2(GOLDEN_LE, 'golden.sg2');
    expect(r.byteOrder).toBe('little');
    expect(r.formatCode).toBe(3);
    expect(Array.from(r.traces[0].samples)).toEqual([200, -5, 6, 28]);
    expect(r.traces[0].sampleIntervalS).toBe(0.001);
  });

  it('the field-by-field fixture builder reproduces the literal golden file exactly', () => {
    const built = buildSeg2({
      order: 'little',
      fileStrings: [],
      traces: [
        {
          strings: ['SAMPLE_INTERVAL 0.001'],
          formatCode: 3,
          sampleCount: 4,
          data: hex('01 21 64 00 fa ff 03 00 07 00'),
        },
      ],
    });
    expect(Array.from(built)).toEqual(Array.from(GOLDEN_LE));
  });

  it('decodes the big-endian variant (each 16-bit word byte-swapped: 21 01 00 64 FF FA 00 03 00 07)', () => {
    const f = buildSeg2({
      order: 'big',
      fileStrings: [],
      traces: [
        {
          strings: ['SAMPLE_INTERVAL 0.001'],
          formatCode: 3,
          sampleCount: 4,
          data: hex('21 01 00 64 ff fa 00 03 00 07'),
        },
      ],
    });
    const r = readSeg2(f, 'golden-be.sg2');
    expect(r.byteOrder).toBe('big');
    expect(Array.from(r.traces[0].samples)).toEqual([200, -5, 6, 28]);
  });

  it('rejects a sample count that is not a multiple of 4', () => {
    const f = buildSeg2({
      order: 'little',
      fileStrings: [],
      traces: [
        {
          strings: ['SAMPLE_INTERVAL 0.001'],
          formatCode: 3,
          sampleCount: 3,
          data: hex('01 21 64 00 fa ff 03 00 07 00'),
        },
      ],
    });
    expect(codeOf(() => readSeg2(f, 'x.sg2'))).toBe('SEG2_BAD_SAMPLE_COUNT');
  });
});

// ------------------------------------------------------------ every format code, both byte orders
// Little-endian sample bytes from Python struct.pack('<h' / '<i' / '<f' / '<d').
const FORMAT_CASES: { code: number; le: string[]; descaling: string; expected: number[] }[] = [
  // int16 100, -200, 32767, -32768, times DESCALING_FACTOR 0.25
  { code: 1, le: ['64 00', '38 ff', 'ff 7f', '00 80'], descaling: '0.25', expected: [25, -50, 8191.75, -8192] },
  // int32 100000, -1, 2147483647, -2147483648; 2147483647 rounds to 2^31 in 32-bit float (IEEE 754)
  {
    code: 2,
    le: ['a0 86 01 00', 'ff ff ff ff', 'ff ff ff 7f', '00 00 00 80'],
    descaling: '1',
    expected: [100000, -1, 2147483648, -2147483648],
  },
  // float32 1.5, -0.25, 1024, -3 times 2
  {
    code: 4,
    le: ['00 00 c0 3f', '00 00 80 be', '00 00 80 44', '00 00 40 c0'],
    descaling: '2',
    expected: [3, -0.5, 2048, -6],
  },
  // float64 0.1, -2.5, 1e10, 0; 0.1 stored as float32 0.10000000149011612 (numpy.float32(0.1))
  {
    code: 5,
    le: ['9a 99 99 99 99 99 b9 3f', '00 00 00 00 00 00 04 c0', '00 00 00 20 5f a0 02 42', '00 00 00 00 00 00 00 00'],
    descaling: '1',
    expected: [0.10000000149011612, -2.5, 1e10, 0],
  },
];

describe.each(['little', 'big'] as Order[])('SEG-2 data formats, %s-endian', (order) => {
  it.each(FORMAT_CASES)('format $code decodes to the expected physical values', ({ code, le, descaling, expected }) => {
    const f = buildSeg2({
      order,
      fileStrings: [],
      traces: [
        {
          strings: ['SAMPLE_INTERVAL 0.0005', `DESCALING_FACTOR ${descaling}`],
          formatCode: code,
          sampleCount: 4,
          data: sampleBytes(le, order),
        },
      ],
    });
    const r = readSeg2(f, 'f.sg2');
    expect(r.byteOrder).toBe(order);
    expect(r.formatCode).toBe(code);
    expect(Array.from(r.traces[0].samples)).toEqual(expected);
  });
});

// ------------------------------------------------------------ strings and keywords
describe('SEG-2 strings', () => {
  const traceStrings = [
    'CHANNEL_NUMBER 7',
    'SAMPLE_INTERVAL   0.00025  ', // several spaces around the value
    'DELAY -0.0005', // pre-trigger of the whole 2-sample record (the longest allowed)
    'RECEIVER_LOCATION 0.0  0.0   5.5',
    'SOURCE_LOCATION 2.0 0 0',
    'STACK 4',
    'MY_PRIVATE_KEY value with   inner   spaces',
    'DESCALING_FACTOR 0.5',
  ];
  const fixture = (order: Order) =>
    buildSeg2({
      order,
      pointerSlots: 4, // M = 16: three spare pointer slots after the one trace
      stringTerminator: [0x00],
      lineTerminator: [0x0d, 0x0a], // two-byte line terminator CR LF
      fileStrings: [
        'ACQUISITION_DATE 01/12/2026',
        'UNITS METERS',
        'NOTE\r\nfirst line\r\nsecond  line',
        'DELAY 0.5',
        'VENDOR_THING  a   b ',
      ],
      traces: [{ strings: traceStrings, formatCode: 1, sampleCount: 2, data: sampleBytes(['64 00', '38 ff'], order) }],
    });

  it.each(['little', 'big'] as Order[])(
    'reads keywords, unknown keywords, notes and locations (%s-endian)',
    (order) => {
      const r = readSeg2(fixture(order), 'strings.sg2');
      expect(r.fileStrings.UNITS).toBe('METERS');
      expect(r.fileStrings.VENDOR_THING).toBe('a   b'); // value trimmed, inner spaces kept
      expect(r.notes).toEqual(['first line', 'second  line']);
      const t = r.traces[0];
      expect(t.channel).toBe(7);
      expect(t.sampleIntervalS).toBe(0.00025);
      expect(t.delayS).toBe(-0.0005); // trace DELAY overrides file DELAY 0.5
      expect(t.receiverLocation).toEqual([0, 0, 5.5]);
      expect(t.sourceLocation).toEqual([2, 0, 0]);
      expect(t.strings.STACK).toBe('4');
      expect(t.strings.MY_PRIVATE_KEY).toBe('value with   inner   spaces');
      expect(Array.from(t.samples)).toEqual([50, -100]); // int16 100, -200 x 0.5
    },
  );

  it('uses file-level values when the trace has none (trace values override file values)', () => {
    const f = buildSeg2({
      order: 'little',
      fileStrings: ['SAMPLE_INTERVAL 0.002', 'DELAY 0.01'],
      traces: [
        { strings: ['SAMPLE_INTERVAL 0.001'], formatCode: 1, sampleCount: 1, data: [1, 0] },
        { strings: [], formatCode: 1, sampleCount: 1, data: [2, 0] },
      ],
    });
    const r = readSeg2(f, 'inherit.sg2');
    expect(r.traces.map((t) => t.sampleIntervalS)).toEqual([0.001, 0.002]);
    expect(r.traces.map((t) => t.delayS)).toEqual([0.01, 0.01]);
    expect(r.traces.map((t) => t.channel)).toEqual([1, 2]); // no CHANNEL_NUMBER: 1-based position
  });

  it('honours a two-byte string terminator', () => {
    const f = buildSeg2({
      order: 'little',
      stringTerminator: [0x00, 0x00],
      fileStrings: ['COMPANY  Some  Name'],
      traces: [{ strings: ['SAMPLE_INTERVAL 0.001'], formatCode: 1, sampleCount: 1, data: [5, 0] }],
    });
    const r = readSeg2(f, 't2.sg2');
    expect(r.fileStrings.COMPANY).toBe('Some  Name');
    expect(Array.from(r.traces[0].samples)).toEqual([5]);
  });
});

// ------------------------------------------------------------ bad input
const goodTrace = (): FixtureTrace => ({
  strings: ['SAMPLE_INTERVAL 0.001'],
  formatCode: 4,
  sampleCount: 4,
  data: sampleBytes(['00 00 c0 3f', '00 00 80 be', '00 00 80 44', '00 00 40 c0'], 'little'),
});
const good = () => buildSeg2({ order: 'little', fileStrings: ['UNITS METERS'], traces: [goodTrace(), goodTrace()] });

describe('SEG-2 bad input gives typed errors', () => {
  it('empty file -> SEG2_EMPTY_FILE', () => {
    expect(codeOf(() => readSeg2(new Uint8Array(0), 'e.sg2'))).toBe('SEG2_EMPTY_FILE');
  });

  it('wrong file block id -> SEG2_BAD_BLOCK_ID naming the file', () => {
    const f = good();
    f[0] = 0x12;
    const e = errorOf(() => readSeg2(f, 'id.sg2'));
    expect(e.code).toBe('SEG2_BAD_BLOCK_ID');
    expect(e.file).toBe('id.sg2');
    expect(e.message).toContain('id.sg2');
  });

  it('wrong trace block id -> SEG2_BAD_BLOCK_ID naming the trace', () => {
    const f = good();
    const p = new DataView(f.buffer).getUint32(36, true); // second pointer
    f[p] = 0x00;
    const e = errorOf(() => readSeg2(f, 'tid.sg2'));
    expect(e.code).toBe('SEG2_BAD_BLOCK_ID');
    expect(e.field).toBe('trace 2 block id');
  });

  it('every truncation of a valid file -> a typed error (SEG2_TRUNCATED or POINTER_PAST_END)', () => {
    const f = good();
    for (let len = 1; len < f.length; len++) {
      const code = codeOf(() => readSeg2(f.subarray(0, len), 'cut.sg2'));
      expect(['SEG2_TRUNCATED', 'SEG2_POINTER_PAST_END', 'SEG2_BAD_BLOCK_ID']).toContain(code);
    }
    expect(codeOf(() => readSeg2(f.subarray(0, 20), 'cut.sg2'))).toBe('SEG2_TRUNCATED');
    expect(codeOf(() => readSeg2(f.subarray(0, f.length - 1), 'cut.sg2'))).toBe('SEG2_TRUNCATED');
  });

  it('pointer past the end -> SEG2_POINTER_PAST_END', () => {
    const f = good();
    new DataView(f.buffer).setUint32(32, f.length + 100, true);
    const e = errorOf(() => readSeg2(f, 'p.sg2'));
    expect(e.code).toBe('SEG2_POINTER_PAST_END');
    expect(e.field).toBe('trace pointer 1');
  });

  it('NS = 2^31 in a 200-byte file fails fast without allocating -> SEG2_ABSURD_SAMPLE_COUNT', () => {
    const t = goodTrace();
    const f = buildSeg2({ order: 'little', fileStrings: [], traces: [{ ...t, sampleCount: 2 ** 31 }] });
    const padded = new Uint8Array(200);
    padded.set(f);
    const before = process.memoryUsage().arrayBuffers;
    const t0 = performance.now();
    expect(codeOf(() => readSeg2(padded, 'big.sg2'))).toBe('SEG2_ABSURD_SAMPLE_COUNT');
    expect(performance.now() - t0).toBeLessThan(50);
    expect(process.memoryUsage().arrayBuffers - before).toBeLessThan(1e6); // 2^31 float32 would be 8.6 GB
  });

  it('many pointers at one data block cannot multiply the allocation -> SEG2_ABSURD_SAMPLE_COUNT', () => {
    const f = good();
    const big = new Uint8Array(32 + 4 * 1000 + f.length);
    const v = new DataView(big.buffer);
    big.set(f.subarray(0, 32));
    v.setUint16(4, 4000, true);
    v.setUint16(6, 1000, true);
    const traceAt = 32 + 4000 + 4; // after an empty file string list
    const firstTrace = new DataView(f.buffer).getUint32(32, true);
    big.set(f.subarray(firstTrace), traceAt);
    for (let i = 0; i < 1000; i++) v.setUint32(32 + 4 * i, traceAt, true);
    expect(codeOf(() => readSeg2(big, 'dup.sg2'))).toBe('SEG2_ABSURD_SAMPLE_COUNT');
  });

  it('more traces than pointer slots (4N > M) -> SEG2_BAD_POINTER_BLOCK', () => {
    const f = good();
    new DataView(f.buffer).setUint16(4, 4, true); // M = 4 for N = 2
    expect(codeOf(() => readSeg2(f, 'm.sg2'))).toBe('SEG2_BAD_POINTER_BLOCK');
  });

  it('unknown data format code -> SEG2_BAD_FORMAT_CODE', () => {
    const f = buildSeg2({ order: 'big', fileStrings: [], traces: [{ ...goodTrace(), formatCode: 7 }] });
    expect(codeOf(() => readSeg2(f, 'fc.sg2'))).toBe('SEG2_BAD_FORMAT_CODE');
  });

  it('NaN float32 sample -> SEG2_NONFINITE_SAMPLE naming trace and sample index', () => {
    // 00 00 c0 7f is a quiet NaN in IEEE 754 binary32
    const f = buildSeg2({
      order: 'little',
      fileStrings: [],
      traces: [
        goodTrace(),
        { ...goodTrace(), data: sampleBytes(['00 00 c0 3f', '00 00 80 be', '00 00 c0 7f', '00 00 40 c0'], 'little') },
      ],
    });
    const e = errorOf(() => readSeg2(f, 'nan.sg2'));
    expect(e.code).toBe('SEG2_NONFINITE_SAMPLE');
    expect(e.field).toBe('trace 2 sample 2');
  });

  it('+Inf float64 sample and a float64 beyond the float32 range -> SEG2_NONFINITE_SAMPLE', () => {
    // 00 .. f0 7f = +Infinity (binary64); 1e300 overflows binary32
    const inf = buildSeg2({
      order: 'big',
      fileStrings: [],
      traces: [
        {
          strings: ['SAMPLE_INTERVAL 0.001'],
          formatCode: 5,
          sampleCount: 1,
          data: sampleBytes(['00 00 00 00 00 00 f0 7f'], 'big'),
        },
      ],
    });
    expect(codeOf(() => readSeg2(inf, 'inf.sg2'))).toBe('SEG2_NONFINITE_SAMPLE');
    const huge = new Uint8Array(8);
    new DataView(huge.buffer).setFloat64(0, 1e300, true);
    const f2 = buildSeg2({
      order: 'little',
      fileStrings: [],
      traces: [{ strings: ['SAMPLE_INTERVAL 0.001'], formatCode: 5, sampleCount: 1, data: Array.from(huge) }],
    });
    expect(codeOf(() => readSeg2(f2, 'huge.sg2'))).toBe('SEG2_NONFINITE_SAMPLE');
  });

  it.each([
    ['missing', []],
    ['zero', ['SAMPLE_INTERVAL 0']],
    ['negative', ['SAMPLE_INTERVAL -0.001']],
    ['text', ['SAMPLE_INTERVAL fast']],
  ])('%s SAMPLE_INTERVAL -> SEG2_BAD_SAMPLE_INTERVAL', (_label, strings) => {
    const f = buildSeg2({
      order: 'little',
      fileStrings: [],
      traces: [{ ...goodTrace(), strings: strings as string[] }],
    });
    expect(codeOf(() => readSeg2(f, 'si.sg2'))).toBe('SEG2_BAD_SAMPLE_INTERVAL');
  });

  it('declared data block smaller than the samples need -> SEG2_BAD_DATA_SIZE', () => {
    const f = buildSeg2({ order: 'little', fileStrings: [], traces: [{ ...goodTrace(), dataBytesDeclared: 8 }] });
    expect(codeOf(() => readSeg2(f, 'y.sg2'))).toBe('SEG2_BAD_DATA_SIZE');
  });

  it('a string length running past its block -> SEG2_BAD_STRING', () => {
    const f = good();
    new DataView(f.buffer).setUint16(40, 5000, true); // first file string's length word
    expect(codeOf(() => readSeg2(f, 's.sg2'))).toBe('SEG2_BAD_STRING');
  });
});

// ------------------------------------------------------------ round trips through the writer
function testTraces(): Seg2TraceInput[] {
  const n = 500;
  const a = new Float64Array(n);
  const b = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    a[i] = Math.fround(1.7 * Math.sin(i / 7) * Math.exp(-i / 200));
    b[i] = Math.fround(-3.2e-3 * Math.cos(i / 3) + 1e-4);
  }
  return [
    {
      channel: 1,
      samples: a,
      sampleIntervalS: 5e-5,
      delayS: 0,
      receiverLocation: [0, 0, 5],
      sourceLocation: [2, 0, 0],
      strings: { STACK: '3', RECEIVER: 'H1 up' },
    },
    { channel: 2, samples: b, sampleIntervalS: 5e-5, delayS: -0.001, receiverLocation: [0, 0, 5.5] },
  ];
}

describe.each(['little', 'big'] as Order[])('writeSeg2 -> readSeg2 round trip, %s-endian', (order) => {
  it.each([1, 2, 4, 5] as const)('format %i', (formatCode) => {
    const input = testTraces();
    const bytes = writeSeg2(
      { fileStrings: { UNITS: 'METERS' }, notes: ['line one', 'line two'], traces: input },
      { byteOrder: order, formatCode },
    );
    expect(Array.from(bytes.subarray(0, 2))).toEqual(order === 'little' ? [0x55, 0x3a] : [0x3a, 0x55]);
    expect(Array.from(bytes.subarray(4, 8))).toEqual([...uint(8, 2, order), ...uint(2, 2, order)]); // M = 8, N = 2
    const r = readSeg2(bytes, 'rt.sg2');
    expect(r.formatCode).toBe(formatCode);
    expect(r.fileStrings.UNITS).toBe('METERS');
    expect(r.notes).toEqual(['line one', 'line two']);
    r.traces.forEach((t, k) => {
      const x = input[k];
      expect(t.channel).toBe(x.channel);
      expect(t.sampleIntervalS).toBe(x.sampleIntervalS);
      expect(t.delayS).toBe(x.delayS);
      expect(t.receiverLocation).toEqual(x.receiverLocation);
      expect(t.sourceLocation).toEqual(x.sourceLocation);
      let maxAbs = 0;
      for (let i = 0; i < x.samples.length; i++) maxAbs = Math.max(maxAbs, Math.abs(x.samples[i]));
      // Integer formats: quantisation step q = max|x| / intMax (largest sample uses the full range);
      // error <= q/2, plus half a float32 ulp because readers return Float32Array (IEEE 754).
      const q = formatCode === 1 ? maxAbs / 32767 : formatCode === 2 ? maxAbs / 2147483647 : 0;
      for (let i = 0; i < x.samples.length; i++) {
        const err = Math.abs(t.samples[i] - x.samples[i]);
        expect(err).toBeLessThanOrEqual(q / 2 + Math.abs(x.samples[i]) * 2 ** -24 + 1e-300);
      }
      if (formatCode === 1 || formatCode === 2) {
        // the written DESCALING_FACTOR makes the largest sample reach +-intMax (checked via the strings)
        expect(Number(t.strings.DESCALING_FACTOR)).toBeCloseTo(q, 15);
      }
    });
    expect(r.traces[0].strings.STACK).toBe('3');
    expect(r.traces[0].strings.RECEIVER).toBe('H1 up');
  });
});

describe('writeSeg2 layout (field positions from Pullan 1990)', () => {
  it.each([
    ['little', 1, 2],
    ['big', 2, 4],
    ['little', 4, 4],
    ['big', 5, 8],
  ] as const)(
    '%s-endian format %i: pointers, trace block id, X, Y = NS x %i bytes, format code',
    (order, formatCode, bytesPerSample) => {
      const bytes = writeSeg2({ traces: testTraces() }, { byteOrder: order, formatCode });
      const v = new DataView(bytes.buffer, bytes.byteOffset, bytes.byteLength);
      const le = order === 'little';
      expect(v.getUint16(0, le)).toBe(0x3a55);
      expect(v.getUint16(2, le)).toBe(1); // revision
      expect([bytes[8], bytes[9], bytes[11], bytes[12]]).toEqual([1, 0x00, 1, 0x0a]); // NUL string, LF line terminators
      let end = 0;
      for (let k = 0; k < 2; k++) {
        const p = v.getUint32(32 + 4 * k, le);
        expect(v.getUint16(p, le)).toBe(0x4422);
        const X = v.getUint16(p + 2, le);
        expect(X % 4).toBe(0); // descriptor size a multiple of 4 bytes
        expect(v.getUint32(p + 8, le)).toBe(500); // NS
        expect(v.getUint32(p + 4, le)).toBe(500 * bytesPerSample); // Y
        expect(bytes[p + 12]).toBe(formatCode);
        end = p + X + 500 * bytesPerSample;
      }
      expect(end).toBe(bytes.length);
    },
  );
});
