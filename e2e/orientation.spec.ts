/**
 * Set-up from the data, end to end: an unlabelled survey from a probe turning over the full circle
 * (hits logged nowhere, files shuffled, repeated and missing hits) gives azimuths, inferred hits and a
 * correct profile; a careless set-up (hits none, component labels shifted) shows the blocking
 * problems instead of a Vs30. Screens at 1366x768 (the field-laptop size).
 */
import { expect, test } from '@playwright/test';
import { mkdirSync } from 'node:fs';
import { newProjectDocument, writeProjectArchive } from '../src/core/io/project';
import { writeSeg2 } from '../src/core/io/seg2';
import { toSeg2Input, type SynthResult } from '../src/core/synth/synthesize';
import { carelessSetup, stripHitLabels, variantSurvey } from '../src/core/synth/orientationVariants';
import { appState, derivedState, SCREENS, waitProcessed } from './helpers';

function filesOf(res: SynthResult) {
  return res.records.map((r) => ({
    name: r.fileName,
    mimeType: 'application/octet-stream',
    buffer: Buffer.from(writeSeg2(toSeg2Input(r), { byteOrder: 'little', formatCode: 4 })),
  }));
}

// The demo earth's Vs30 over 1-30 m (forward-model layers, sample-data/README.md): 238 m/s.
const TRUE_VS30_MPS = 238;

test('unlabelled turning probe: azimuths, inferred hits, profile; careless set-up: blocking problems, no Vs30', async ({
  page,
}) => {
  mkdirSync(SCREENS, { recursive: true });
  await page.setViewportSize({ width: 1366, height: 768 });
  await page.goto('/');
  const res = stripHitLabels(
    variantSurvey({ kind: 'downhole', seed: 9005, azimuthWalkSdRad: 0.35, repeatShare: 0.15, missingShare: 0.1 }),
    9005,
  );
  await page.getByTestId('file-input').setInputFiles(filesOf(res));
  await expect(page.locator('li.file[data-status="ok"]')).toHaveCount(res.records.length);
  await waitProcessed(page);
  const placed = (await appState(page)).survey.records;
  expect(placed.every((r) => r.hit === 'none')).toBe(true);
  await expect(page.getByTestId('vs30-line')).toContainText('Vs30 =');
  const d = await derivedState(page);
  expect(Math.abs(d.vs30! / TRUE_VS30_MPS - 1)).toBeLessThan(0.05);
  await expect(page.locator('[data-testid="setup-problems"] li.blocking')).toHaveCount(0);

  await page.getByRole('tab', { name: 'Geometry' }).click();
  const table = page.getByTestId('orientation-table');
  await expect(table.locator('tbody tr')).toHaveCount(30);
  // Every depth's hits came from the data, with an azimuth per receiver.
  await expect(table.locator('tbody tr td:nth-child(3)', { hasText: 'data' })).toHaveCount(30);
  const azimuths = await table
    .locator('input[aria-label^="Azimuth"]')
    .evaluateAll((els) => els.map((e) => Number((e as HTMLInputElement).value)));
  expect(azimuths).toHaveLength(30);
  // The probe turned: the azimuths cover more than half the circle.
  expect(Math.max(...azimuths) - Math.min(...azimuths)).toBeGreaterThan(180);
  await page.screenshot({ path: `${SCREENS}/60-unlabelled-turning-probe.png` });

  // One action swaps every inferred hit; the profile stays the same (the difference trace flips with both).
  await page.getByRole('button', { name: 'Swap all hits' }).click();
  await waitProcessed(page);
  await expect(page.getByTestId('vs30-line')).toContainText('Vs30 =');
  expect((await appState(page)).survey.hitSwap).toBe(true);

  page.once('dialog', (dlg) => void dlg.accept());
  await page.getByRole('button', { name: 'Start fresh' }).click();
  await expect(page.locator('li.file')).toHaveCount(0);

  const careless = carelessSetup(variantSurvey({ kind: 'downhole', seed: 9007, azimuthWalkSdRad: 0 }));
  const zip = writeProjectArchive(
    newProjectDocument(careless.survey),
    careless.records.map((r) => ({
      name: r.fileName,
      bytes: writeSeg2(toSeg2Input(r), { byteOrder: 'little', formatCode: 4 }),
    })),
  );
  await page
    .getByTestId('file-input')
    .setInputFiles({ name: 'careless.zip', mimeType: 'application/zip', buffer: Buffer.from(zip) });
  await waitProcessed(page);
  const problems = page.getByTestId('setup-problems');
  await expect(problems).toBeVisible();
  await expect(problems.locator('li.blocking').first()).toBeVisible();
  await expect(problems).toContainText('Fix:');
  await expect(page.getByTestId('vs30-line')).toContainText('withheld');
  expect((await derivedState(page)).vs30).toBeNull();
  await page.getByRole('button', { name: 'Site…' }).click();
  await expect(page.getByTestId('site-withheld')).toBeVisible();
  await expect(page.getByTestId('site-vs30')).toHaveCount(0);
  await page.screenshot({ path: `${SCREENS}/61-careless-setup-blocked.png` });
});
