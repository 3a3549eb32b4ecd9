/**
 * The tightened Content-Security-Policy (W3C CSP Level 3: no 'unsafe-eval', no inline script; the
 * single-file build allows its inlined script by hash): the Trace board draws with WebGL (Plotly
 * scattergl from the strict bundle) with WebGL forced on in Chromium through SwiftShader, and no
 * violation is reported. The launch options must be top-level: they start a browser of their own.
 */
import { expect, test } from '@playwright/test';
import { SCREENS, waitProcessed } from './helpers';

const chromium = process.env.CHROMIUM_PATH || '/usr/bin/chromium';

test.use({
  launchOptions: {
    executablePath: chromium,
    // WebGL forced on: software GL (SwiftShader) through ANGLE, GPU block list ignored; no --disable-gpu.
    args: [
      '--headless',
      '--no-sandbox',
      '--enable-unsafe-swiftshader',
      '--use-angle=swiftshader',
      '--ignore-gpu-blocklist',
      '--disable-quic',
      '--no-first-run',
      '--disable-background-networking',
      '--disable-component-update',
      '--disable-sync',
    ],
  },
});

test('the Trace board draws scattergl traces on a WebGL canvas with no CSP violation', async ({ page }) => {
  const problems: string[] = [];
  page.on('pageerror', (e) => problems.push(`pageerror: ${e.message}`));
  page.on('console', (m) => {
    if (/Content[- ]Security[- ]Policy|unsafe-eval|EvalError/i.test(m.text())) problems.push(`console: ${m.text()}`);
  });
  await page.addInitScript(() => {
    (window as unknown as { __csp: string[] }).__csp = [];
    document.addEventListener('securitypolicyviolation', (e) =>
      (window as unknown as { __csp: string[] }).__csp.push(`${e.violatedDirective} ${e.blockedURI}`),
    );
  });
  await page.goto('/');
  const csp = await page.locator('meta[http-equiv="Content-Security-Policy"]').getAttribute('content');
  expect(csp).not.toContain('unsafe-eval');
  expect(csp).not.toMatch(/script-src[^;]*unsafe-inline/);
  const webgl = await page.evaluate(() => !!document.createElement('canvas').getContext('webgl'));
  expect(webgl).toBe(true);
  await page.locator('button[data-demo="downhole"]').click();
  await waitProcessed(page);
  await page.locator('.board-display summary').click();
  await page.getByLabel('Renderer').selectOption('webgl');
  const board = page.locator('[data-plot="trace-board"]');
  await expect
    .poll(() =>
      board.evaluate((d) =>
        ((d as unknown as { _fullData?: { type: string }[] })._fullData ?? []).some((t) => t.type === 'scattergl'),
      ),
    )
    .toBe(true);
  // Plotly's WebGL layer: a canvas holding a live WebGL context with something drawn.
  await expect
    .poll(() =>
      board.evaluate((d) =>
        Array.from(d.querySelectorAll('canvas')).some((c) => {
          const gl = (c.getContext('webgl') ?? c.getContext('webgl2')) as WebGLRenderingContext | null;
          return !!gl && !gl.isContextLost() && c.width > 0 && c.height > 0;
        }),
      ),
    )
    .toBe(true);
  await page.screenshot({ path: `${SCREENS}/40-webgl-board.png` });
  const violations = await page.evaluate(() => (window as unknown as { __csp: string[] }).__csp);
  expect(violations).toEqual([]);
  expect(problems).toEqual([]);
});
