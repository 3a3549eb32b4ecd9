/**
 * The command line as one prebuilt JavaScript file (dist-cli/borewave.cjs), bundled with esbuild, so a
 * run needs no transpiler or type checker. `bin/borewave.mjs` (what `npm run cli` and
 * `npx --no-install borewave` run) calls ensureCliBundle(), which rebuilds only when a file under src/
 * or the lock file is newer than the bundle. `node scripts/build-cli.mjs` forces a build.
 */
import { existsSync, readdirSync, statSync } from 'node:fs';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';

export const ROOT = join(dirname(fileURLToPath(import.meta.url)), '..');
export const BUNDLE = join(ROOT, 'dist-cli', 'borewave.cjs');
const ENTRY = join(ROOT, 'src', 'cli', 'main.ts');

/** Latest modification time (ms) of the files under dir (recursive), 0 when dir is missing. */
function newestMtimeMs(dir) {
  let newest = 0;
  let entries;
  try {
    entries = readdirSync(dir, { withFileTypes: true });
  } catch {
    return 0;
  }
  for (const e of entries) {
    const p = join(dir, e.name);
    const t = e.isDirectory() ? newestMtimeMs(p) : statSync(p).mtimeMs;
    if (t > newest) newest = t;
  }
  // A deleted or renamed file changes the directory's own time.
  return Math.max(newest, statSync(dir).mtimeMs);
}

/** True when the bundle is missing or older than a source file (only checkable in a checkout with src/). */
export function cliBundleIsStale() {
  if (!existsSync(BUNDLE)) return true;
  if (!existsSync(ENTRY)) return false;
  const built = statSync(BUNDLE).mtimeMs;
  const inputs = [join(ROOT, 'package.json'), join(ROOT, 'package-lock.json')]
    .filter((p) => existsSync(p))
    .map((p) => statSync(p).mtimeMs);
  return Math.max(newestMtimeMs(join(ROOT, 'src')), ...inputs) > built;
}

/** Bundles src/cli/main.ts and everything it imports into dist-cli/borewave.cjs. */
export async function buildCli() {
  const esbuild = await import('esbuild');
  await esbuild.build({
    entryPoints: [ENTRY],
    outfile: BUNDLE,
    bundle: true,
    platform: 'node',
    format: 'cjs',
    target: 'node20',
    legalComments: 'none',
    logLevel: 'warning',
    // src/cli/version.ts reads import.meta.url only outside the bundle (it uses __dirname here).
    logOverride: { 'empty-import-meta': 'silent' },
  });
}

export async function ensureCliBundle() {
  if (cliBundleIsStale()) await buildCli();
  return BUNDLE;
}

if (process.argv[1] && fileURLToPath(import.meta.url) === process.argv[1]) {
  const t0 = performance.now();
  await buildCli();
  process.stdout.write(`built ${BUNDLE} in ${(performance.now() - t0).toFixed(0)} ms\n`);
}
