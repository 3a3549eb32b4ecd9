/**
 * Layer boundaries edited on the Travel time plot: the list operations behind add, move, remove and
 * "back to automatic" (pure, tested in test/ui/boundaries.test.ts). They only edit the settings'
 * boundary list (settings.layering); the layered fit itself is the core's (derive()).
 */

/** One boundary as drawn: where, who set it, and whether the fit used it. */
export interface BoundaryMark {
  depthM: number;
  /** 'auto': chosen from the travel times; 'user': set by the user. */
  origin: 'auto' | 'user';
  /** False when the fit left it out (outside the receivers, or no receiver between it and the one above). */
  used: boolean;
}

/** Boundaries are kept to the centimetre (m). */
export const BOUNDARY_STEP_M = 0.01;

const SAME_M = 1e-6;

export function roundBoundaryM(depthM: number): number {
  return Math.round(depthM / BOUNDARY_STEP_M) * BOUNDARY_STEP_M;
}

/** Sorted, rounded to the centimetre, without repeats. */
export function tidyBoundaries(list: readonly number[]): number[] {
  const out: number[] = [];
  for (const z of [...list].map(roundBoundaryM).sort((a, b) => a - b))
    if (!out.length || Math.abs(out[out.length - 1] - z) > SAME_M) out.push(Number(z.toFixed(2)));
  return out;
}

/**
 * What the plot draws: in automatic mode the fit's boundaries; in user mode the user's list, each
 * marked whether the fit used it.
 */
export function boundaryMarks(
  mode: 'auto' | 'user',
  userM: readonly number[],
  fitBoundariesM: readonly number[],
): BoundaryMark[] {
  if (mode === 'auto') return fitBoundariesM.map((depthM) => ({ depthM, origin: 'auto', used: true }));
  return tidyBoundaries(userM).map((depthM) => ({
    depthM,
    origin: 'user',
    used: fitBoundariesM.some((z) => Math.abs(z - depthM) < 1e-4),
  }));
}

/** The list an edit starts from: the automatic boundaries (rounded) in automatic mode, else the user's. */
export function editableList(mode: 'auto' | 'user', userM: readonly number[], fitBoundariesM: readonly number[]) {
  return tidyBoundaries(mode === 'auto' ? fitBoundariesM : userM);
}

export function addBoundary(list: readonly number[], depthM: number): number[] {
  return tidyBoundaries([...list, depthM]);
}

/** Boundary i (of the tidy list) moved to depthM; the list is sorted again (a boundary may pass another). */
export function moveBoundary(list: readonly number[], i: number, depthM: number): number[] {
  const t = tidyBoundaries(list);
  if (i < 0 || i >= t.length) return t;
  return tidyBoundaries(t.map((z, j) => (j === i ? depthM : z)));
}

export function removeBoundary(list: readonly number[], i: number): number[] {
  const t = tidyBoundaries(list);
  return t.filter((_, j) => j !== i);
}

/**
 * Where a boundary added without a pointer goes (the keyboard's "Add boundary"): the middle of the
 * thickest layer between the top and the deepest receiver, so it splits the layer with most room.
 * Null when there is no room (top at or below bottom).
 */
export function newBoundaryDepthM(list: readonly number[], topM: number, bottomM: number): number | null {
  if (!(bottomM - topM > 2 * BOUNDARY_STEP_M)) return null;
  const edges = [topM, ...tidyBoundaries(list).filter((z) => z > topM && z < bottomM), bottomM];
  let best = 0;
  for (let k = 1; k + 1 < edges.length; k++) if (edges[k + 1] - edges[k] > edges[best + 1] - edges[best]) best = k;
  return roundBoundaryM(0.5 * (edges[best] + edges[best + 1]));
}

/** Keeps a dragged or nudged boundary strictly inside (top, bottom), m. */
export function clampBoundaryM(depthM: number, topM: number, bottomM: number): number {
  return Math.min(bottomM - BOUNDARY_STEP_M, Math.max(topM + BOUNDARY_STEP_M, depthM));
}

/**
 * Text for a Plotly annotation: HTML special characters escaped and lines broken between words at
 * about `width` characters (annotations do not wrap by themselves).
 */
export function plotNoteText(text: string, width: number): string {
  const lines: string[] = [];
  let line = '';
  for (const w of text.split(/\s+/).filter(Boolean)) {
    if (line && line.length + 1 + w.length > width) {
      lines.push(line);
      line = w;
    } else line = line ? `${line} ${w}` : w;
  }
  if (line) lines.push(line);
  return lines.map((l) => l.replace(/&/g, '&amp;').replace(/</g, '&lt;').replace(/>/g, '&gt;')).join('<br>');
}
