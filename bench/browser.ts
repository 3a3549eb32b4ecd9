/**
 * Browser figures for `npm run bench`: runs the Playwright measurement e2e/speed.spec.ts (production
 * build, Debian's Chromium) and reads test-results/speed.json. Skipped with a note when Chromium is
 * missing or `--no-browser` is given. SPEED_SCALE=1 adds the long-campaign figures.
 */
import { spawnSync } from 'node:child_process';
import { existsSync, readFileSync, rmSync } from 'node:fs';
import { join } from 'node:path';

const ROOT = join(import.meta.dirname, '..');

export interface BrowserFigures {
  firstPaintMs: number | null;
  demoToProfileMs: number | null;
  dropToProfileMs: number | null;
  /** Peak resident memory of the renderer (the page and its workers), MB. */
  peakMemoryMb: number | null;
  detail?: Record<string, unknown>;
  note?: string;
}

const empty = (note: string): BrowserFigures => ({
  firstPaintMs: null,
  demoToProfileMs: null,
  dropToProfileMs: null,
  peakMemoryMb: null,
  note,
});

export function browserFigures(): BrowserFigures {
  const chromium = process.env.CHROMIUM_PATH || '/usr/bin/chromium';
  if (!existsSync(chromium)) return empty(`no Chromium at ${chromium}: browser figures skipped`);
  const out = join(ROOT, 'test-results', 'speed.json');
  rmSync(out, { force: true });
  const r = spawnSync('npx', ['playwright', 'test', 'e2e/speed.spec.ts', '--reporter=line'], {
    cwd: ROOT,
    encoding: 'utf8',
    env: process.env,
  });
  if (!existsSync(out)) return empty(`the browser measurement did not run: ${(r.stderr || r.stdout).slice(-400)}`);
  const f = JSON.parse(readFileSync(out, 'utf8')) as Record<string, unknown>;
  const num = (k: string) => (typeof f[k] === 'number' ? (f[k] as number) : null);
  const mems = Object.entries(f)
    .filter(([k]) => k.endsWith('Memory'))
    .map(([, v]) => (v as { peakRendererRssMb: number | null }).peakRendererRssMb)
    .filter((v): v is number => typeof v === 'number');
  return {
    firstPaintMs: num('firstPaintMs'),
    demoToProfileMs: num('demoToProfileMs'),
    dropToProfileMs: num('dropToProfileMs'),
    peakMemoryMb: mems.length ? Math.max(...mems) : null,
    detail: f,
    ...(r.status !== 0 ? { note: 'some browser measurements failed; see the Playwright output' } : {}),
  };
}
