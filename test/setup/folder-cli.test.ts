/**
 * `cli profile <folder>` on folders of field files from the forward model: form (a) flags and a record
 * log, form (b) a project.json without records. Expected: the same profile (depths and Vs of every
 * interval, the chosen method) as the complete archive of the same survey, placed by hand from the truth.
 */
import { mkdirSync, mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { runProfile } from '../../src/cli/profile';
import { newProjectDocument, writeProjectArchive } from '../../src/core/io/project';
import type { RecordAssignment, Survey } from '../../src/core/model';
import { makeVariantSurvey, type VariantSpec, type VariantSurvey } from '../../src/core/synth/variants';

const root = mkdtempSync(join(tmpdir(), 'borewave-folder-'));
afterAll(() => rmSync(root, { recursive: true, force: true }));

function capture(cwd: string) {
  const out = { stdout: '', stderr: '' };
  return {
    out,
    io: {
      cwd,
      stdout: { write: (s: string) => (out.stdout += s) },
      stderr: { write: (s: string) => (out.stderr += s) },
    },
  };
}

/** The complete survey placed from the forward model's truth (what a careful user would enter). */
function truthSurvey(v: VariantSurvey): Survey {
  const s = v.synth.survey;
  const cone = v.spec.kind === 'seismic-cone';
  const records: RecordAssignment[] = v.truth.map((t) => ({
    recordId: t.file,
    depthM: t.loggedDepthM,
    hit: t.hit,
    channels: t.channels.map((c) => ({ channel: c.channel, component: c.component, receiver: c.receiver })),
    excluded: false,
    depthSource: 'user',
    hitSource: 'user',
  }));
  return cone
    ? { ...s, kind: 'seismic-cone', receiverCount: 1, coneOffsetM: v.geometry.coneOffsetM, records }
    : { ...s, records };
}

function profileRows(dir: string): string[][] {
  return readFileSync(join(dir, 'profile.csv'), 'utf8')
    .trim()
    .split('\n')
    .slice(1)
    .map((l) => l.split(',').slice(0, 6)); // depths, method, Vs and its sd
}

async function archiveProfile(v: VariantSurvey, name: string): Promise<string[][]> {
  const doc = newProjectDocument(
    truthSurvey(v),
    v.files.map((f) => f.name),
  );
  const zip = join(root, `${name}.zip`);
  writeFileSync(zip, writeProjectArchive(doc, v.files));
  const out = join(root, `${name}-archive-out`);
  const c = capture(root);
  expect(await runProfile([zip, '--out', out], c.io)).toBe(0);
  return profileRows(out);
}

function writeFolder(v: VariantSurvey, name: string): string {
  const dir = join(root, name);
  mkdirSync(dir, { recursive: true });
  for (const f of v.files) writeFileSync(join(dir, f.name), f.bytes);
  return dir;
}

const spec: VariantSpec = {
  kind: 'downhole',
  seed: 7,
  componentOrder: ['V', 'H1', 'H2'],
  labels: 'receiver-words',
  locations: 'spread-index',
  naming: 'instrument',
  notes: false,
  format: 'seg2',
  depthCount: 10,
};

describe('cli profile on a folder of field files', () => {
  it('(a) downhole, instrument-numbered files, V-first channels, spread positions, depths in a log (relative --records)', async () => {
    const v = makeVariantSurvey(spec);
    const dir = writeFolder(v, 'dh-a');
    writeFileSync(join(root, 'dh-log.csv'), v.recordLogCsv);
    const c = capture(root);
    const code = await runProfile(
      ['dh-a', '--out', 'dh-a-out', '--kind', 'downhole', '--source-offset-m', '2', '--records', 'dh-log.csv'],
      c.io,
    );
    expect(code, c.out.stderr).toBe(0);
    expect(c.out.stdout).toMatch(/depth: record log \[log\] x20/);
    expect(c.out.stdout).toMatch(/component: component word in RECEIVER \[header\] x60/);
    expect(c.out.stdout).toMatch(/header depth rejected: traces-differ-spread x20/);
    const a = profileRows(join(root, 'dh-a-out'));
    expect(a.length).toBeGreaterThan(5);
    expect(a).toEqual(await archiveProfile(v, 'dh'));
    const written = JSON.parse(readFileSync(join(root, 'dh-a-out', 'project.json'), 'utf8'));
    expect(written.version).toBe(2);
    expect(written.survey.records[0].depthM.source).toBe('log');
    expect(written.survey.records[0].channels[0]).toMatchObject({ component: 'V', source: 'header' });
    expect(written.survey.records).toHaveLength(20);
    // The completed project.json opens again (with the files beside it) to the same profile.
    for (const f of v.files) writeFileSync(join(root, 'dh-a-out', f.name), f.bytes);
    const again = capture(root);
    expect(await runProfile(['dh-a-out', '--out', 'dh-a-again'], again.io), again.out.stderr).toBe(0);
    expect(profileRows(join(root, 'dh-a-again'))).toEqual(a);
    void dir;
  });
  it('(a) seismic cone at 0.5 m steps, tip depths logged: receivers at tip - 0.25 m, same profile as the archive', async () => {
    const v = makeVariantSurvey({ ...spec, kind: 'seismic-cone', stepM: 0.5, depthCount: 12, coneOffsetM: 0.25 });
    writeFolder(v, 'cone-a');
    writeFileSync(join(root, 'cone-a', 'records.csv'), v.recordLogCsv); // a log inside the folder is found
    const c = capture(root);
    const code = await runProfile(
      ['cone-a', '--out', 'cone-a-out', '--kind', 'seismic-cone', '--source-offset-m', '1', '--cone-offset-m', '0.25'],
      c.io,
    );
    expect(code, c.out.stderr).toBe(0);
    const a = profileRows(join(root, 'cone-a-out'));
    expect(a.length).toBeGreaterThan(5);
    expect(Number(a[0][0])).toBeCloseTo(0.75, 9); // first tip 1.0 m - 0.25 m
    expect(a).toEqual(await archiveProfile(v, 'cone'));
  });
  it('(b) crosshole with user-named holes: project.json with holes and geometry but no records', async () => {
    const v = makeVariantSurvey({
      ...spec,
      kind: 'crosshole',
      holeNames: ['S', 'R1', 'R2'],
      componentOrder: ['H1', 'V'],
      locations: 'depth',
      naming: 'depth-names',
      notes: true,
    });
    const dir = writeFolder(v, 'xh-b');
    const { records: _drop, ...survey } = v.synth.survey;
    void _drop;
    writeFileSync(
      join(dir, 'project.json'),
      JSON.stringify({ format: 'borewave-project', version: 1, survey, files: [], settings: {}, edits: {} }),
    );
    const c = capture(root);
    const code = await runProfile(['xh-b', '--out', 'xh-b-out'], c.io);
    expect(code, c.out.stderr).toBe(0);
    expect(c.out.stdout).toMatch(/receiver: receiver named in RECEIVER \[header\]/);
    const b = profileRows(join(root, 'xh-b-out'));
    expect(b.length).toBeGreaterThan(5);
    expect(b).toEqual(await archiveProfile(v, 'xh'));
  });
  it('a folder without project.json and without --kind exits 2 with the reason', async () => {
    const v = makeVariantSurvey({ ...spec, depthCount: 2 });
    writeFolder(v, 'nokind');
    const c = capture(root);
    expect(await runProfile(['nokind', '--out', 'nokind-out'], c.io)).toBe(2);
    expect(c.out.stderr).toMatch(/give --kind/);
  });
});
