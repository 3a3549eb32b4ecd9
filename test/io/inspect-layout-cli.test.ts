/**
 * `inspect` on instrument files: the SEG-2 time-base shift (SKEW, trigger sample; meaning adopted in
 * docs/seg2-vendor-keywords.md), text layout fields (timeUnit, timeColumn), warnings, same-name files
 * in two folders, --sample-interval-s, and relative paths read from the caller's folder (npm sets
 * INIT_CWD to it; `npm run` itself runs in the repository). Fixtures: SEG-2 files laid out from Pullan,
 * S.E., 1990, Geophysics 55(9), 1260-1271 (seg2-fixtures.ts); expected figures by hand.
 */
import { execFile } from 'node:child_process';
import { mkdir, mkdtemp, rm, writeFile } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import { promisify } from 'node:util';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { runInspect } from '../../src/cli/inspect';
import { spreadRecord24 } from './seg2-fixtures';

function capture(cwd?: string) {
  const out = { stdout: '', stderr: '' };
  return {
    out,
    io: {
      stdout: { write: (s: string) => (out.stdout += s) },
      stderr: { write: (s: string) => (out.stderr += s) },
      cwd,
    },
  };
}

let dir = '';
beforeAll(async () => {
  dir = await mkdtemp(join(tmpdir(), 'borewave-inspect2-'));
  await mkdir(join(dir, 'day1'));
  await mkdir(join(dir, 'day2'));
  await writeFile(join(dir, 'day1', '1.sg2'), spreadRecord24('little'));
  await writeFile(join(dir, 'day2', '1.sg2'), spreadRecord24('big'));
  await writeFile(join(dir, 'us.csv'), 'Time (us),geo\n0,1\n50,2\n100,3\n');
  await writeFile(join(dir, 'list.txt'), 'Exported list\nAmplitude\n0.5\n-0.25\n0.125\n');
});
afterAll(async () => {
  await rm(dir, { recursive: true, force: true });
});

describe('inspect: layout, shift and warnings', () => {
  it('JSON: SEG-2 time base per trace; text timeUnit, timeColumn, sample interval source', async () => {
    const { out, io } = capture(dir);
    const code = await runInspect(['day1/1.sg2', 'us.csv', '--json'], io);
    expect(code).toBe(0);
    const [seg2, text] = JSON.parse(out.stdout).files;
    // TRIGGER_SAMPLE_NO 3 from 1 at 0.125 ms = -0.25 ms, SKEW -0.06 ms: delay -0.31 ms, all of it a shift (DELAY absent).
    expect(seg2.traces[0].delayS).toBeCloseTo(-0.00031, 15);
    expect(seg2.traces[0].timeBase).toMatchObject({
      skewS: -0.00006,
      triggerIndex: 2,
      delaySource: 'TRIGGER_SAMPLE_NO',
    });
    expect(seg2.traces[0].timeBase.shiftS).toBeCloseTo(-0.00031, 15);
    expect(seg2.traces[0].scaleUnit).toBe('MV');
    expect(seg2.notes).toEqual(['operator: crew B, calm wind', 'hit left']);
    expect(text).toMatchObject({
      timeUnit: 'us',
      timeColumn: 'Time (us)',
      sampleIntervalSource: 'time column',
      preambleLines: 0,
    });
    expect(text.traces[0].sampleIntervalS).toBeCloseTo(5e-5, 18);
  });

  it('table: shift column and time-base line; text line names unit, column and interval', async () => {
    const { out, io } = capture(dir);
    await runInspect(['day1/1.sg2', 'us.csv'], io);
    expect(out.stdout).toMatch(/shift \(s\)/);
    expect(out.stdout).toContain('-3.100e-4');
    expect(out.stdout).toContain('SKEW -6.000e-5 s, trigger sample index 2');
    expect(out.stdout).toContain('time column: Time (us), unit us; sample interval 5.000e-5 s from time column');
  });

  it('a file without a time column: the error says so; --sample-interval-s reads it and the preamble warning is listed', async () => {
    const a = capture(dir);
    expect(await runInspect(['list.txt', '--json'], a.io)).toBe(1);
    const err = JSON.parse(a.out.stdout).files[0].error;
    expect(err.code).toBe('TEXT_NO_SAMPLE_INTERVAL');
    expect(err.message).toContain('1 numeric column from line 3; no time column');
    const b = capture(dir);
    expect(await runInspect(['list.txt', '--sample-interval-s', '0.0001'], b.io)).toBe(0);
    expect(b.out.stdout).toContain('sample interval 1.000e-4 s from given; 1 preamble line(s) skipped');
    expect(b.out.stdout).toContain('warning TEXT_PREAMBLE_SKIPPED');
    const c = capture(dir);
    expect(await runInspect(['list.txt', '--sample-interval-s', '0x10'], c.io)).toBe(2);
  });

  it('two files named 1.sg2 in two folders get distinct record ids (the folder), shown to the user', async () => {
    const { out, io } = capture(dir);
    await runInspect(['day1/1.sg2', 'day2/1.sg2', '--json'], io);
    const ids = JSON.parse(out.stdout).files.map((f: { recordId: string }) => f.recordId);
    expect(ids).toEqual(['day1/1.sg2', 'day2/1.sg2']);
    const t = capture(dir);
    await runInspect(['day1/1.sg2', 'day1/1.sg2'], t.io);
    expect(t.out.stdout).toContain('[record day1/1 (2).sg2]');
  });
});

describe("CLI paths are the caller's", () => {
  it("npm run sets INIT_CWD to the caller's folder: relative paths are read from there", async () => {
    const repo = resolve(__dirname, '../..');
    const { stdout } = await promisify(execFile)(
      process.execPath,
      ['--import', 'tsx', join(repo, 'src/cli/main.ts'), 'inspect', 'us.csv', '--json'],
      { cwd: repo, env: { ...process.env, INIT_CWD: dir } },
    );
    expect(JSON.parse(stdout).files[0]).toMatchObject({ ok: true, timeUnit: 'us' });
  });
});
