/**
 * Nothing leaves the laptop: the Content-Security-Policy of index.html refuses every connection
 * (connect-src 'none'), the app makes no request beyond its own files, and the single-file build works
 * opened from file:// (inline worker, demo survey, auto-pick) without any network request.
 * Reference: W3C Content Security Policy Level 3, "connect-src" (fetch is refused with a violation).
 */
import { test, expect } from '@playwright/test';
import { resolve } from 'node:path';
import { pathToFileURL } from 'node:url';
import { SCREENS, waitProcessed } from './helpers';

test('the page refuses connections (CSP connect-src none) and requests only its own files', async ({
  page,
  baseURL,
}) => {
  const requests: string[] = [];
  page.on('request', (r) => requests.push(r.url()));
  await page.goto('/');
  await page.locator('button[data-demo="downhole-pair"]').click();
  await waitProcessed(page);
  const outcome = await page.evaluate(async () => {
    const violations: string[] = [];
    document.addEventListener('securitypolicyviolation', (e) => violations.push(e.violatedDirective));
    let fetched = 'allowed';
    try {
      await fetch('/index.html');
    } catch {
      fetched = 'refused';
    }
    await new Promise((r) => setTimeout(r, 50));
    return { fetched, violations };
  });
  expect(outcome.fetched).toBe('refused');
  expect(outcome.violations).toContain('connect-src');
  const foreign = requests.filter((u) => !u.startsWith(baseURL!) && !u.startsWith('blob:') && !u.startsWith('data:'));
  expect(foreign).toEqual([]);
  await page.screenshot({ path: `${SCREENS}/30-two-receiver.png` });
});

test('the single-file build runs from file:// with no network request', async ({ page }) => {
  const requests: string[] = [];
  page.on('request', (r) => requests.push(r.url()));
  const errors: string[] = [];
  page.on('pageerror', (e) => errors.push(e.message));
  await page.goto(pathToFileURL(resolve('dist-single/index.html')).href);
  await page.locator('button[data-demo="downhole"]').click();
  await waitProcessed(page);
  await expect(page.locator('li.file[data-status="ok"]')).toHaveCount(60);
  await expect(page.getByTestId('vs30-line')).toContainText('Vs30 =');
  const network = requests.filter((u) => !u.startsWith('file:') && !u.startsWith('blob:') && !u.startsWith('data:'));
  expect(network).toEqual([]);
  expect(errors).toEqual([]);
});
