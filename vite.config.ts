import { defineConfig } from 'vitest/config';
import react from '@vitejs/plugin-react';
import { viteSingleFile } from 'vite-plugin-singlefile';
import { cspHashes } from './scripts/vite-csp.ts';
import { execFileSync } from 'node:child_process';
import { readFileSync } from 'node:fs';

/** softwareVersion saved in projects: package version and build commit where known (src/core/version.ts). */
function buildVersion(): string {
  const pkg = JSON.parse(readFileSync(new URL('./package.json', import.meta.url), 'utf8')) as { version: string };
  try {
    const commit = execFileSync('git', ['rev-parse', '--short', 'HEAD'], { stdio: ['ignore', 'pipe', 'ignore'] })
      .toString()
      .trim();
    return commit ? `${pkg.version} (${commit})` : pkg.version;
  } catch {
    return pkg.version;
  }
}

// Two builds: the normal one (dist/) and one self-contained HTML file for offline use (dist-single/).
export default defineConfig(({ mode }) => ({
  base: './',
  define: { __BOREWAVE_VERSION__: JSON.stringify(buildVersion()) },
  plugins: mode === 'single' ? [react(), viteSingleFile(), cspHashes()] : [react(), cspHashes()],
  build: {
    outDir: mode === 'single' ? 'dist-single' : 'dist',
    chunkSizeWarningLimit: 6000,
  },
  worker: { format: 'es' },
  server: { port: 5173, strictPort: false },
  preview: { port: 4173, strictPort: true },
  test: {
    include: ['test/**/*.test.ts'],
    environment: 'node',
    testTimeout: 30000,
  },
}));
