/**
 * Installable and offline after one visit: the production build registers a service worker that
 * precaches every built file. Open the page once, STOP the server (taking the browser context offline
 * does not cut a service worker's own fetches in Chromium), reload: the app opens, the demo opens, files
 * can be dropped and a CSV exported, every precached URL comes from the cache, and no request leaves
 * the origin. An update served afterwards shows the reload prompt and loses no edit.
 * References: W3C Service Workers (registration in a secure context; install, waiting, activate) and
 * the Web App Manifest specification (name, icons, start_url, display).
 */
import { test, expect, type Page } from '@playwright/test';
import { spawn, type ChildProcess } from 'node:child_process';
import { appendFileSync, cpSync, mkdtempSync, readFileSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import { appState, SCREENS, waitProcessed } from './helpers';

const PORT = Number(process.env.E2E_PORT || 4173) + 50;
const ORIGIN = `http://127.0.0.1:${PORT}`;

function serve(dir: string): ChildProcess {
  const child = spawn(
    'npx',
    ['vite', 'preview', '--outDir', dir, '--host', '127.0.0.1', '--port', String(PORT), '--strictPort'],
    { detached: true, stdio: 'ignore' },
  );
  return child;
}

async function stop(child: ChildProcess): Promise<void> {
  if (child.pid) {
    try {
      process.kill(-child.pid, 'SIGTERM');
    } catch {
      // already gone
    }
  }
  await new Promise((r) => setTimeout(r, 500));
}

async function waitUp(): Promise<void> {
  for (let i = 0; i < 120; i++) {
    try {
      const r = await fetch(`${ORIGIN}/index.html`);
      if (r.ok) return;
    } catch {
      // not yet
    }
    await new Promise((r) => setTimeout(r, 250));
  }
  throw new Error(`preview server on ${ORIGIN} did not start`);
}

async function waitDown(): Promise<void> {
  for (let i = 0; i < 40; i++) {
    try {
      await fetch(`${ORIGIN}/index.html`);
    } catch {
      return;
    }
    await new Promise((r) => setTimeout(r, 250));
  }
  throw new Error('preview server still answers');
}

interface BorewaveHandles {
  useAutosave: { getState: () => { status: string; savedRevision: number | null } };
  useApp: { getState: () => { revision: number } };
}

async function controlled(page: Page): Promise<boolean> {
  return page.evaluate(() => !!navigator.serviceWorker?.controller);
}

test('after one visit the app opens, computes and exports with the server stopped; an update asks first', async ({
  browser,
}) => {
  test.setTimeout(400_000);
  const dir = mkdtempSync(join(tmpdir(), 'borewave-dist-'));
  cpSync(resolve('dist'), dir, { recursive: true });
  const manifest = JSON.parse(readFileSync(join(dir, 'manifest.webmanifest'), 'utf8')) as {
    name: string;
    icons: { src: string; sizes: string }[];
    display: string;
  };
  expect(manifest.display).toBe('standalone');
  expect(manifest.icons.map((i) => i.sizes)).toEqual(expect.arrayContaining(['192x192', '512x512']));

  let server = serve(dir);
  const context = await browser.newContext({ acceptDownloads: true });
  // Every action, navigation and awaited event fails at its own line rather than at the test's timeout.
  context.setDefaultTimeout(60_000);
  // Every request (page and service worker), every response with where it came from, every failure.
  const requests: string[] = [];
  const responses: { url: string; fromServiceWorker: boolean }[] = [];
  const failed: string[] = [];
  context.on('request', (r) => requests.push(r.url()));
  context.on('response', (r) => responses.push({ url: r.url(), fromServiceWorker: r.fromServiceWorker() }));
  context.on('requestfailed', (r) => failed.push(r.url()));
  // The page's CSP (connect-src 'none') stays as it is: registering the service worker, the manifest and
  // the cached files must raise no violation.
  await context.addInitScript(() => {
    const seen: string[] = [];
    (window as unknown as { __cspViolations: string[] }).__cspViolations = seen;
    document.addEventListener('securitypolicyviolation', (e) => seen.push(`${e.violatedDirective} ${e.blockedURI}`));
  });
  const cspViolations = (p: Page) =>
    p.evaluate(() => (window as unknown as { __cspViolations: string[] }).__cspViolations);
  try {
    await waitUp();
    const first = await context.newPage();
    await first.goto(`${ORIGIN}/index.html`);
    // The service worker installs and precaches; pages opened after that are controlled by it.
    await first.waitForFunction(
      async () => (await navigator.serviceWorker.getRegistration())?.active?.state === 'activated',
      null,
      { timeout: 60_000 },
    );
    await first.close();
    const page = await context.newPage();
    await page.goto(`${ORIGIN}/index.html`);
    // The first navigation after activation may still go to the network; the next ones are controlled.
    await expect
      .poll(
        async () => {
          if (!(await controlled(page))) await page.reload();
          return controlled(page);
        },
        { timeout: 30_000, intervals: [250, 500, 1000] },
      )
      .toBe(true);

    // An edit before going offline, to check later that nothing is lost.
    await page.locator('button[data-demo="downhole"]').click();
    await waitProcessed(page);

    // Autosave has stored this session (it saves within a second of a change; a reload before that
    // would find nothing to restore).
    await page.waitForFunction(() => {
      const b = (window as unknown as { __borewave: BorewaveHandles }).__borewave;
      const a = b.useAutosave.getState();
      return a.status === 'saved' && a.savedRevision === b.useApp.getState().revision;
    });
    // Server gone.
    await stop(server);
    await waitDown();
    requests.length = 0;
    responses.length = 0;
    failed.length = 0;
    await page.reload();
    expect(await controlled(page)).toBe(true);
    await expect(page.locator('button[data-demo="downhole"]')).toBeVisible();
    // The session saved before the server stopped comes back from the browser's storage.
    await page.getByTestId('restore-banner').getByRole('button', { name: 'Restore it' }).click();
    await waitProcessed(page);
    await expect(page.locator('li.file[data-status="ok"]')).toHaveCount(60);
    // And a demo survey opens offline.
    await page.locator('button[data-demo="downhole-pair"]').click();
    await waitProcessed(page);
    await expect(page.getByTestId('vs30-line')).toContainText('Vs30 =');
    // Files dropped while offline are read (a one-trace delimited text file).
    const text = [
      'time_ms,H1',
      ...Array.from({ length: 200 }, (_, i) => `${(i * 0.25).toFixed(2)},${Math.sin(i / 7)}`),
    ];
    await page
      .getByTestId('file-input')
      .setInputFiles({ name: 'offline-1.csv', mimeType: 'text/csv', buffer: Buffer.from(text.join('\n')) });
    await expect(page.locator('li.file[data-file="offline-1.csv"]')).toHaveAttribute('data-status', 'ok');
    // A CSV export works offline.
    await page.getByRole('button', { name: /^Export…/ }).click();
    const [dl] = await Promise.all([
      page.waitForEvent('download'),
      page.getByRole('button', { name: /^Profile with stiffness/ }).click(),
    ]);
    expect(readFileSync((await dl.path())!, 'utf8')).toContain('# CAUTION:');
    await page.screenshot({ path: `${SCREENS}/60-offline-after-one-visit.png` });

    expect(await cspViolations(page)).toEqual([]);
    const foreign = requests.filter((u) => !u.startsWith(ORIGIN) && !u.startsWith('blob:') && !u.startsWith('data:'));
    expect(foreign).toEqual([]);
    // With the server stopped, every file of the app was answered by the service worker's cache; the
    // only failed request is the browser's own check for a newer sw.js.
    const appFiles = responses.filter((r) => r.url.startsWith(ORIGIN) && !r.url.endsWith('/sw.js'));
    expect(appFiles.length).toBeGreaterThan(3);
    expect(appFiles.filter((r) => !r.fromServiceWorker)).toEqual([]);
    expect(failed.filter((u) => !u.endsWith('/sw.js'))).toEqual([]);

    // An update: a changed service worker served later waits for the user; the reload saves first.
    appendFileSync(join(dir, 'sw.js'), '\n// next version\n');
    server = serve(dir);
    await waitUp();
    // An edit just before the update (exclude the selected trace): it must survive the reload.
    await page.keyboard.press('ArrowDown');
    await page.keyboard.press('x');
    const before = await appState(page);
    expect(before.edits.excludedStations.length).toBeGreaterThan(0);
    await page.evaluate(async () => {
      await (await navigator.serviceWorker.getRegistration())?.update();
    });
    const banner = page.getByLabel('Update');
    await expect(banner).toContainText('A new version of Borewave is ready', { timeout: 60_000 });
    await expect(banner).toContainText('Your session is saved first');
    await page.screenshot({ path: `${SCREENS}/61-update-ready.png` });
    await Promise.all([
      page.waitForEvent('load', { timeout: 60_000 }),
      page.getByRole('button', { name: 'Reload now' }).click(),
    ]);
    // After the reload the saved session is offered back (autosave ran before the switch). While that
    // question is open autosave is paused: a further update says a reload would lose this page's changes.
    appendFileSync(join(dir, 'sw.js'), '\n// version after next\n');
    await page.evaluate(async () => {
      await (await navigator.serviceWorker.getRegistration())?.update();
    });
    await expect(banner).toContainText('Your session is saved first', { timeout: 60_000 });
    await page.getByRole('group', { name: 'Units' }).getByRole('button', { name: 'US' }).click();
    await expect(banner).toHaveAttribute('data-unsaved', 'restore-pending');
    await expect(banner).toContainText('Autosave is paused');
    await expect(banner.getByRole('button', { name: 'Reload anyway' })).toBeVisible();
    // Restored, edit included; autosave is on again and the banner goes back to saving first.
    await page.getByTestId('restore-banner').getByRole('button', { name: 'Restore it' }).click({ timeout: 30_000 });
    await waitProcessed(page);
    const after = await appState(page);
    expect(after.edits.excludedStations).toEqual(before.edits.excludedStations);
    await expect(banner).toContainText('Your session is saved first');
    expect(await cspViolations(page)).toEqual([]);
  } finally {
    await context.close();
    await stop(server);
    rmSync(dir, { recursive: true, force: true });
  }
});
