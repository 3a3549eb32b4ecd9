/**
 * Layer boundaries edited on the Travel time plot: list operations (add, move, remove, back to the
 * automatic ones) and what the plot marks. Expected lists worked by hand; boundaries kept to the
 * centimetre (common practice for logged depths), inside (top, bottom).
 */
import { describe, expect, it } from 'vitest';
import {
  addBoundary,
  boundaryMarks,
  clampBoundaryM,
  editableList,
  moveBoundary,
  newBoundaryDepthM,
  plotNoteText,
  removeBoundary,
  tidyBoundaries,
} from '../../src/ui/boundaries';

describe('boundary list', () => {
  it('is sorted, rounded to 1 cm and without repeats', () => {
    expect(tidyBoundaries([7.012, 1.5, 7.01, 13.4749])).toEqual([1.5, 7.01, 13.47]);
  });

  it('an edit in automatic mode starts from the automatic boundaries, rounded', () => {
    expect(editableList('auto', [4, 9], [1.5034, 7.0071])).toEqual([1.5, 7.01]);
    expect(editableList('user', [9, 4], [1.5034, 7.0071])).toEqual([4, 9]);
  });

  it('add: 10 m between 7.01 and 13.47 gives four boundaries in order', () => {
    expect(addBoundary([1.5, 7.01, 13.47], 10)).toEqual([1.5, 7.01, 10, 13.47]);
  });

  it('move: the 7.01 m boundary dragged to 15 m passes 13.47 m and the list is sorted again', () => {
    expect(moveBoundary([1.5, 7.01, 13.47], 1, 15)).toEqual([1.5, 13.47, 15]);
  });

  it('move onto another boundary merges the two', () => {
    expect(moveBoundary([1.5, 7.01, 13.47], 0, 7.01)).toEqual([7.01, 13.47]);
  });

  it('remove: the second of three', () => {
    expect(removeBoundary([1.5, 7.01, 13.47], 1)).toEqual([1.5, 13.47]);
    // an index outside the list changes nothing
    expect(moveBoundary([1.5], 4, 3)).toEqual([1.5]);
  });

  it('a boundary added from the keyboard splits the thickest layer in the middle', () => {
    // layers 0-1.5, 1.5-7, 7-30: the last (23 m) is thickest, its middle 18.5 m
    expect(newBoundaryDepthM([1.5, 7], 0, 30)).toBeCloseTo(18.5, 9);
    // layers 0-20, 20-30: the first; its middle 10 m
    expect(newBoundaryDepthM([20], 0, 30)).toBeCloseTo(10, 9);
    expect(newBoundaryDepthM([], 0, 30)).toBe(15);
    expect(newBoundaryDepthM([], 5, 5)).toBeNull();
  });

  it('a dragged boundary stays strictly inside the receivers (1 cm from the ends)', () => {
    expect(clampBoundaryM(-3, 0, 30)).toBeCloseTo(0.01, 12);
    expect(clampBoundaryM(31, 0, 30)).toBeCloseTo(29.99, 12);
    expect(clampBoundaryM(12.3, 0, 30)).toBe(12.3);
  });
});

describe('boundary marks on the plot', () => {
  it('automatic mode: the fit boundaries, all marked automatic and used', () => {
    expect(boundaryMarks('auto', [4], [1.5, 7.01])).toEqual([
      { depthM: 1.5, origin: 'auto', used: true },
      { depthM: 7.01, origin: 'auto', used: true },
    ]);
  });

  it("user mode: the user's list; one the fit left out (outside the receivers) is marked unused", () => {
    expect(boundaryMarks('user', [40, 5], [5])).toEqual([
      { depthM: 5, origin: 'user', used: true },
      { depthM: 40, origin: 'user', used: false },
    ]);
  });
});

describe('plot note text', () => {
  it('breaks between words at the width and escapes HTML', () => {
    expect(plotNoteText('No layered model: only 2 S travel times (3 < needed)', 20)).toBe(
      'No layered model:<br>only 2 S travel<br>times (3 &lt; needed)',
    );
  });
});
