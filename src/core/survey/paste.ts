/**
 * Spreadsheet paste into the records table: tab-separated rows of record name (or row order when no
 * name matches), depth in the display unit, hit, then optional component / receiver pairs per channel.
 * Pure: returns the new assignments, how many rows changed and the problems in plain words.
 */
import type { Component, RecordAssignment } from '../model';
import { fromDisplay, type UnitSystem } from '../units';
import { isReceiverSlot, type ReceiverSlot } from '../keys';
import { parseHitWord } from '../hitWords';

const COMPONENTS: readonly Component[] = ['H1', 'H2', 'V'];

/** A number typed in the display unit, in metres; null when it is not a number (comma decimals accepted). */
export function parseDepthText(text: string, units: UnitSystem): number | null {
  const t = text.trim().replace(',', '.');
  if (t === '') return null;
  const v = Number(t);
  return Number.isFinite(v) ? fromDisplay('depth', units, v) : null;
}

export interface PasteResult {
  records: RecordAssignment[];
  changed: number;
  problems: string[];
}

/**
 * Applies pasted rows. `receiverOf` turns a typed receiver (a slot "r1" or its label "lower", "far
 * hole") into a slot; a receiver it does not know is reported. Pasted values count as the user's.
 */
export function applyPaste(
  text: string,
  records: readonly RecordAssignment[],
  units: UnitSystem,
  receiverOf: (typed: string) => ReceiverSlot | null = (t) => (isReceiverSlot(t) ? t : null),
): PasteResult {
  const rows = text
    .replace(/\r/g, '')
    .split('\n')
    .filter((l) => l.trim() !== '')
    .map((l) => l.split('\t'));
  const out = records.map((r) => ({ ...r, channels: r.channels.map((c) => ({ ...c })) }));
  const problems: string[] = [];
  const byName = new Map(out.map((r, i) => [r.recordId.toLowerCase(), i]));
  const named = rows.some((r) => byName.has((r[0] ?? '').trim().toLowerCase()));
  let changed = 0;
  rows.forEach((cells, n) => {
    let idx: number | undefined;
    let c = cells;
    if (named) {
      idx = byName.get((cells[0] ?? '').trim().toLowerCase());
      c = cells.slice(1);
      if (idx === undefined) {
        if (n > 0 || !/depth|record|file/i.test(cells.join(' ')))
          problems.push(`Row ${n + 1}: no record named "${cells[0]}".`);
        return;
      }
    } else {
      idx = n;
      if (idx >= out.length) {
        problems.push(`Row ${n + 1}: more rows than records.`);
        return;
      }
    }
    const r = out[idx];
    if ((c[0] ?? '').trim() !== '') {
      const depth = parseDepthText(c[0] ?? '', units);
      if (depth === null || depth < 0) problems.push(`Row ${n + 1}: depth "${c[0]}" is not a number.`);
      else {
        r.depthM = depth;
        r.depthSource = 'user';
      }
    }
    if (c[1] !== undefined && c[1].trim() !== '') {
      const h = parseHitWord(c[1]);
      if (h) {
        r.hit = h;
        r.hitSource = 'user';
      } else problems.push(`Row ${n + 1}: hit "${c[1]}" is not left, right, up, down or none.`);
    }
    for (let k = 0; 2 + 2 * k < c.length && k < r.channels.length; k++) {
      const comp = c[2 + 2 * k]?.trim().toUpperCase();
      const rx = c[3 + 2 * k]?.trim();
      if (comp && (COMPONENTS as readonly string[]).includes(comp)) {
        r.channels[k].component = comp as Component;
        r.channels[k].source = 'user';
      } else if (comp) problems.push(`Row ${n + 1}: component "${comp}" is not H1, H2 or V.`);
      if (rx) {
        const slot = receiverOf(rx);
        if (slot) {
          r.channels[k].receiver = slot;
          r.channels[k].source = 'user';
        } else problems.push(`Row ${n + 1}: receiver "${rx}" is not one of this survey's receivers.`);
      }
    }
    changed++;
  });
  return { records: out, changed, problems };
}
