/**
 * Short property-based fuzz of readWaveFile (fast-check): random bytes, mutated valid SEG-2 files,
 * truncations and random text. Property (common practice for file parsers): never throws, and every
 * failure is a typed error (never the INTERNAL fallback of toErrorInfo). Speed is measured by
 * `npm run bench`, never by a timed test.
 */
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { readWaveFile } from '../../src/core/io/readers';
import { writeSeg2 } from '../../src/core/io/seg2';
import { buildSeg2 } from './seg2-fixtures';

function checkOne(bytes: Uint8Array, name: string): void {
  const out = readWaveFile(bytes, name);
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

  it('SEG-2 vendor keywords with hostile number text (SKEW, trigger samples, repeated NOTE)', () => {
    const text = fc.constantFrom('0', '-0.00006', '3', '1.5', '0x10', '1e300', '-1e-300', 'NaN', '', '-10', '99999');
    fc.assert(
      fc.property(text, text, text, text, fc.boolean(), (skew, trig, first, delay, twoNotes) => {
        const f = buildSeg2({
          order: 'little',
          fileStrings: twoNotes ? ['NOTE a', 'NOTE hit left'] : [],
          traces: [
            {
              strings: [
                'SAMPLE_INTERVAL 0.0005',
                `SKEW ${skew}`,
                `TRIGGER_SAMPLE_NO ${trig}`,
                `FIRST_SAMPLE_NO ${first}`,
                `DELAY ${delay}`,
              ],
              formatCode: 1,
              sampleCount: 4,
              data: [1, 0, 2, 0, 3, 0, 4, 0],
            },
          ],
        });
        checkOne(f, 'v.sg2');
      }),
      { numRuns: 300 },
    );
  });

  it('text with preambles, time headers in every unit, UTF-16, with and without a given interval', () => {
    const line = fc.constantFrom(
      'Export',
      '# sample_rate_hz: 8000',
      'dt = 2.5e-5',
      'Time (us),a',
      'Sample;b',
      '0,1',
      '50,2',
      '1.5\t2',
      'x,y,z',
    );
    fc.assert(
      fc.property(fc.array(line, { maxLength: 12 }), fc.boolean(), fc.boolean(), (lines, wide, given) => {
        const text = lines.join('\n');
        const bytes = wide
          ? Uint8Array.from([
              0xff,
              0xfe,
              ...Array.from(text).flatMap((c) => [c.charCodeAt(0) & 0xff, c.charCodeAt(0) >> 8]),
            ])
          : new TextEncoder().encode(text);
        const out = readWaveFile(bytes, 'l.txt', given ? { sampleIntervalS: 1e-4 } : {});
        if (!out.ok) expect(out.error.code).not.toBe('INTERNAL');
      }),
      { numRuns: 300 },
    );
  });
});
