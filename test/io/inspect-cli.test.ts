/**
 * `inspect` command line, called in-process with a captured stdout. Fixtures are SEG-2 files laid out
 * from Pullan, S.E., 1990, Geophysics 55(9), 1260-1271 (seg2-fixtures.ts) and a small CSV; expected
 * figures are computed by hand from the written samples.
 */
import { mkdtemp, rm, writeFile } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { runInspect } from '../../src/cli/inspect';
import { buildSeg2, sampleBytes } from './seg2-fixtures';

function capture() {
  const out = { stdout: '', stderr: '' };
  return {
    out,
    io: { stdout: { write: (s: string) => (out.stdout += s) }, stderr: { write: (s: string) => (out.stderr += s) } },
  };
}

let dir = '';
beforeAll(async () => {
  dir = await mkdtemp(join(tmpdir(), 'borewave-inspect-'));
  const good = buildSeg2({
    order: 'little',
    fileStrings: [],
    traces: [
      {
        // float32 1.5, -0.25, 1024, -3 (struct.pack('<f'))
        strings: [
          'SAMPLE_INTERVAL 0.00005',
          'DELAY 0',
          'CHANNEL_NUMBER 1',
          'RECEIVER_LOCATION 0 0 5',
          'SOURCE_LOCATION 2 0 0',
        ],
        formatCode: 4,
        sampleCount: 4,
        data: sampleBytes(['00 00 c0 3f', '00 00 80 be', '00 00 80 44', '00 00 40 c0'], 'little'),
      },
    ],
  });
  await writeFile(join(dir, 'a.sg2'), good);
  const bad = good.slice();
  new DataView(bad.buffer).setUint32(32, 100000, true); // pointer past the end
  await writeFile(join(dir, 'bad.sg2'), bad);
  await writeFile(join(dir, 'c.csv'), 'time_ms,x\n0,1\n0.25,-1\n');
});
afterAll(async () => {
  await rm(dir, { recursive: true, force: true });
});

describe('runInspect', () => {
  it('--json prints one JSON document in the agreed shape and exits 1 when a file failed', async () => {
    const { out, io } = capture();
    const code = await runInspect([join(dir, 'a.sg2'), join(dir, 'bad.sg2'), join(dir, 'c.csv'), '--json'], io);
    expect(code).toBe(1);
    const doc = JSON.parse(out.stdout);
    expect(doc.files).toHaveLength(3);
    const [a, bad, c] = doc.files;
    expect(a).toMatchObject({ file: join(dir, 'a.sg2'), ok: true, format: 'seg2', byteOrder: 'little', formatCode: 4 });
    expect(a.traces[0]).toMatchObject({
      channel: 1,
      samples: 4,
      sampleIntervalS: 5e-5,
      delayS: 0,
      min: -3,
      max: 1024,
      receiverLocation: [0, 0, 5],
      sourceLocation: [2, 0, 0],
    });
    // RMS = sqrt((1.5^2 + 0.25^2 + 1024^2 + 3^2) / 4) = sqrt(1048587.3125 / 4)
    expect(a.traces[0].rms).toBeCloseTo(Math.sqrt(1048587.3125 / 4), 9);
    expect(bad).toMatchObject({ ok: false, error: { code: 'SEG2_POINTER_PAST_END' } });
    expect(c).toMatchObject({
      ok: true,
      format: 'text',
      traces: [{ channel: 1, samples: 2, sampleIntervalS: 2.5e-4 }],
    });
  });

  it('exits 0 when every file reads; plain output is a table naming each file', async () => {
    const { out, io } = capture();
    const code = await runInspect([join(dir, 'a.sg2'), join(dir, 'c.csv')], io);
    expect(code).toBe(0);
    expect(out.stdout).toContain('seg2, little-endian, data format 4, 1 trace(s)');
    expect(out.stdout).toMatch(/chan\s+samples\s+dt \(s\)/);
    expect(out.stdout).toContain('2 file(s), 0 failed');
  });

  it('a missing file is reported as FILE_NOT_READABLE; no files -> usage, exit 2', async () => {
    const { out, io } = capture();
    expect(await runInspect([join(dir, 'nope.sg2'), '--json'], io)).toBe(1);
    expect(JSON.parse(out.stdout).files[0].error.code).toBe('FILE_NOT_READABLE');
    const c2 = capture();
    expect(await runInspect([], c2.io)).toBe(2);
    expect(c2.out.stderr).toContain('usage');
  });
});
