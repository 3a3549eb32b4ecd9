/**
 * Depths and hits from file names, headers and notes, with the plausibility rules of the set-up.
 *
 * Header depth rule (ours): each trace's RECEIVER_LOCATION gives a number (the last of x [y [z]], in the
 * file's UNITS). It is read as a depth only when the record's traces agree with the kind's receiver
 * layout: one receiver -> every trace the same number; two receivers in a hole -> the r1 traces a
 * spacing deeper than the r0 traces; seismic cone -> every trace the same number, the TIP depth; crosshole -> every trace the same number and, when x y are written, each trace at
 * a receiver hole's collar. Traces whose numbers differ otherwise are a seismograph spread (positions
 * 0..23, station numbers 1001..), not a depth. Zero or negative numbers, and numbers deeper than
 * settings.placement.maxHeaderDepthM, are not depths. Every value not used is reported with its rule.
 */
import type { HitDirection, WaveRecord } from '../model';
import { parseHitWord } from '../hitWords';
import type { Placed, PlacementSettings, ReceiverSlot, RejectedValue, SetupGeometry } from './types';

export const FT_TO_M = 0.3048;
/** The app's starting file-name pattern: `..._d12.5_L.sg2` (our own convention; the user edits it). */
export const DEFAULT_NAME_PATTERN = '*d{depth}_{hit}.*';
/** Two positions within this distance are the same, m (1 mm: depth keys are whole millimetres). */
const SAME_M = 0.0015;
/** A trace is at a hole's collar when its x y lie within this distance, m (common practice: a hole is a few cm wide; positions are written to cm). */
const COLLAR_TOLERANCE_M = 0.25;

// ------------------------------------------------------------------ file-name pattern

export interface CompiledPattern {
  regex: RegExp;
  depthGroup: number | null;
  depthInFeet: boolean;
  hitGroup: number | null;
}

/** `{depth}` metres (decimal point, comma or 'p'), `{depth_ft}` feet, `{hit}` L R U D / words, `*` anything; case ignored. */
export function compileNamePattern(pattern: string): CompiledPattern {
  let re = '^';
  let group = 0;
  let depthGroup: number | null = null;
  let hitGroup: number | null = null;
  let depthInFeet = false;
  for (let i = 0; i < pattern.length; ) {
    if (pattern.startsWith('{depth_ft}', i) || pattern.startsWith('{depth}', i)) {
      depthInFeet = pattern.startsWith('{depth_ft}', i);
      re += '(\\d+(?:[.,p]\\d+)?)';
      depthGroup = ++group;
      i += depthInFeet ? 10 : 7;
    } else if (pattern.startsWith('{hit}', i)) {
      re += '(left|right|up|down|l|r|u|d)';
      hitGroup = ++group;
      i += 5;
    } else if (pattern[i] === '*') {
      re += '.*?';
      i++;
    } else {
      re += pattern[i].replace(/[.+?^${}()|[\]\\]/g, '\\$&');
      i++;
    }
  }
  return { regex: new RegExp(`${re}$`, 'i'), depthGroup, depthInFeet, hitGroup };
}

/** Depth and hit from the file name (only the last path part); null where the pattern says nothing or does not match. */
export function placeFromFileName(
  file: string,
  pattern: string,
): { depthM: Placed<number> | null; hit: Placed<HitDirection> | null } {
  const none = { depthM: null, hit: null };
  if (!pattern.trim()) return none;
  const c = compileNamePattern(pattern);
  const base = file.replace(/\\/g, '/').split('/').pop() ?? file;
  const m = c.regex.exec(base);
  if (!m) return none;
  let depthM: Placed<number> | null = null;
  if (c.depthGroup) {
    const v = Number(m[c.depthGroup].replace(/[,p]/i, '.'));
    if (Number.isFinite(v)) depthM = { value: v * (c.depthInFeet ? FT_TO_M : 1), source: 'filename' };
  }
  const hitWord = c.hitGroup ? parseHitWord(m[c.hitGroup]) : null;
  return { depthM, hit: hitWord ? { value: hitWord, source: 'filename' } : null };
}

