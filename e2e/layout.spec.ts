/**
 * Layout on a field laptop (1366 x 768; issue 16, design.md "Look"): every control of the Geometry pane
 * lies inside the pane's width (the pane never scrolls sideways; only the wide records table scrolls
 * inside its own box), and each button, once scrolled to, is in the window and not covered by anything
 * (an open sheet included). The Records pane is resizable like the others, by mouse and keyboard.
 */
import { test, expect, type Page } from '@playwright/test';
import { SCREENS, waitProcessed } from './helpers';

interface Problem {
  what: string;
  why: string;
}

/** Controls of the Geometry pane outside its visible width (the records table's own scroll box aside). */
async function outsidePane(
  page: Page,
): Promise<{ problems: Problem[]; paneOverflowPx: number; pageOverflowPx: number }> {
  return page.evaluate(() => {
    const pane = document.querySelector('.geometry-pane') as HTMLElement;
    const pr = pane.getBoundingClientRect();
    const cs = getComputedStyle(pane);
    const right = pr.right - Number.parseFloat(cs.paddingRight) + 1;
    const left = pr.left + Number.parseFloat(cs.paddingLeft) - 1;
    const problems: { what: string; why: string }[] = [];
    for (const el of pane.querySelectorAll<HTMLElement>('button, select, input, textarea, label.btn-like')) {
      if (el.closest('.table-wrap.tall')) continue;
      const r = el.getBoundingClientRect();
      if (r.width === 0 && r.height === 0) continue; // hidden file inputs
      const what = (el.getAttribute('aria-label') || el.textContent || el.tagName).trim().slice(0, 40);
      if (r.right > right || r.left < left)
        problems.push({ what, why: `x ${Math.round(r.left)}-${Math.round(r.right)}` });
    }
    return {
      problems,
      paneOverflowPx: pane.scrollWidth - pane.clientWidth,
      pageOverflowPx: document.documentElement.scrollWidth - document.documentElement.clientWidth,
    };
  });
}

/** Each button of the pane scrolled into view: inside the window and the top element at its centre. */
async function coveredButtons(page: Page): Promise<Problem[]> {
  const buttons = page.locator('.geometry-pane').locator('button, label.btn-like');
  const n = await buttons.count();
  const out: Problem[] = [];
  for (let i = 0; i < n; i++) {
    const b = buttons.nth(i);
    if (!(await b.isVisible())) continue;
    if (await b.evaluate((el) => !!el.closest('.table-wrap.tall'))) continue;
    await b.scrollIntoViewIfNeeded();
    const r = await b.evaluate((el) => {
      const box = el.getBoundingClientRect();
      const cx = box.left + box.width / 2;
      const cy = box.top + box.height / 2;
      const top = document.elementFromPoint(cx, cy);
      return {
        what: (el.textContent || el.tagName).trim().slice(0, 40),
        inWindow: box.left >= 0 && box.top >= 0 && box.right <= innerWidth && box.bottom <= innerHeight,
        onTop: !!top && (top === el || el.contains(top)),
      };
    });
    if (!r.inWindow) out.push({ what: r.what, why: 'outside the window' });
    else if (!r.onTop) out.push({ what: r.what, why: 'covered' });
  }
  return out;
}

