/**
 * The program's version as saved in project.json `softwareVersion`: the package version and the build
 * commit where known. The web build injects __BOREWAVE_VERSION__ (vite `define`); the command line sets
 * it at start-up from package.json and git (setSoftwareVersion). Distinct from the schema version.
 */
declare const __BOREWAVE_VERSION__: string | undefined;

let version: string =
  typeof __BOREWAVE_VERSION__ === 'string' && __BOREWAVE_VERSION__ ? __BOREWAVE_VERSION__ : 'unknown';

export function softwareVersion(): string {
  return version;
}

export function setSoftwareVersion(v: string): void {
  version = v;
}

/** "0.2.0 (abc1234)" or "0.2.0" when the commit is unknown. */
export function formatSoftwareVersion(packageVersion: string, commit: string | null): string {
  return commit ? `${packageVersion} (${commit})` : packageVersion;
}
