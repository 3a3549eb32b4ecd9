/**
 * Command-line dispatcher: `npm run cli -- <command> ...`.
 */
import { execFileSync } from 'node:child_process';
import { readFileSync } from 'node:fs';
import { formatSoftwareVersion, setSoftwareVersion } from '../core';
import { runInspect, type CliIo } from './inspect';
import { runProfile } from './profile';

type Command = (args: string[], io: CliIo) => Promise<number>;

const COMMANDS: Record<string, Command> = {
  inspect: runInspect,
  profile: runProfile,
};

/** softwareVersion for saved projects: package.json's version and the git commit when there is one. */
function detectVersion(): string {
  const pkg = JSON.parse(readFileSync(new URL('../../package.json', import.meta.url), 'utf8')) as { version: string };
  let commit: string | null = null;
  try {
    commit = execFileSync('git', ['rev-parse', '--short', 'HEAD'], { stdio: ['ignore', 'pipe', 'ignore'] })
      .toString()
      .trim();
  } catch {
    commit = null;
  }
  return formatSoftwareVersion(pkg.version, commit || null);
}

async function main(argv: string[]): Promise<number> {
  setSoftwareVersion(detectVersion());
  const [name, ...rest] = argv;
  const command = name ? COMMANDS[name] : undefined;
  if (!command) {
    process.stderr.write(`usage: cli <${Object.keys(COMMANDS).join('|')}> ...\n`);
    return 2;
  }
  // `npm run cli` runs in the repository; npm sets INIT_CWD to the folder the user typed the command in,
  // and relative paths are read from there.
  const cwd = process.env.INIT_CWD || process.cwd();
  return command(rest, { stdout: process.stdout, stderr: process.stderr, cwd });
}

main(process.argv.slice(2)).then(
  (code) => {
    process.exitCode = code;
  },
  (e: unknown) => {
    process.stderr.write(`cli: ${e instanceof Error ? e.message : String(e)}\n`);
    process.exitCode = 1;
  },
);
