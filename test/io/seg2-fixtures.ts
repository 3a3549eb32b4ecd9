/**
 * Byte-exact SEG-2 fixtures laid out field by field from the published standard:
 * Pullan, S.E., 1990, "Recommended standard for seismic (/radar) data files in the personal computer
 * environment", Geophysics 55(9), 1260-1271. This builder is independent of src/core/io/seg2.ts
 * (it shares no code with the writer under test).
 */

export type Order = 'little' | 'big';

/** Unsigned integer of `size` bytes in the given byte order. */
export function uint(value: number, size: 1 | 2 | 4, order: Order): number[] {
  const out: number[] = [];
  for (let i = 0; i < size; i++) out.push(Math.floor(value / 256 ** i) % 256);
  return order === 'little' ? out : out.reverse();
}

/** Sample bytes written little-endian (as printed by Python struct.pack('<...')), reordered for big-endian by reversing each sample. */
export function sampleBytes(littleEndianHex: string[], order: Order): number[] {
  return littleEndianHex.flatMap((h) => {
    const b = h.split(' ').map((x) => parseInt(x, 16));
    return order === 'little' ? b : b.reverse();
  });
}

export interface FixtureTrace {
  /** Text of each string entry, e.g. "SAMPLE_INTERVAL 0.001". */
  strings: string[];
  formatCode: number;
  sampleCount: number;
  data: number[];
  /** Override the declared data block size Y (default data.length). */
  dataBytesDeclared?: number;
}

export interface FixtureSpec {
  order: Order;
  /** Revision number in bytes 2-3 (default 1, the only one the standard defines). */
  revision?: number;
  /** Pointer slots in the trace-pointer sub-block (M = 4 * slots); default = number of traces. */
  pointerSlots?: number;
  /** String terminator characters (1 or 2 bytes), default [0x00]. */
  stringTerminator?: number[];
  /** Line terminator characters (1 or 2 bytes), default [0x0a]. */
  lineTerminator?: number[];
  fileStrings: string[];
  traces: FixtureTrace[];
}

function latin1(text: string): number[] {
  return Array.from(text, (c) => c.charCodeAt(0));
}

/** String sub-block: [u16 offset to next][text][terminator] ... [u16 0], padded to a multiple of 4. */
export function stringBlock(entries: string[], term: number[], order: Order): number[] {
  const out: number[] = [];
  for (const e of entries) {
    const text = latin1(e);
    out.push(...uint(2 + text.length + term.length, 2, order), ...text, ...term);
  }
  out.push(...uint(0, 2, order));
  while (out.length % 4 !== 0) out.push(0);
  return out;
}

/** The whole file: file descriptor, pointers, file strings, then each trace descriptor and its data. */
export function buildSeg2(spec: FixtureSpec): Uint8Array {
  const o = spec.order;
  const st = spec.stringTerminator ?? [0x00];
  const lt = spec.lineTerminator ?? [0x0a];
  const slots = spec.pointerSlots ?? spec.traces.length;
  const M = 4 * slots;
  const fileStrings = stringBlock(spec.fileStrings, st, o);
  const header: number[] = [
    ...uint(0x3a55, 2, o), // bytes 0-1: file descriptor block id
    ...uint(spec.revision ?? 1, 2, o), // 2-3: revision number
    ...uint(M, 2, o), // 4-5: M, size of trace pointer sub-block
    ...uint(spec.traces.length, 2, o), // 6-7: N, number of traces
    st.length,
    st[0],
    st[1] ?? 0, // 8: string terminator size, 9-10: its characters
    lt.length,
    lt[0],
    lt[1] ?? 0, // 11: line terminator size, 12-13: its characters
    ...new Array(18).fill(0), // 14-31: reserved
  ];
  let offset = 32 + M + fileStrings.length;
  const pointers: number[] = [];
  const blocks: number[] = [];
  for (const t of spec.traces) {
    pointers.push(offset);
    const strings = stringBlock(t.strings, st, o);
    const X = 32 + strings.length;
    const block = [
      ...uint(0x4422, 2, o), // 0-1: trace descriptor block id
      ...uint(X, 2, o), // 2-3: X, size of this block
      ...uint(t.dataBytesDeclared ?? t.data.length, 4, o), // 4-7: Y, size of data block
      ...uint(t.sampleCount, 4, o), // 8-11: NS, number of samples
      t.formatCode, // 12: data format code
      ...new Array(19).fill(0), // 13-31: reserved
      ...strings,
      ...t.data,
    ];
    blocks.push(...block);
    offset += block.length;
  }
  const pointerBlock = pointers.flatMap((p) => uint(p, 4, o));
  while (pointerBlock.length < M) pointerBlock.push(0); // spare slots
  return Uint8Array.from([...header, ...pointerBlock, ...fileStrings, ...blocks]);
}

/** int16 samples as little-endian hex words (two's complement), e.g. [1, -2] -> ['01 00', 'fe ff']. */
export function int16Hex(values: number[]): string[] {
  return values.map((v) => {
    const u = v < 0 ? v + 65536 : v;
    return `${(u & 0xff).toString(16).padStart(2, '0')} ${(u >> 8).toString(16).padStart(2, '0')}`;
  });
}

/**
 * A 24-channel spread record as a seismograph writes it: one file, 24 trace blocks, each with its own
 * CHANNEL_NUMBER and RECEIVER_LOCATION (1 m apart), the instrument's SKEW and trigger sample number,
 * file-level NOTE written twice (an operator note and the hit direction). Format 1 (int16), 8 samples.
 */
export function spreadRecord24(order: Order): Uint8Array {
  const traces: FixtureTrace[] = [];
  for (let c = 1; c <= 24; c++) {
    traces.push({
      strings: [
        `CHANNEL_NUMBER ${c}`,
        `RECEIVER_LOCATION 0 0 ${c}`,
        'SAMPLE_INTERVAL 0.000125',
        'SKEW -0.00006',
        'TRIGGER_SAMPLE_NO 3',
        'FIRST_SAMPLE_NO 1',
        'SCALE_UNIT MV',
        'DESCALING_FACTOR 1',
      ],
      formatCode: 1,
      sampleCount: 8,
      data: sampleBytes(int16Hex([0, 0, c, -c, 2 * c, -2 * c, 0, 0]), order),
    });
  }
  return buildSeg2({
    order,
    pointerSlots: 256, // instruments reserve many spare pointer slots
    lineTerminator: [0x0d, 0x0a],
    fileStrings: ['UNITS METERS', 'NOTE operator: crew B, calm wind', 'NOTE hit left', 'SOURCE_LOCATION 2 0 0'],
    traces,
  });
}