for (const demo of ['downhole', 'downhole-pair', 'crosshole']) {
  test(`Geometry at 1366x768 (${demo} demo): every control inside the pane, every button reachable`, async ({
    page,
  }) => {
    await page.setViewportSize({ width: 1366, height: 768 });
    await page.goto('/');
    await page.locator(`button[data-demo="${demo}"]`).click();
    await waitProcessed(page);
    await page.getByRole('tab', { name: 'Geometry' }).click();
    await expect(page.locator('.geometry-pane')).toBeVisible();
    for (const units of ['SI', 'US']) {
      await page.getByRole('group', { name: 'Units' }).getByRole('button', { name: units, exact: true }).click();
      const r = await outsidePane(page);
      expect(r.problems, `${units}: controls outside the pane`).toEqual([]);
      expect(r.paneOverflowPx).toBeLessThanOrEqual(0);
      expect(r.pageOverflowPx).toBeLessThanOrEqual(0);
    }
    await page.getByRole('group', { name: 'Units' }).getByRole('button', { name: 'SI', exact: true }).click();
    // The borehole's deviation actions and the soil table's last column, named in the issue.
    const pane = page.locator('.geometry-pane');
    for (const b of [
      pane.getByText('Load CSV…').first(),
      pane.getByRole('button', { name: 'Paste…', exact: true }).first(),
      pane.getByRole('button', { name: 'Add borehole', exact: true }),
      pane.getByRole('button', { name: 'Add layer', exact: true }),
    ]) {
      await b.scrollIntoViewIfNeeded();
      await expect(b).toBeInViewport({ ratio: 1 });
    }
    if (demo === 'downhole') {
      const remove = pane.getByRole('button', { name: 'remove' }).last();
      await remove.scrollIntoViewIfNeeded();
      await expect(remove).toBeInViewport({ ratio: 1 });
      await pane.getByRole('button', { name: 'Paste…' }).first().click();
      await pane.locator('.paste-box').scrollIntoViewIfNeeded();
      await page.locator('.centre').screenshot({ path: `${SCREENS}/geometry-1366-${demo}-boreholes.png` });
      expect((await outsidePane(page)).problems, 'with the paste box open').toEqual([]);
      await expect(pane.getByRole('button', { name: 'Use this table' })).toBeInViewport({ ratio: 1 });
    }
    expect(await coveredButtons(page)).toEqual([]);
    // With the Site sheet open the Geometry buttons stay usable and so does Export.
    await page.getByRole('button', { name: 'Site…' }).click();
    expect(await coveredButtons(page)).toEqual([]);
    const exp = page.getByRole('button', { name: 'Export…' });
    const eb = (await exp.boundingBox())!;
    expect(
      await page.evaluate(([x, y]) => document.elementFromPoint(x, y)?.textContent?.trim(), [
        eb.x + eb.width / 2,
        eb.y + eb.height / 2,
      ] as const),
    ).toBe('Export…');
  });
}

test('the Records pane resizes with its splitter, by mouse and by keyboard', async ({ page }) => {
  await page.setViewportSize({ width: 1366, height: 768 });
  await page.goto('/');
  await page.locator('button[data-demo="downhole"]').click();
  await waitProcessed(page);
  const records = page.locator('aside.records');
  const w0 = (await records.boundingBox())!.width;
  const split = page.getByRole('separator', { name: 'Resize the Records pane' });
  const s = (await split.boundingBox())!;
  await page.mouse.move(s.x + s.width / 2, s.y + 200);
  await page.mouse.down();
  await page.mouse.move(s.x + s.width / 2 + 50, s.y + 200, { steps: 3 });
  await page.mouse.move(s.x + s.width / 2 + 100, s.y + 200, { steps: 3 });
  await page.mouse.up();
  const w1 = (await records.boundingBox())!.width;
  expect(w1).toBeGreaterThan(w0 + 90);
  expect(w1).toBeLessThan(w0 + 110);
  // Keyboard: the arrow towards the centre makes it 16 px narrower; Home goes to the narrowest (180 px).
  await split.focus();
  await page.keyboard.press('ArrowLeft');
  await expect.poll(async () => (await records.boundingBox())!.width).toBeCloseTo(w1 - 16, 0);
  await page.keyboard.press('Home');
  await expect.poll(async () => (await records.boundingBox())!.width).toBeCloseTo(180, 0);
  expect(
    await page.evaluate(() => document.documentElement.scrollWidth - document.documentElement.clientWidth),
  ).toBeLessThanOrEqual(0);
  await page.screenshot({ path: `${SCREENS}/records-splitter-1366.png` });
});