/** Hit spelled out as a whole word in a file name ("..._left.sg2"); single letters need a pattern. */
export function hitWordInFileName(file: string): Placed<HitDirection> | null {
  const base = (file.replace(/\\/g, '/').split('/').pop() ?? file).replace(/\.[^.]*$/, '');
  const found = new Set<HitDirection>();
  for (const w of base.toLowerCase().split(/[^a-z]+/)) {
    if (w === 'left' || w === 'right' || w === 'up' || w === 'down') found.add(w);
  }
  return found.size === 1 ? { value: [...found][0], source: 'filename' } : null;
}

// ------------------------------------------------------------------ headers

/** Hit from NOTE lines and trace/file strings: "HIT left", "hit=R", "blow: up", "direction down". */
export function hitFromHeaders(rec: WaveRecord): Placed<HitDirection> | null {
  // Every value of a repeated keyword is searched (two NOTE strings: an operator note and "hit left").
  const texts = [
    ...rec.notes,
    ...(rec.fileStringLists?.SOURCE ?? [rec.fileStrings.SOURCE ?? '']),
    ...rec.traces.flatMap((t) => [...Object.values(t.strings), ...Object.values(t.stringLists ?? {}).flat()]),
  ];
  for (const s of texts) {
    const m = /\b(?:hit|blow|direction|strike)\s*[:=]?\s*(left|right|up|down|l|r|u|d)\b/i.exec(s);
    if (m) return { value: parseHitWord(m[1])!, source: 'header' };
    const m2 = /\b(left|right|up|down)\s+(?:hit|blow|end struck|strike)\b/i.exec(s);
    if (m2) return { value: parseHitWord(m2[1])!, source: 'header' };
  }
  return null;
}

function unitScale(rec: WaveRecord): number | null {
  const u = (rec.fileStrings.UNITS ?? '').trim().toUpperCase();
  if (u === '' || u.startsWith('METER') || u.startsWith('METRE') || u === 'M') return 1;
  if (u.startsWith('FEET') || u.startsWith('FOOT') || u === 'FT') return FT_TO_M;
  return null;
}

function numbersOf(s: string | undefined): number[] {
  if (!s) return [];
  return s
    .trim()
    .split(/[\s,;]+/)
    .filter((x) => x.length > 0)
    .map(Number)
    .filter(Number.isFinite);
}

export interface HeaderDepthResult {
  depthM: Placed<number> | null;
  rejected: RejectedValue[];
}

function fmt(x: number): string {
  return String(Math.round(x * 1e4) / 1e4);
}

/**
 * Depth from RECEIVER_LOCATION under the layout rule above. `slots` is each trace's receiver slot
 * (same order as rec.traces), from the channel placement.
 */
