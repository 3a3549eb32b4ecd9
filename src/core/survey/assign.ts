/**
 * Placing records in the survey: depth, hit direction and what each channel carries. In order of
 * preference: SEG-2 header keywords, then a file-name pattern the user can edit, else left for the user
 * (depth null) and reported.
 *
 * Header rule (ours, stated in the Geometry pane): the depth is the last number of the first trace's
 * RECEIVER_LOCATION (x y z -> z; a single number -> that number), read as depth below ground in the
 * file's UNITS (FEET converted at 0.3048 m/ft); the hit direction from a NOTE line or a trace string such
 * as "hit left" / "HIT=R".
 *
 * File-name pattern: `{depth}` a number in metres (decimal point, comma or 'p'), `{depth_ft}` in feet,
 * `{hit}` one of L R U D / left right up down, `*` anything; other characters literal; case ignored.
 */
import type { HitDirection, RecordAssignment, Survey, ValueSource, WaveRecord } from '../model';
import { defaultChannels } from '../catalogue/testKinds';

export const DEFAULT_NAME_PATTERN = '*d{depth}_{hit}.*';
const FT_TO_M = 0.3048;

const HIT_WORDS: Record<string, HitDirection> = {
  l: 'left',
  left: 'left',
  r: 'right',
  right: 'right',
  u: 'up',
  up: 'up',
  d: 'down',
  down: 'down',
};

export interface CompiledPattern {
  regex: RegExp;
  depthGroup: number | null;
  depthInFeet: boolean;
  hitGroup: number | null;
}

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
  return { regex: new RegExp(re + '$', 'i'), depthGroup, depthInFeet, hitGroup };
}

export function placeFromName(
  fileName: string,
  pattern: CompiledPattern,
): { depthM: number | null; hit: HitDirection | null } {
  const m = pattern.regex.exec(fileName);
  if (!m) return { depthM: null, hit: null };
  let depthM: number | null = null;
  if (pattern.depthGroup) {
    const v = Number(m[pattern.depthGroup].replace(/[,p]/i, '.'));
    depthM = Number.isFinite(v) ? v * (pattern.depthInFeet ? FT_TO_M : 1) : null;
  }
  const hit = pattern.hitGroup ? (HIT_WORDS[m[pattern.hitGroup].toLowerCase()] ?? null) : null;
  return { depthM, hit };
}

function numbers(s: string | undefined): number[] {
  if (!s) return [];
  return s
    .trim()
    .split(/[\s,;]+/)
    .map(Number)
    .filter(Number.isFinite);
}

export function placeFromHeaders(rec: WaveRecord): { depthM: number | null; hit: HitDirection | null } {
  const t = rec.traces[0];
  const loc = t?.receiverLocation?.length ? t.receiverLocation : numbers(t?.strings.RECEIVER_LOCATION);
  const units = (rec.fileStrings.UNITS ?? '').trim().toUpperCase();
  const scale = units.startsWith('FEET') || units === 'FT' ? FT_TO_M : 1;
  const depthM = loc.length ? loc[loc.length - 1] * scale : null;
  // Every value of a repeated keyword is searched (two NOTE strings: an operator note and "hit left").
  const texts = [
    ...rec.notes,
    ...Object.values(t?.strings ?? {}),
    ...Object.values(t?.stringLists ?? {}).flat(),
    ...(rec.fileStringLists?.SOURCE ?? []),
    rec.fileStrings.SOURCE ?? '',
  ];
  let hit: HitDirection | null = null;
  for (const s of texts) {
    const m = /\b(?:hit|blow|direction)\s*[:=]?\s*(left|right|up|down|l|r|u|d)\b/i.exec(s);
    if (m) {
      hit = HIT_WORDS[m[1].toLowerCase()];
      break;
    }
  }
  return { depthM: depthM !== null && Number.isFinite(depthM) && depthM >= 0 ? depthM : null, hit };
}

export function assignRecords(
  records: readonly WaveRecord[],
  survey: Pick<Survey, 'kind' | 'receiverCount'>,
  pattern: string,
): RecordAssignment[] {
  const compiled = compileNamePattern(pattern);
  return records.map((rec) => {
    const fromHeader = placeFromHeaders(rec);
    const fromName = placeFromName(rec.fileName, compiled);
    const depthM = fromHeader.depthM ?? fromName.depthM;
    const hit = fromHeader.hit ?? fromName.hit ?? 'none';
    const depthSource: ValueSource =
      fromHeader.depthM !== null ? 'header' : fromName.depthM !== null ? 'filename' : 'default';
    const hitSource: ValueSource = fromHeader.hit ? 'header' : fromName.hit ? 'filename' : 'default';
    return {
      recordId: rec.id,
      depthM,
      hit,
      channels: defaultChannels(
        survey,
        rec.traces.map((t) => t.channel),
      ),
      excluded: false,
      depthSource,
      hitSource,
    };
  });
}
