/** Shared steps for the browser tests. */
import { expect, type Page } from '@playwright/test';
import type { Derived } from '../src/core/pipeline';
import type { Survey } from '../src/core/model';
import type { Settings, UserEdits } from '../src/core/settings';

export const SCREENS = 'test-results/screens';

export interface AppHandle {
  survey: Survey;
  settings: Settings;
  edits: UserEdits;
  past: number;
}

/** Snapshot of the store (plain JSON) through the read-only test handle. */
export async function appState(page: Page): Promise<AppHandle> {
  return page.evaluate(() => {
    const bw = (
      window as unknown as {
        __borewave: {
          useApp: { getState: () => { survey: unknown; settings: unknown; edits: unknown; past: unknown[] } };
        };
      }
    ).__borewave;
    const s = bw.useApp.getState();
    return JSON.parse(JSON.stringify({ survey: s.survey, settings: s.settings, edits: s.edits, past: s.past.length }));
  }) as Promise<AppHandle>;
}

export async function derivedState(
  page: Page,
): Promise<Pick<Derived, 'picks' | 'intervals' | 'profile'> & { vs30: number | null }> {
  return page.evaluate(() => {
    const bw = (window as unknown as { __borewave: { derived: () => Derived | null } }).__borewave;
    const d = bw.derived();
    if (!d) return { picks: [], intervals: [], profile: [], vs30: null };
    return JSON.parse(
      JSON.stringify({ picks: d.picks, intervals: d.intervals, profile: d.profile, vs30: d.site.vs30?.vsMps ?? null }),
    );
  });
}

export async function waitProcessed(page: Page, timeout = 90_000): Promise<void> {
  await expect(page.getByTestId('process-status')).toHaveAttribute('data-state', 'done', { timeout });
  // The Profile shows new results first; the Trace board and the strip take them up in a deferred
  // render and draw after it: wait until every pane shows them and the board has drawn.
  await expect
    .poll(
      () =>
        page.evaluate(() => {
          const bw = (window as unknown as { __borewave: { viewsBehind: () => number } }).__borewave;
          const board = document.querySelector('[data-plot="trace-board"]') as HTMLElement | null;
          return bw.viewsBehind() === 0 && (!board || Number(board.dataset.drawn ?? '0') > 0);
        }),
      { timeout },
    )
    .toBe(true);
}

/** Pixel position (page coordinates) of a data point on the Trace board. */
export async function boardPixel(page: Page, timeMs: number, depth: number): Promise<{ x: number; y: number }> {
  return page.evaluate(
    ([t, y]) => {
      const div = document.querySelector('[data-plot="trace-board"]') as HTMLDivElement & {
        _fullLayout: {
          xaxis: { _offset: number; l2p: (v: number) => number };
          yaxis: { _offset: number; l2p: (v: number) => number };
        };
      };
      const box = div.getBoundingClientRect();
      const fl = div._fullLayout;
      return { x: box.left + fl.xaxis._offset + fl.xaxis.l2p(t), y: box.top + fl.yaxis._offset + fl.yaxis.l2p(y) };
    },
    [timeMs, depth] as const,
  );
}

export async function drawCount(page: Page, plot: string): Promise<number> {
  return page.evaluate(
    (p) => Number((document.querySelector(`[data-plot="${p}"]`) as HTMLElement | null)?.dataset.drawn ?? '0'),
    plot,
  );
}
