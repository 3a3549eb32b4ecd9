/**
 * Long fuzz of the file readers: `npm run fuzz -- [count]` (default 200,000 inputs in total).
 * Feeds random bytes, mutated and truncated valid SEG-2 files to readSeg2, and random delimiter-heavy
 * text to readDelimitedText and readDeviationTable, and random, mutated, truncated and size-lying zips to
 * readProjectArchive. Prints inputs tried per reader, typed errors by
 * code, and unexpected exceptions (anything that is not a BorewaveError; should be 0), and the
 * slowest single input.
 */
import { BorewaveError } from '../src/core/errors';
import { mulberry32 } from '../src/core/random';
import { readDeviationTable } from '../src/core/io/deviation';
import { readSeg2, writeSeg2 } from '../src/core/io/seg2';
import { readDelimitedText } from '../src/core/io/text';
import { readWaveFile } from '../src/core/io/readers';
import { newProjectDocument, readProjectArchive, writeProjectArchive } from '../src/core/io/project';
import type { Survey } from '../src/core/model';

const total = Number(process.argv[2] ?? 200000);
if (!Number.isInteger(total) || total <= 0) {
  process.stderr.write('usage: fuzz [count]\n');
  process.exit(2);
}

// Repeatable runs: the project's seeded generator.
const rand = mulberry32(0x9e3779b9).uniform;
const randInt = (n: number) => Math.floor(rand() * n);

const seeds: Uint8Array[] = [];
for (const order of ['little', 'big'] as const) {
  for (const code of [1, 2, 4, 5] as const) {
    const s = Float64Array.from({ length: 32 }, (_, i) => Math.sin(i / 3) * 1e3);
    seeds.push(
      writeSeg2(
        {
          fileStrings: { UNITS: 'METERS' },
          notes: ['a', 'b'],
          traces: [1, 2, 3].map((c) => ({
            channel: c,
            samples: s,
            sampleIntervalS: 1e-4,
            delayS: 0,
            receiverLocation: [0, 0, c],
          })),
        },
        { byteOrder: order, formatCode: code },
      ),
    );
  }
}

function seg2Input(): Uint8Array {
  const kind = randInt(3);
  if (kind === 0) {
    const b = new Uint8Array(randInt(600));
    for (let i = 0; i < b.length; i++) b[i] = randInt(256);
    if (b.length >= 2 && rand() < 0.7) [b[0], b[1]] = rand() < 0.5 ? [0x55, 0x3a] : [0x3a, 0x55];
    return b;
  }
  const s = seeds[randInt(seeds.length)];
  if (kind === 1) {
    const b = s.slice();
    const edits = 1 + randInt(8);
    for (let i = 0; i < edits; i++) b[randInt(b.length)] = randInt(256);
    return b;
  }
  return s.subarray(0, randInt(s.length));
}

const ALPHABET = '0123456789.,;\t -+eE#/\n\r"abtmsfdeptheastnorth()_';
function textInput(): string {
  const n = randInt(400);
  let out = '';
  for (let i = 0; i < n; i++) out += ALPHABET[randInt(ALPHABET.length)];
  if (rand() < 0.5) {
    // structured: a plausible table with random damage
    const rows = ['time_ms,a,b'];
    for (let i = 0; i < 2 + randInt(30); i++) rows.push(`${i * 0.5},${randInt(100)},${randInt(100)}`);
    out = rows.join('\n');
    const chars = out.split('');
    for (let k = randInt(4); k > 0; k--) chars[randInt(chars.length)] = ALPHABET[randInt(ALPHABET.length)];
    out = chars.join('');
  }
  return out;
}

