/**
 * The one table of hit words read from file names, headers, pasted rows and record logs (common
 * practice: field notes write the struck end as left/right or up/down, often by its first letter).
 */
import { describe, expect, it } from 'vitest';
import { parseHitWord } from '../../src/core/hitWords';

describe('parseHitWord', () => {
  it('reads words and first letters in any case, trimmed', () => {
    expect(parseHitWord(' Left ')).toBe('left');
    expect(parseHitWord('R')).toBe('right');
    expect(parseHitWord('up')).toBe('up');
    expect(parseHitWord('D')).toBe('down');
    expect(parseHitWord('none')).toBe('none');
  });
  it('returns null for anything else (never a guessed hit)', () => {
    expect(parseHitWord('')).toBeNull();
    expect(parseHitWord('west')).toBeNull();
    expect(parseHitWord('n')).toBeNull();
  });
});
