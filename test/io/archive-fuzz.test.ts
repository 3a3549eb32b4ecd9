/**
 * Short fuzz of the project archive reader (fast-check): random bytes, mutated and truncated valid
 * archives, and a zip whose central directory declares a 4 GiB entry. Each gives a result or a typed
 * BorewaveError, quickly, never another exception. The long run is `npm run fuzz`.
 */
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { zipSync, strToU8 } from 'fflate';
import { BorewaveError } from '../../src/core/errors';
import { newProjectDocument, readProjectArchive, writeProjectArchive } from '../../src/core/io/archive';
import type { Survey } from '../../src/core/model';

const survey: Survey = {
  name: 'f',
  kind: 'crosshole',
  boreholes: [],
  mainHoleId: 'A',
  sourceOffsetM: 0,
  sourceDepthM: 0,
  receiverSpacingM: 0,
  receiverCount: 2,
  coneOffsetM: 0.2,
  receiverHoleIds: ['B', 'C'],
  records: [],
  soil: { layers: [], waterTableM: null, waterUnitWeightKnM3: 9.81 },
};
const valid = writeProjectArchive(newProjectDocument(survey), [{ name: 'x.sg2', bytes: new Uint8Array(64).fill(7) }]);

function outcome(bytes: Uint8Array): 'ok' | string {
  const t0 = performance.now();
  try {
    readProjectArchive(bytes, 'f.zip');
    return 'ok';
  } catch (e) {
    if (!(e instanceof BorewaveError)) throw e;
    return e.code;
  } finally {
    expect(performance.now() - t0).toBeLessThan(500);
  }
}

describe('project archive survives hostile input', () => {
  it('random bytes (with and without a zip signature)', () => {
    fc.assert(
      fc.property(fc.uint8Array({ maxLength: 2000 }), fc.boolean(), (b, sig) => {
        if (sig && b.length > 4) b.set([0x50, 0x4b, 3, 4]);
        outcome(b);
      }),
      { numRuns: 500, seed: 11 },
    );
  });
  it('mutated and truncated valid archives', () => {
    fc.assert(
      fc.property(
        fc.array(fc.tuple(fc.nat(valid.length - 1), fc.integer({ min: 0, max: 255 })), { maxLength: 8 }),
        fc.nat(valid.length),
        (muts, cut) => {
          const b = valid.slice(0, Math.max(cut, 1));
          for (const [i, v] of muts) if (i < b.length) b[i] = v;
          outcome(b);
        },
      ),
      { numRuns: 800, seed: 12 },
    );
  });
  it('a central directory that declares a 4 GiB entry is refused before unpacking', () => {
    const b = valid.slice();
    const v = new DataView(b.buffer);
    for (let i = 0; i + 28 < b.length; i++)
      if (v.getUint32(i, true) === 0x02014b50) v.setUint32(i + 24, 0xffffffff, true);
    expect(outcome(b)).toBe('ARCHIVE_ENTRY_TOO_LARGE');
  });
  it('deep folders inside the zip are tolerated (files matched by their base name)', () => {
    const doc = { ...newProjectDocument(survey), files: ['x.sg2'] };
    const deep = 'a/'.repeat(60);
    const z = zipSync({ [`${deep}project.json`]: strToU8(JSON.stringify(doc)), [`${deep}x.sg2`]: new Uint8Array(3) });
    expect(readProjectArchive(z, 'deep.zip').files[0].name).toBe('x.sg2');
  });
});