const NUMBERISH = [
  '0',
  '-0.00006',
  '3',
  '1.5',
  '0x10',
  '1e300',
  '-1e-300',
  'NaN',
  'Infinity',
  '',
  '-10',
  '99999',
  ' 2 ',
];
/** SEG-2 with random vendor keyword text: SKEW, TRIGGER_SAMPLE_NO, FIRST_SAMPLE_NO, SCALE_UNIT, NOTE. */
function vendorSeg2Input(): Uint8Array {
  const pick = () => NUMBERISH[randInt(NUMBERISH.length)];
  const s = Float64Array.from({ length: 4 * (1 + randInt(8)) }, (_, i) => Math.sin(i));
  const strings: Record<string, string> = {};
  for (const k of ['SKEW', 'TRIGGER_SAMPLE_NO', 'FIRST_SAMPLE_NO', 'SCALE_UNIT', 'NOTE'])
    if (rand() < 0.6) strings[k] = pick();
  return writeSeg2(
    {
      notes: rand() < 0.5 ? ['hit left', 'operator'] : [],
      traces: Array.from({ length: 1 + randInt(3) }, (_, c) => ({
        channel: rand() < 0.9 ? c + 1 : 1,
        samples: s,
        sampleIntervalS: [1e-4, 1e-9, 5, 2.5e-4][randInt(4)],
        delayS: [0, -1e-3, -10, 0.5][randInt(4)],
        strings,
      })),
    },
    { byteOrder: rand() < 0.5 ? 'little' : 'big', formatCode: 4 },
  );
}

const PREAMBLE = [
  'Export v2',
  '# sample_rate_hz: 8000',
  'dt = 2.5e-5',
  'Site: x, y',
  'Channels: 24',
  'Sample interval (ms): 0x10',
];
const HEADERS = ['Time (us)', 'Sample', 'time_ms', 't (s)', 'Amplitude', 'musec', ''];
/** Text with preambles, time headers in every unit, missing time columns, sometimes UTF-16 with a BOM. */
function textLayoutInput(): Uint8Array {
  const lines: string[] = [];
  for (let k = randInt(4); k > 0; k--) lines.push(PREAMBLE[randInt(PREAMBLE.length)]);
  const sep = [',', ';', '\t', ' '][randInt(4)];
  const cols = 1 + randInt(5);
  const h = HEADERS[randInt(HEADERS.length)];
  if (h) lines.push([h, ...Array.from({ length: cols - 1 }, (_, c) => `ch${c + 1}`)].join(sep));
  for (let r = 0; r < randInt(20); r++)
    lines.push(
      Array.from({ length: cols }, (_, c) =>
        c === 0 && rand() < 0.7 ? String(r * 50) : (rand() * 2 - 1).toFixed(3),
      ).join(sep),
    );
  const text = lines.join(rand() < 0.5 ? '\n' : '\r\n');
  if (rand() < 0.3) {
    const b = new Uint8Array(2 + 2 * text.length);
    b.set([0xff, 0xfe]);
    for (let i = 0; i < text.length; i++) {
      b[2 + 2 * i] = text.charCodeAt(i) & 0xff;
      b[3 + 2 * i] = text.charCodeAt(i) >> 8;
    }
    return b;
  }
  return new TextEncoder().encode(text);
}

/** readWaveFile never throws: a failure becomes a BorewaveError here so the tally counts its code. */
function viaReadWaveFile(bytes: Uint8Array, name: string, opts = {}): void {
  const out = readWaveFile(bytes, name, opts);
  if (!out.ok) {
    if (out.error.code === 'INTERNAL') throw new Error(out.error.message);
    throw new BorewaveError(out.error.code, out.error.message);
  }
}

const seedSurvey: Survey = {
  name: 'fuzz',
  kind: 'downhole',
  boreholes: [{ id: 'B', collarEastM: 0, collarNorthM: 0, deviation: [] }],
  mainHoleId: 'B',
  sourceOffsetM: 2,
  sourceDepthM: 0,
  receiverSpacingM: 1,
  receiverCount: 1,
  coneOffsetM: 0.2,
  receiverHoleIds: [],
  records: [
    {
      recordId: 'a.sg2',
      depthM: 1,
      hit: 'left',
      channels: [],
      excluded: false,
      depthSource: 'user',
      hitSource: 'user',
    },
  ],
  soil: { layers: [], waterTableM: null, waterUnitWeightKnM3: 9.81 },
};
const archiveSeed = writeProjectArchive(newProjectDocument(seedSurvey), [{ name: 'a.sg2', bytes: seeds[0] }]);

