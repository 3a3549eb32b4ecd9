/**
 * The program's version for the command line: package.json's version and the git commit when there is
 * one, set once into the core (core/version.ts), which saved projects and reports read.
 */
import { execFileSync } from 'node:child_process';
import { readFileSync } from 'node:fs';
import { formatSoftwareVersion, setSoftwareVersion, softwareVersion } from '../core';

function detectVersion(): string {
  let pkgVersion = 'unknown';
  try {
    pkgVersion = String(
      (JSON.parse(readFileSync(new URL('../../package.json', import.meta.url), 'utf8')) as { version: string }).version,
    );
  } catch {
    // keep 'unknown'
  }
  let commit: string | null = null;
  try {
    commit = execFileSync('git', ['rev-parse', '--short', 'HEAD'], {
      cwd: new URL('../..', import.meta.url).pathname,
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
