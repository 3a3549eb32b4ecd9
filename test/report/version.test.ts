/**
 * Traceability: every export names the program that made it. The expected version is the project's own
 * release number in package.json (semantic versioning, common practice); the build commit is the one
 * `git rev-parse --short HEAD` reports for this checkout.
 */
import { execFileSync } from 'node:child_process';
import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { toCsv } from '../../src/core/report/tables';
import { softwareVersion } from '../../src/core';

const packageVersion = String(JSON.parse(readFileSync('package.json', 'utf8')).version);
// vite.config.ts (also read by vitest) defines it; the command line finds it the same way (src/cli/version.ts).
const commit = process.env.BOREWAVE_COMMIT ?? execFileSync('git', ['rev-parse', '--short', 'HEAD']).toString().trim();
const expected = commit ? `${packageVersion} (${commit})` : packageVersion;

describe('software version in exports and the command line', () => {
  it('is the package.json version and the build commit', () => {
    expect(softwareVersion()).toBe(expected);
  });

  it('a CSV carries it as a # line after the table, before the cautions', () => {
    const lines = toCsv({ columns: ['depth_m'], rows: [[1]] }, ['Review.'])
      .trim()
      .split('\n');
    expect(lines).toEqual(['depth_m', '1', `# SOFTWARE: Borewave ${expected}`, '# CAUTION: Review.']);
  });

  it('`borewave --version` (the built command line) prints the version and the build commit', () => {
    const out = execFileSync(process.execPath, ['bin/borewave.mjs', '--version']).toString().trim();
    expect(out).toBe(`borewave ${expected}`);
  }, 60_000);
});
