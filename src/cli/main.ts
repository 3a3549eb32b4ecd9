/**
 * Command-line dispatcher: `npm run cli -- <command> ...` or `npx --no-install borewave <command> ...`
 * (bin/borewave.mjs runs this file bundled by scripts/build-cli.mjs).
 */
import { runInspect, type CliIo } from './inspect';
import { runProfile } from './profile';
import { runReport } from './report';
import { cliSoftwareVersion } from './version';

type Command = (args: string[], io: CliIo) => Promise<number>;

const COMMANDS: Record<string, Command> = {
  inspect: runInspect,
  profile: runProfile,
  report: runReport,
};

async function main(argv: string[]): Promise<number> {
  cliSoftwareVersion();
  const [name, ...rest] = argv;
  if (name === '--version' || name === 'version') {
    process.stdout.write(`borewave ${cliSoftwareVersion()}\n`);
    return 0;
  }
  const usage = `usage: borewave <${Object.keys(COMMANDS).join('|')}> ...\n`;
  if (name === 'help' || name === '--help' || name === '-h') {
    process.stdout.write(usage);
    return 0;
  }
  const command = name ? COMMANDS[name] : undefined;
  if (!command) {
    process.stderr.write(usage);
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
