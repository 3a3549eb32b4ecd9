/**
 * The program's version for the command line: package.json's version and the git commit when there is
 * one, set once into the core (core/version.ts), which saved projects and reports read.
 */
import { execFileSync } from 'node:child_process';
import { existsSync, readFileSync } from 'node:fs';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { formatSoftwareVersion, setSoftwareVersion, softwareVersion } from '../core';

/** The folder holding package.json, from this module (src/cli under tsx, dist-cli in the bundle). */
function packageRoot(): string | null {
  let dir: string;
  try {
    dir = typeof __dirname === 'string' ? __dirname : dirname(fileURLToPath(import.meta.url));
  } catch {
    return null;
  }
  for (let i = 0; i < 4; i++, dir = dirname(dir)) if (existsSync(join(dir, 'package.json'))) return dir;
  return null;
}

function detectVersion(): string {
  const root = packageRoot();
  let pkgVersion = 'unknown';
  try {
    if (root)
      pkgVersion = String(
        (JSON.parse(readFileSync(join(root, 'package.json'), 'utf8')) as { version: string }).version,
      );
  } catch {
    // keep 'unknown'
  }
  let commit: string | null = null;
  try {
    commit = execFileSync('git', ['rev-parse', '--short', 'HEAD'], {
      cwd: root ?? undefined,
      stdio: ['ignore', 'pipe', 'ignore'],
    })
      .toString()
      .trim();
  } catch {
    commit = null;
  }
  return formatSoftwareVersion(pkgVersion, commit && /^[0-9a-f]{4,40}$/.test(commit) ? commit : null);
}

/** The version the core reports, detected and set on first use when the build did not define it. */
export function cliSoftwareVersion(): string {
  if (softwareVersion() === 'unknown') setSoftwareVersion(detectVersion());
  return softwareVersion();
}
