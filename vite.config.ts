import { execFileSync } from 'node:child_process';
import { readFileSync } from 'node:fs';
import type { Plugin } from 'vite';
import { defineConfig } from 'vitest/config';
import react from '@vitejs/plugin-react';
import { viteSingleFile } from 'vite-plugin-singlefile';
import { cspHashes } from './scripts/vite-csp.ts';

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
import { VitePWA } from 'vite-plugin-pwa';
import license from 'rollup-plugin-license';

// The installable offline app (dist/): a service worker precaches every built file, so after one visit
// the page opens with the server gone. Never in the single-file build (file:// has no service workers).
function offlineApp() {
  return VitePWA({
    registerType: 'prompt', // an update waits for the user's reload (autosave first), never mid-survey
    injectRegister: false, // registered by src/state/update.ts, only in a secure context
    includeManifestIcons: false, // the icons are already in globPatterns (listed once, not twice)
    manifest: {
      name: 'Borewave — borehole shear-wave profiles',
      short_name: 'Borewave',
      description: 'Downhole, seismic-cone and crosshole waveforms to a checked Vs profile, offline.',
      start_url: './',
      scope: './',
      display: 'standalone',
      background_color: '#f7f7f5',
      theme_color: '#0f3d3a',
      icons: [
        { src: 'icons/icon-192.png', sizes: '192x192', type: 'image/png' },
        { src: 'icons/icon-512.png', sizes: '512x512', type: 'image/png' },
        { src: 'icons/icon-maskable-512.png', sizes: '512x512', type: 'image/png', purpose: 'maskable' },
        { src: 'icons/borewave.svg', sizes: 'any', type: 'image/svg+xml' },
      ],
    },
    workbox: {
      globPatterns: ['**/*.{js,css,html,svg,png,txt}'],
      // Plotly alone is about 5 MB: precache it too, or the app would not draw offline.
      maximumFileSizeToCacheInBytes: 12 * 1024 * 1024,
      cleanupOutdatedCaches: true,
      navigateFallback: 'index.html',
    },
  });
}

function thirdPartyNotices() {
  return license({
    thirdParty: {
      includePrivate: false,
      output: {
        file: 'dist/THIRD-PARTY-NOTICES.txt',
        template: (deps) =>
          [
            readFileSync('LICENSE', 'utf8'),
            '',
            'Borewave includes the following open-source packages. Their licences follow.',
            '',
            ...deps.map((d) =>
              [`== ${d.name} ${d.version} (${d.license ?? 'licence not stated'})`, d.licenseText ?? '', ''].join('\n'),
            ),
          ].join('\n'),
      },
    },
  });
}

// The single-file build has no public/ folder beside it: its page names no icon file (no request at all).
function noIconFiles(): Plugin {
  return {
    name: 'borewave-no-icon-files',
    transformIndexHtml: (html) =>
      html
        .replace(/<link rel="icon"[^>]*>/, '<link rel="icon" href="data:," />')
        .replace(/\s*<link rel="apple-touch-icon"[^>]*>/, ''),
  };
}

// Two builds: the normal one (dist/, installable, offline after one visit) and one self-contained HTML
// file for offline use from disk (dist-single/).
export default defineConfig(({ mode }) => ({
  base: './',
  publicDir: mode === 'single' ? false : 'public',
  define: { __BOREWAVE_VERSION__: JSON.stringify(buildVersion()) },
  plugins:
    mode === 'single'
      ? [react(), viteSingleFile(), noIconFiles(), cspHashes()]
      : [react(), thirdPartyNotices(), offlineApp(), cspHashes()],
  build: {
    outDir: mode === 'single' ? 'dist-single' : 'dist',
    chunkSizeWarningLimit: 6000,
  },
  worker: { format: 'es' },
  // The development server and the production preview use different ports, so a production service
  // worker never takes over development pages.
  server: { port: 5173, strictPort: false },
  preview: { port: 4173, strictPort: true },
  test: {
    include: ['test/**/*.test.ts'],
    environment: 'node',
    testTimeout: 30000,
  },
}));
