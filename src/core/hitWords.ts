/**
 * Hit directions written as words in file names, headers, pasted rows and record logs: left right up
 * down (or their first letters) and none. One table for every reader.
 */
import type { HitDirection } from './model';

const HIT_WORDS: Readonly<Record<string, HitDirection>> = {
  l: 'left',
  left: 'left',
  r: 'right',
  right: 'right',
  u: 'up',
  up: 'up',
  d: 'down',
  down: 'down',
  none: 'none',
};

/** A hit word (left right up down L R U D none, any case, spaces trimmed), or null. */
export function parseHitWord(text: string): HitDirection | null {
  return HIT_WORDS[text.trim().toLowerCase()] ?? null;
}
