/**
 * The buffers of every typed array inside a message, for postMessage's transfer list: a result the
 * sender does not keep moves to the receiver instead of being copied (the sender's views become empty).
 * Ownership (see DEVELOPERS.md): the page owns raw records and file bytes (Trace board, Pair check,
 * set-up inference and autosave read them); workers own nothing between jobs, so what they send back
 * is transferred, and what the page sends them is copied.
 */
export function buffersOf(value: unknown): ArrayBuffer[] {
  const found = new Set<ArrayBuffer>();
  const seen = new Set<object>();
  const walk = (v: unknown): void => {
    if (v === null || typeof v !== 'object') return;
    if (ArrayBuffer.isView(v)) {
      if (v.buffer instanceof ArrayBuffer && v.buffer.byteLength > 0) found.add(v.buffer);
      return;
    }
    if (v instanceof ArrayBuffer) {
      found.add(v);
      return;
    }
    if (seen.has(v)) return;
    seen.add(v);
    if (v instanceof Map) {
      for (const [k, x] of v) {
        walk(k);
        walk(x);
      }
    } else if (Array.isArray(v)) {
      for (const x of v) walk(x);
    } else {
      for (const k in v) walk((v as Record<string, unknown>)[k]);
    }
  };
  walk(value);
  return [...found];
}
