/**
 * Set-up from the files in the browser (issue: survey set up from the files). Data: our forward-model
 * variants (src/core/synth/variants.ts). An unlabelled-depth survey (instrument-numbered files, V-first
 * channels named in RECEIVER, spread positions in RECEIVER_LOCATION) dropped with its record log: every
 * depth and hit shows source "log", every channel "header", and the spread positions are reported as
 * rejected header depths. Crosshole: a hole renamed to the field notes' name and a paste that uses it.
 */
import { expect, test } from '@playwright/test';
import { mkdirSync } from 'node:fs';
import { makeVariantSurvey } from '../src/core/synth/variants';
import { appState, SCREENS } from './helpers';

mkdirSync(SCREENS, { recursive: true });
test.use({ viewport: { width: 1366, height: 768 } });

test('unlabelled survey plus its record log: each value with its source', async ({ page }) => {
  const v = makeVariantSurvey({
    kind: 'downhole',
    seed: 31,
    componentOrder: ['V', 'H1', 'H2'],
    labels: 'receiver-words',
    locations: 'spread-index',
    naming: 'instrument',
    notes: false,
    format: 'seg2',
    depthCount: 8,
  });
  await page.goto('/');
  await page
    .getByTestId('file-input')
    .setInputFiles([
      ...v.files.map((f) => ({ name: f.name, mimeType: 'application/octet-stream', buffer: Buffer.from(f.bytes) })),
      { name: 'field-log.csv', mimeType: 'text/csv', buffer: Buffer.from(v.recordLogCsv) },
    ]);
  await expect(page.locator('li.file[data-status="ok"]')).toHaveCount(v.files.length);
  await page.getByRole('tab', { name: 'Geometry' }).click();
  await expect(page.getByTestId('setup-report')).toContainText('field-log.csv');
  await expect(page.getByTestId('setup-report')).toContainText('16 header values not read as depths');
  const st = await appState(page);
  expect(st.survey.records).toHaveLength(16);
  for (const t of v.truth) {
    const r = st.survey.records.find((x) => x.recordId === t.file)!;
    expect(r.depthM).toBeCloseTo(t.loggedDepthM, 9);
    expect(r.hit).toBe(t.hit);
    expect(r).toMatchObject({ depthSource: 'log', hitSource: 'log' });
    expect(r.channels.map((c) => c.component)).toEqual(['V', 'H1', 'H2']);
    expect(r.channels.map((c) => c.source)).toEqual(['header', 'header', 'header']);
  }
  // On the page: each value shows its source in words.
  const row = page.locator('tr[data-record="1.sg2"]');
  await expect(row.locator('.src[data-source="log"]')).toHaveCount(2);
  await expect(row.locator('.src[data-source="header"]')).toHaveCount(3);
  // The last channel column is reachable at 1366 px (scrolled into view inside the table).
  const lastChan = row.locator('td.chan').last();
  await lastChan.scrollIntoViewIfNeeded();
  await expect(lastChan).toBeInViewport();
  await page.getByTestId('setup-report').getByRole('button', { name: 'show' }).click();
  await expect(page.getByTestId('setup-report')).toContainText('traces-differ-spread');
  await page.screenshot({ path: `${SCREENS}/70-setup-sources-1366.png` });

  // A user edit is marked "user"; the channel map applies to every record in one step.
  await page.getByLabel('Depth of 1.sg2').fill('99');
  await page.getByLabel('Depth of 1.sg2').press('Enter');
  await expect(row.locator('td.placed').first().locator('.src')).toHaveAttribute('data-source', 'user');
  await page.getByLabel('Map component of channel 1').selectOption('H2');
  await page.getByRole('button', { name: 'Apply to all records' }).click();
  const after = await appState(page);
  expect(after.survey.records.every((r) => r.channels[0].component === 'H2' && r.channels[0].source === 'user')).toBe(
    true,
  );
  // Bulk edit: select all, set hit.
  await page.getByLabel('Select all records').check();
  await page.getByLabel('Hit for selected').selectOption('none');
  await page.getByRole('button', { name: 'Set hit' }).click();
  expect((await appState(page)).survey.records.every((r) => r.hit === 'none' && r.hitSource === 'user')).toBe(true);
});

test('crosshole: rename a hole to the field notes name, paste rows that use it', async ({ page }) => {
  const v = makeVariantSurvey({
    kind: 'crosshole',
    seed: 32,
    componentOrder: ['V', 'H1'],
    labels: 'none',
    locations: 'none',
    naming: 'instrument',
    notes: false,
    format: 'seg2',
    depthCount: 3,
  });
  await page.goto('/');
  await page.getByRole('tab', { name: 'Geometry' }).click();
  await page.getByLabel('Test kind').selectOption('crosshole');
  await page
    .getByTestId('file-input')
    .setInputFiles(
      v.files.map((f) => ({ name: f.name, mimeType: 'application/octet-stream', buffer: Buffer.from(f.bytes) })),
    );
  await expect(page.locator('li.file[data-status="ok"]')).toHaveCount(v.files.length);
  await page.getByLabel('Name of hole near').fill('R1');
  await page.getByLabel('Name of hole near').press('Enter');
  await page.getByLabel('Name of hole far').fill('R2 (far)');
  await page.getByLabel('Name of hole far').press('Enter');
  let st = await appState(page);
  expect(st.survey.receiverHoleIds).toEqual(['R1', 'R2 (far)']);
  // Channels name receiver slots, so a rename keeps every channel on its hole.
  expect(st.survey.records.every((r) => r.channels.every((c) => ['r0', 'r1'].includes(c.receiver)))).toBe(true);
  // Paste the field notes' rows: file, depth, hit, then component and receiver per channel.
  const rows = v.truth
    .map((t) =>
      [
        t.file,
        String(t.loggedDepthM),
        t.hit,
        ...t.channels.flatMap((c) => [c.component, c.receiver === 'r0' ? 'r1' : 'r2 (FAR)']),
      ].join('\t'),
    )
    .join('\n');
  await page.getByTestId('geometry-records').evaluate((el, text) => {
    const dt = new DataTransfer();
    dt.setData('text/plain', text);
    el.dispatchEvent(new ClipboardEvent('paste', { clipboardData: dt, bubbles: true, cancelable: true }));
  }, rows);
  await expect(page.locator('.notice')).toHaveText(`${v.truth.length} rows applied.`);
  st = await appState(page);
  for (const t of v.truth) {
    const r = st.survey.records.find((x) => x.recordId === t.file)!;
    expect(r.depthM).toBeCloseTo(t.loggedDepthM, 9);
    expect(r.channels.map((c) => c.receiver)).toEqual(t.channels.map((c) => c.receiver));
    expect(r.channels.map((c) => c.component)).toEqual(t.channels.map((c) => c.component));
    expect(r).toMatchObject({ depthSource: 'user', hitSource: 'user' });
  }
  await page.screenshot({ path: `${SCREENS}/71-crosshole-renamed-1366.png` });
});