export function depthFromReceiverLocation(
  rec: WaveRecord,
  slots: readonly ReceiverSlot[],
  g: SetupGeometry,
  s: PlacementSettings,
): HeaderDepthResult {
  const rejected: RejectedValue[] = [];
  const located = rec.traces
    .map((t, i) => ({
      channel: t.channel,
      slot: slots[i] ?? 'r0',
      loc: t.receiverLocation?.length ? t.receiverLocation : numbersOf(t.strings.RECEIVER_LOCATION),
    }))
    .filter((x) => x.loc.length > 0);
  if (located.length === 0) return { depthM: null, rejected };
  const scale = unitScale(rec);
  const raw = located.map((x) => x.loc[x.loc.length - 1]);
  const valueText = [...new Set(raw.map(fmt))].join(', ');
  const reject = (rule: RejectedValue['rule'], message: string): HeaderDepthResult => {
    rejected.push({ file: rec.fileName, field: 'RECEIVER_LOCATION', value: valueText, rule, message });
    return { depthM: null, rejected };
  };
  if (scale === null)
    return reject(
      'unit-unknown',
      `UNITS "${rec.fileStrings.UNITS}" is not metres or feet, so the location is not read as a depth`,
    );
  const depth = located.map((x) => x.loc[x.loc.length - 1] * scale);
  const bySlot = (slot: ReceiverSlot) => depth.filter((_, i) => located[i].slot === slot);
  const allSame = (xs: number[]) => xs.every((x) => Math.abs(x - xs[0]) <= SAME_M);
  let logged: number;
  // The cone's headers give the tip depth on every trace (one number per record, whatever the receivers).
  const twoReceivers = g.kind === 'downhole-pair' || (g.kind === 'downhole' && g.receiverCount === 2);
  if (twoReceivers) {
    const a = bySlot('r0');
    const b = bySlot('r1');
    if (!allSame(a) || !allSame(b)) {
      return reject(
        'traces-differ-spread',
        `the traces give ${valueText}: positions along a spread, not one depth per receiver`,
      );
    }
    if (a.length === 0 || b.length === 0 || Math.abs(b[0] - a[0] - g.receiverSpacingM) > SAME_M) {
      return reject(
        'pair-layout',
        `the two receivers' locations (${valueText}) are not ${fmt(g.receiverSpacingM)} m apart with the lower one deeper, as the receiver layout says`,
      );
    }
    logged = a[0]; // two receivers: the record's depth is the upper receiver's
  } else {
    if (!allSame(depth)) {
      return reject('traces-differ-spread', `the traces give ${valueText}: positions along a spread, not one depth`);
    }
    if (g.kind === 'crosshole') {
      for (let i = 0; i < located.length; i++) {
        const loc = located[i].loc;
        if (loc.length < 3) continue;
        const hole = g.receiverHoles[located[i].slot === 'r1' ? 1 : 0];
        if (!hole) continue;
        const d = Math.hypot(loc[0] * scale - hole.collarEastM, loc[1] * scale - hole.collarNorthM);
        if (d > COLLAR_TOLERANCE_M) {
          return reject(
            'not-at-collar',
            `channel ${located[i].channel} is located at ${fmt(loc[0])} ${fmt(loc[1])}, ${fmt(d)} m from the collar of hole ${hole.holeId}`,
          );
        }
      }
    }
    logged = depth[0];
  }
  if (!(logged > 0)) return reject('not-positive', `${fmt(logged)} m is not below the ground surface`);
  if (logged > s.maxHeaderDepthM) {
    return reject(
      'deeper-than-limit',
      `${fmt(logged)} m is deeper than the ${fmt(s.maxHeaderDepthM)} m limit for a header depth (settings.placement.maxHeaderDepthM)`,
    );
  }
  return { depthM: { value: Math.round(logged * 1e6) / 1e6, source: 'header' }, rejected };
}

/** Depth from a NOTE line such as "DEPTH 12.50 M", "depth=40 ft", "tip depth: 3.5" (metres when no unit). */
export function depthFromNotes(rec: WaveRecord, s: PlacementSettings): HeaderDepthResult {
  const rejected: RejectedValue[] = [];
  for (const line of rec.notes) {
    const m = /\b(?:tip\s+)?depth\s*[:=]?\s*(-?\d+(?:\.\d+)?)\s*(m|ft|feet|meters?|metres?)?\b/i.exec(line);
    if (!m) continue;
    const unit = (m[2] ?? 'm').toLowerCase();
    const v = Number(m[1]) * (unit.startsWith('f') ? FT_TO_M : 1);
    const base = { file: rec.fileName, field: 'NOTE', value: line.trim() };
    if (!(v > 0)) {
      rejected.push({ ...base, rule: 'not-positive', message: `${fmt(v)} m is not below the ground surface` });
      return { depthM: null, rejected };
    }
    if (v > s.maxHeaderDepthM) {
      rejected.push({
        ...base,
        rule: 'deeper-than-limit',
        message: `${fmt(v)} m is deeper than the ${fmt(s.maxHeaderDepthM)} m limit for a header depth`,
      });
      return { depthM: null, rejected };
    }
    return { depthM: { value: v, source: 'header' }, rejected };
  }
  return { depthM: null, rejected };
}
