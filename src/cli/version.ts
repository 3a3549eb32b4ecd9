/**
 * The program's version for the command line: package.json's version and the git commit when there is
 * one, set once into the core (core/version.ts), which saved projects and reports read.
 */
import { execFileSync } from 'node:child_process';
import { existsSync, readFileSync } from 'node:fs';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { formatSoftwareVersion, setSoftwareVersion, softwareVersion } from '../core';

/**
 * The checkout's folder: the first one up from this file holding package.json. The bundle
 * (dist-cli/borewave.cjs, CommonJS) has no import.meta.url but has __dirname; the sources have the URL.
 */
function packageRoot(): string {
  let dir = typeof __dirname === 'string' ? __dirname : dirname(fileURLToPath(import.meta.url));
  for (let i = 0; i < 4 && !existsSync(join(dir, 'package.json')); i++) dir = dirname(dir);
  return dir;
}

function detectVersion(): string {
  const root = packageRoot();
  let pkgVersion = 'unknown';
  try {
    pkgVersion = String((JSON.parse(readFileSync(join(root, 'package.json'), 'utf8')) as { version: string }).version);
  } catch {
    // keep 'unknown'
  }
  let commit: string | null = null;
  try {
    commit = execFileSync('git', ['rev-parse', '--short', 'HEAD'], {
      cwd: root,
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
