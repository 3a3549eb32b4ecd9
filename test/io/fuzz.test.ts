/**
 * Short property-based fuzz of readWaveFile (fast-check): random bytes, mutated valid SEG-2 files,
 * truncations and random text. Property (common practice for file parsers): never throws, returns in
 * bounded time, and every failure is a typed error (never the INTERNAL fallback of toErrorInfo).
 */
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { readWaveFile } from '../../src/core/io/readers';
import { writeSeg2 } from '../../src/core/io/seg2';

const MAX_MS = 200;

function checkOne(bytes: Uint8Array, name: string): void {
  const t0 = performance.now();
  const out = readWaveFile(bytes, name);
  expect(performance.now() - t0).toBeLessThan(MAX_MS);
  if (!out.ok) expect(out.error.code).not.toBe('INTERNAL');
}

function seed(order: 'little' | 'big', code: 1 | 2 | 4 | 5): Uint8Array {
  const s = Float64Array.from({ length: 16 }, (_, i) => Math.sin(i));
  return writeSeg2(
    {
      fileStrings: { UNITS: 'METERS' },
      notes: ['n'],
      traces: [
        { channel: 1, samples: s, sampleIntervalS: 1e-4, delayS: 0, receiverLocation: [0, 0, 3] },
        { channel: 2, samples: s, sampleIntervalS: 1e-4, delayS: 0 },
      ],
    },
    { byteOrder: order, formatCode: code },
  );
}
const SEEDS = [seed('little', 1), seed('big', 2), seed('little', 4), seed('big', 5)];

describe('readWaveFile fuzz (about 2,000 cases)', () => {
  it('random bytes, some starting with a SEG-2 block id', () => {
    fc.assert(
      fc.property(
        fc.uint8Array({ maxLength: 400 }),
        fc.constantFrom<number[]>([], [0x55, 0x3a], [0x3a, 0x55]),
        (body, head) => {
          const b = new Uint8Array(head.length + body.length);
          b.set(head);
          b.set(body, head.length);
          checkOne(b, 'r.sg2');
        },
      ),
      { numRuns: 500 },
    );
  });

  it('mutated valid files', () => {
    fc.assert(
      fc.property(
        fc.nat(SEEDS.length - 1),
        fc.array(fc.tuple(fc.nat(), fc.nat(255)), { minLength: 1, maxLength: 8 }),
        (k, edits) => {
          const b = SEEDS[k].slice();
          for (const [pos, val] of edits) b[pos % b.length] = val;
          checkOne(b, 'm.sg2');
        },
      ),
      { numRuns: 800 },
    );
  });

  it('truncated valid files', () => {
    fc.assert(
      fc.property(fc.nat(SEEDS.length - 1), fc.nat(), (k, cut) => {
        const s = SEEDS[k];
        checkOne(s.subarray(0, cut % s.length), 't.sg2');
      }),
      { numRuns: 400 },
    );
  });

  it('random text from a delimiter-heavy alphabet', () => {
    const ch = fc.constantFrom(...'0123456789.,;\t -+eE#/\n\r"abtms()_'.split(''));
    fc.assert(
      fc.property(fc.array(ch, { maxLength: 300 }), (chars) =>
        checkOne(new TextEncoder().encode(chars.join('')), 'x.csv'),
      ),
      { numRuns: 400 },
    );
  });
});
