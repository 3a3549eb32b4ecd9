/**
 * Instrument files in the app: same-name files are kept apart; text files without a time column are
 * read after one sample-interval question for the group; SEG-2 warnings are shown under the file.
 */
import { expect, test } from '@playwright/test';
import { buildSeg2, int16Hex, sampleBytes } from '../test/io/seg2-fixtures';

test('same-name text files without a time column: kept apart, one sample-interval question for both', async ({
  page,
}) => {
  await page.goto('/');
  const list = (k: number) => `Amplitude\n${[0.5, -0.25, 0.125, 0, -0.5].map((x) => x * k).join('\n')}\n`;
  await page.getByTestId('file-input').setInputFiles([
    { name: '1.txt', mimeType: 'text/plain', buffer: Buffer.from(list(1)) },
    { name: '1.txt', mimeType: 'text/plain', buffer: Buffer.from(list(2)) },
  ]);
  await expect(page.locator('li.file[data-status="error"]')).toHaveCount(2);
  await expect(page.locator('li.file[data-file="1 (2).txt"] .file-error')).toContainText('no time column');
  const q = page.getByTestId('interval-question');
  await expect(q).toHaveCount(1);
  await expect(q).toContainText('2 text files have no time column');
  await page.getByTestId('interval-value').fill('0.25');
  await page.getByTestId('interval-apply').click();
  await expect(page.locator('li.file[data-status="ok"]')).toHaveCount(2);
  await expect(page.locator('li.file[data-file="1.txt"]')).toContainText('0.250 ms');
  await expect(page.locator('li.file[data-file="1 (2).txt"]')).toContainText('kept apart as 1 (2).txt');
  await expect(page.locator('li.file[data-file="1 (2).txt"]')).toContainText('sample interval from given');
  await expect(q).toHaveCount(0);
});

test('a SEG-2 file of revision 99 reads with its warning shown under it', async ({ page }) => {
  await page.goto('/');
  const f = buildSeg2({
    order: 'little',
    revision: 99,
    fileStrings: ['SAMPLE_INTERVAL 0.0005'],
    traces: [
      {
        strings: ['CHANNEL_NUMBER 1'],
        formatCode: 1,
        sampleCount: 4,
        data: sampleBytes(int16Hex([1, -1, 2, -2]), 'little'),
      },
    ],
  });
  await page
    .getByTestId('file-input')
    .setInputFiles({ name: 'rev.sg2', mimeType: 'application/octet-stream', buffer: Buffer.from(f) });
  const li = page.locator('li.file[data-file="rev.sg2"]');
  await expect(li).toHaveAttribute('data-status', 'ok');
  await expect(li.locator('.file-warning[data-code="SEG2_REVISION"]')).toContainText('revision number 99');
});
