/**
 * The demo opened from memory (memorySource) must be exactly what the same project gives when saved
 * as a zip and opened again: one opener, one set of rules (docs/project-format.md). The reference is
 * the archive path itself, whose round trip test/io/archive.test.ts checks byte for byte.
 */
import { describe, expect, it } from 'vitest';
import { memorySource, openProject, readProjectArchive, writeProjectArchive } from '../../src/core/io/project';
import { makeDemoProject } from '../../src/core/synth/demo';
import type { BorewaveError } from '../../src/core/errors';

const plain = (v: unknown) =>
  JSON.parse(JSON.stringify(v, (_k, x) => (ArrayBuffer.isView(x) ? Array.from(x as Float64Array) : x)));

describe('a project opened from memory (the demo) against the same project zipped and opened', () => {
  for (const kind of ['downhole', 'crosshole'] as const) {
    it(`${kind} demo: same document, files, records and reports as through a zip`, () => {
      const demo = makeDemoProject(kind);
      const fromMemory = openProject(memorySource(demo.doc, demo.files, `demo-${kind}.zip`));
      const fromZip = readProjectArchive(writeProjectArchive(demo.doc, demo.files), `demo-${kind}.zip`);
      const { savedAt: _a, ...docM } = fromMemory.doc;
      const { savedAt: _b, ...docZ } = fromZip.doc;
      expect(docM).toEqual(docZ);
      expect(fromMemory.files.map((f) => f.name)).toEqual(fromZip.files.map((f) => f.name));
      // byte for byte (Buffer.equals: a deep toEqual over megabytes of samples is slow on a loaded machine)
      fromMemory.files.forEach((f, i) =>
        expect(Buffer.from(f.bytes).equals(Buffer.from(fromZip.files[i].bytes))).toBe(true),
      );
      expect(fromMemory.missing).toEqual(fromZip.missing);
      expect(fromMemory.issues).toEqual(fromZip.issues);
      expect(JSON.stringify(plain([...fromMemory.records.entries()]))).toBe(
        JSON.stringify(plain([...fromZip.records.entries()])),
      );
    });
  }

  it('refuses what an archive cannot hold, with the archive error codes', () => {
    const demo = makeDemoProject('downhole');
    const codeOf = (files: { name: string; bytes: Uint8Array }[]) => {
      try {
        memorySource(demo.doc, files, 'x');
        return 'none';
      } catch (e) {
        return (e as BorewaveError).code;
      }
    };
    const b = new Uint8Array([1]);
    expect(codeOf([{ name: '../a.sg2', bytes: b }])).toBe('ARCHIVE_BAD_ENTRY_NAME');
    expect(codeOf([{ name: 'project.json', bytes: b }])).toBe('ARCHIVE_BAD_ENTRY_NAME');
    expect(
      codeOf([
        { name: 'a.sg2', bytes: b },
        { name: 'a.sg2', bytes: b },
      ]),
    ).toBe('ARCHIVE_DUPLICATE_FILE');
  });
});
