/**
 * Work that can wait (the Vs30 spread, autosave, plots off the critical path) runs when the page is
 * idle: requestIdleCallback where the browser has it (with a deadline, so it never waits for ever),
 * else a timer. Returns a cancel function.
 */
export function whenIdle(run: () => void, timeoutMs = 1000): () => void {
  const g = globalThis as unknown as {
    requestIdleCallback?: (f: () => void, o: { timeout: number }) => number;
    cancelIdleCallback?: (id: number) => void;
  };
  if (g.requestIdleCallback && g.cancelIdleCallback) {
    const id = g.requestIdleCallback(run, { timeout: timeoutMs });
    return () => g.cancelIdleCallback!(id);
  }
  const t = setTimeout(run, 0);
  return () => clearTimeout(t);
}

/** After `delayMs`, then once the page is idle. Returns a cancel function. */
export function afterDelayWhenIdle(run: () => void, delayMs: number, timeoutMs = 1000): () => void {
  let cancelIdle: (() => void) | null = null;
  const t = setTimeout(() => {
    cancelIdle = whenIdle(run, timeoutMs);
  }, delayMs);
  return () => {
    clearTimeout(t);
    cancelIdle?.();
  };
}
