/**
 * The joint travel-time inversion reaches the app through the method catalogue alone: its column shows
 * in the Profile's method table (header title "joint inversion") with a value in every S row, and the
 * profile uses the kind's default method (chosen on the bench's training seeds).
 */
import { expect, test } from '@playwright/test';
import { DEFAULT_PROFILE_METHOD } from '../src/core/catalogue/methods';
import { derivedState, waitProcessed } from './helpers';

for (const kind of ['downhole', 'crosshole'] as const) {
  test(`${kind} demo: the method table has a Joint column with a value in every S row`, async ({ page }) => {
    await page.goto('/');
    await page.locator(`button[data-demo="${kind}"]`).click();
    await waitProcessed(page);
    await expect(page.locator('th[title="joint inversion"]').first()).toBeVisible();
    const d = await derivedState(page);
    const s = d.intervals.filter((r) => r.wave === 'S');
    const joint = s.filter((r) => r.method === 'joint' && r.velocityMps !== null);
    const pairs = new Set(s.map((r) => r.key));
    expect(joint.length).toBe(pairs.size);
    if (kind === 'crosshole') {
      const used = s.filter((r) => r.chosen);
      expect(used.length).toBeGreaterThan(0);
      expect(used.every((r) => r.method === DEFAULT_PROFILE_METHOD.crosshole)).toBe(true);
    }
  });
}
