/**
 * Short fuzz of the project archive reader (fast-check): random bytes, mutated and truncated valid
 * archives, and a zip whose central directory declares a 4 GiB entry. Each gives a result or a typed
 * BorewaveError, quickly, never another exception. The long run is `npm run fuzz`.
 */
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { zipSync, strToU8 } from 'fflate';
import { BorewaveError } from '../../src/core/errors';
import {
  newProjectDocument,
  readProjectArchive,
  readZip,
  writeZip,
  toProjectJson,
  writeProjectArchive,
} from '../../src/core/io/project';
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
  try {
    readProjectArchive(bytes, 'f.zip');
    return 'ok';
  } catch (e) {
    if (!(e instanceof BorewaveError)) throw e;
    return e.code;
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
  it('headers that declare a 4 GiB entry are refused before unpacking', () => {
    // Local file header: uncompressed size at offset 22; central directory: at offset 24 (PKWARE APPNOTE 4.3.7, 4.3.12).
    // Written with sizes in the local headers (no data descriptors), as most zip tools do.
    const entries = readZip(valid, 'v.zip', () => true).entries;
    const b = zipSync(Object.fromEntries(entries));
    const v = new DataView(b.buffer);
    for (let i = 0; i + 28 < b.length; i++) {
      if (v.getUint32(i, true) === 0x02014b50) v.setUint32(i + 24, 0xffffffff, true);
      if (v.getUint32(i, true) === 0x04034b50) v.setUint32(i + 22, 0xffffffff, true);
    }
    expect(outcome(b)).toBe('ARCHIVE_ENTRY_TOO_LARGE');
  });
  it('a header that understates the size stops at the byte cap while inflating', () => {
    // 4 MB of zeros deflate to a few kB; the local header is made to claim 10 bytes.
    const z = zipSync({ 'big.bin': new Uint8Array(4 * 1024 * 1024) }, { level: 9 });
    const v = new DataView(z.buffer);
    for (let i = 0; i + 28 < z.length; i++) if (v.getUint32(i, true) === 0x04034b50) v.setUint32(i + 22, 10, true);
    const limits = { maxEntries: 10, maxEntryBytes: 1024 * 1024, maxTotalBytes: 2 * 1024 * 1024 };
    let code = 'none';
    try {
      readZip(z, 'bomb.zip', () => true, limits);
    } catch (e) {
      code = (e as BorewaveError).code;
    }
    expect(code).toBe('ARCHIVE_ENTRY_TOO_LARGE');
  });
  it('files in folders are found by their exact path; an entry named __proto__ is an ordinary file', () => {
    const deep = 'a/'.repeat(60);
    const doc = toProjectJson({ ...newProjectDocument(survey), files: [`${deep}x.sg2`, '__proto__'] });
    // Written with the streaming writer: an object literal cannot hold a "__proto__" entry.
    const z = writeZip(
      [
        { path: 'project.json', bytes: strToU8(JSON.stringify(doc)) },
        { path: `${deep}x.sg2`, bytes: new Uint8Array(3) },
        { path: '__proto__', bytes: new Uint8Array([1, 2]) },
      ],
      doc.savedAt,
    );
    const opened = readProjectArchive(z, 'deep.zip');
    expect(opened.files.map((f) => f.name)).toEqual([`${deep}x.sg2`, '__proto__']);
    expect(opened.files[1].bytes).toEqual(new Uint8Array([1, 2]));
  });
});
