/**
 * Components and receiver slots from what the files say: SEG-2 trace strings (component words in
 * RECEIVER, NOTE, CHANNEL_TYPE and the like; REGISTRATION_DIRECTION X/Y/Z) and text column names.
 *
 * Word rule (ours, case-insensitive, whole words only):
 *   V  <- V, Z, VERT, VERTICAL
 *   H1 <- H1, HX, X, N, NORTH, RADIAL, RAD, INLINE, LONGITUDINAL
 *   H2 <- H2, HY, Y, E, EAST, TRANSVERSE, TRANS, CROSSLINE
 * H1 is the first horizontal (along the beam downhole, radial crosshole), H2 the second.
 * A string holding words of two different components says nothing (e.g. "3C V/H1/H2 geophone").
 */
import type { Component, Trace } from '../model';
import type { ReceiverSlot, SetupGeometry } from './types';

const COMPONENT_WORDS: Record<string, Component> = {
  v: 'V',
  z: 'V',
  vert: 'V',
  vertical: 'V',
  h1: 'H1',
  hx: 'H1',
  x: 'H1',
  n: 'H1',
  north: 'H1',
  radial: 'H1',
  rad: 'H1',
  inline: 'H1',
  longitudinal: 'H1',
  h2: 'H2',
  hy: 'H2',
  y: 'H2',
  e: 'H2',
  east: 'H2',
  transverse: 'H2',
  trans: 'H2',
  crossline: 'H2',
};

/** Trace keywords whose text may name the component (first that says wins). */
export const COMPONENT_KEYWORDS = ['COMPONENT', 'CHANNEL_TYPE', 'RECEIVER', 'RECEIVER_SPECS', 'NOTE', 'COLUMN_NAME'];

function words(text: string): string[] {
  return text
    .toLowerCase()
    .split(/[^a-z0-9]+/)
    .filter((w) => w.length > 0);
}

/** The one component a text names, or null when it names none or several. Removes `ignore` names first (hole names). */
export function componentFromText(text: string, ignore: readonly string[] = []): Component | null {
  let t = ` ${text} `;
  for (const name of ignore) {
    if (!name) continue;
    t = t.split(name).join(' ');
    t = t.replace(new RegExp(name.replace(/[.*+?^${}()|[\]\\]/g, '\\$&'), 'gi'), ' ');
  }
  const found = new Set<Component>();
  for (const w of words(t)) {
    const c = COMPONENT_WORDS[w];
    if (c) found.add(c);
  }
  return found.size === 1 ? [...found][0] : null;
}

/** SEG-2 REGISTRATION_DIRECTION: X, Y or Z (motion sensed along that axis). */
export function componentFromRegistration(value: string | undefined): Component | null {
  const v = (value ?? '').trim().toUpperCase();
  if (v === 'Z') return 'V';
  if (v === 'X') return 'H1';
  if (v === 'Y') return 'H2';
  return null;
}

export interface TraceComponent {
  component: Component;
  /** Keyword (or column name) that said it. */
  field: string;
}

/** Component of one trace from its strings, or null. */
export function traceComponent(trace: Trace, holeNames: readonly string[] = []): TraceComponent | null {
  const reg = componentFromRegistration(trace.strings.REGISTRATION_DIRECTION);
  if (reg) return { component: reg, field: 'REGISTRATION_DIRECTION' };
  for (const key of COMPONENT_KEYWORDS) {
    const s = trace.strings[key];
    if (!s) continue;
    const c = componentFromText(s, holeNames);
    if (c) return { component: c, field: key };
  }
  return null;
}

const UPPER_WORDS = new Set(['upper', 'top', 'shallow', 'up1', 'ru']);
const LOWER_WORDS = new Set(['lower', 'bottom', 'deep', 'bot', 'rl']);

/**
 * Receiver slot of a trace from its strings: a crosshole receiver hole's user name in RECEIVER (whole
 * string or whole word, case-insensitive), or upper/lower words for two receivers. null = not said.
 */
export function traceSlotFromText(trace: Trace, g: SetupGeometry): ReceiverSlot | null {
  const texts = ['RECEIVER', 'NOTE', 'RECEIVER_SPECS'].map((k) => trace.strings[k]).filter(Boolean) as string[];
  if (g.kind === 'crosshole') {
    for (const text of texts) {
      const low = text.toLowerCase();
      // Longest names first, so "R10" is not taken for "R1".
      const holes = g.receiverHoles
        .map((h, i) => ({ name: h.holeId.toLowerCase(), i }))
        .filter((h) => h.name.length > 0)
        .sort((a, b) => b.name.length - a.name.length);
      for (const h of holes) {
        const at = low.indexOf(h.name);
        if (at < 0) continue;
        const before = at === 0 ? ' ' : low[at - 1];
        const after = at + h.name.length >= low.length ? ' ' : low[at + h.name.length];
        if (/[^a-z0-9]/.test(before) && /[^a-z0-9]/.test(after)) return h.i === 0 ? 'r0' : 'r1';
      }
    }
    return null;
  }
  if (g.receiverCount !== 2) return null;
  for (const text of texts) {
    const ws = words(text);
    if (ws.some((w) => UPPER_WORDS.has(w))) return 'r0';
    if (ws.some((w) => LOWER_WORDS.has(w))) return 'r1';
  }
  return null;
}

/**
 * Default channel meaning of a kind (shown as `default`): one receiver H1 H2 V; two receivers the first
 * half r0 then r1, H1 H2 V each; crosshole first half near (r0), second half far (r1), V then H1.
 */
export function defaultChannel(
  kind: SetupGeometry['kind'],
  receiverCount: 1 | 2,
  index: number,
  traceCount: number,
): { receiver: ReceiverSlot; component: Component } {
  if (kind === 'crosshole') {
    const per = Math.max(1, Math.ceil(traceCount / 2));
    return { receiver: index < per ? 'r0' : 'r1', component: index % per === 0 ? 'V' : 'H1' };
  }
  const comps: Component[] = ['H1', 'H2', 'V'];
  if (receiverCount === 2) {
    const per = Math.max(1, Math.ceil(traceCount / 2));
    return { receiver: index < per ? 'r0' : 'r1', component: comps[(index % per) % 3] };
  }
  return { receiver: 'r0', component: comps[index % 3] };
}