/** Random, mutated, truncated zips, and zips whose headers declare absurd sizes (central directory 'PK\x01\x02', size at +24). */
function archiveInput(): Uint8Array {
  const kind = randInt(4);
  const b = archiveSeed.slice();
  if (kind === 0) {
    const r = new Uint8Array(randInt(800));
    for (let i = 0; i < r.length; i++) r[i] = randInt(256);
    if (r.length > 4) r.set([0x50, 0x4b, 3, 4]);
    return r;
  }
  if (kind === 1) {
    for (let k = 1 + randInt(6); k > 0; k--) b[randInt(b.length)] = randInt(256);
    return b;
  }
  if (kind === 2) return b.subarray(0, randInt(b.length));
  for (let i = 0; i + 28 < b.length; i++) {
    if (b[i] === 0x50 && b[i + 1] === 0x4b && b[i + 2] === 1 && b[i + 3] === 2) {
      const v = new DataView(b.buffer, b.byteOffset);
      v.setUint32(i + 24, [0xffffffff, 0x7fffffff, 1, 0][randInt(4)], true);
    }
  }
  return b;
}

interface Tally {
  tried: number;
  ok: number;
  codes: Map<string, number>;
  unexpected: number;
  firstUnexpected?: string;
  slowestMs: number;
}
const readers: { name: string; run: () => void }[] = [
  { name: 'readSeg2', run: () => void readSeg2(seg2Input(), 'fuzz.sg2') },
  { name: 'readDelimitedText', run: () => void readDelimitedText(textInput(), 'fuzz.csv') },
  { name: 'readSeg2 (vendor keywords)', run: () => void readSeg2(vendorSeg2Input(), 'vendor.sg2') },
  {
    name: 'readWaveFile (text layouts, UTF-16)',
    run: () => viaReadWaveFile(textLayoutInput(), 'layout.txt', rand() < 0.5 ? { sampleIntervalS: 1e-4 } : {}),
  },
  { name: 'readDeviationTable', run: () => void readDeviationTable(textInput(), 'fuzz.csv') },
  { name: 'readProjectArchive', run: () => void readProjectArchive(archiveInput(), 'fuzz.zip') },
];
const tallies = readers.map((): Tally => ({ tried: 0, ok: 0, codes: new Map(), unexpected: 0, slowestMs: 0 }));

const t0 = performance.now();
for (let i = 0; i < total; i++) {
  const k = i % readers.length;
  const tally = tallies[k];
  tally.tried++;
  const start = performance.now();
  try {
    readers[k].run();
    tally.ok++;
  } catch (e) {
    if (e instanceof BorewaveError) tally.codes.set(e.code, (tally.codes.get(e.code) ?? 0) + 1);
    else {
      tally.unexpected++;
      tally.firstUnexpected ??= e instanceof Error ? `${e.name}: ${e.message}` : String(e);
    }
  }
  tally.slowestMs = Math.max(tally.slowestMs, performance.now() - start);
}

let unexpected = 0;
readers.forEach((r, k) => {
  const t = tallies[k];
  unexpected += t.unexpected;
  process.stdout.write(
    `${r.name}: ${t.tried} inputs, ${t.ok} read, ${t.unexpected} unexpected exceptions, slowest ${t.slowestMs.toFixed(2)} ms\n`,
  );
  for (const [code, n] of [...t.codes.entries()].sort((a, b) => b[1] - a[1]))
    process.stdout.write(`  ${code.padEnd(28)} ${n}\n`);
  if (t.firstUnexpected) process.stdout.write(`  first unexpected: ${t.firstUnexpected}\n`);
});
process.stdout.write(
  `total ${total} inputs in ${((performance.now() - t0) / 1000).toFixed(1)} s, unexpected exceptions: ${unexpected}\n`,
);
process.exitCode = unexpected > 0 ? 1 : 0;
