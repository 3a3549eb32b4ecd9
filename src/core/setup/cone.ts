/**
 * Receiver depths from logged depths. The logged depth is what the crew writes: the receiver depth
 * (downhole), the upper receiver's depth (two receivers in a hole), the test depth (crosshole) and the
 * cone's TIP depth (seismic cone). A cone's (lower) receiver sits coneOffsetM above the tip, commonly
 * 0.2-0.3 m (common practice; the cone's specification governs), a second receiver a spacing above it.
 * Keys use the logged depth, so editing the offset moves receivers without touching any key or pick edit.
 */
import type { ReceiverSlot, SetupGeometry } from './types';

export function receiverDepthFromLogged(
  g: Omit<SetupGeometry, 'receiverHoles'>,
  slot: ReceiverSlot,
  loggedDepthM: number,
): number {
  if (g.kind === 'seismic-cone') {
    const lower = loggedDepthM - g.coneOffsetM;
    if (g.receiverCount === 2) return slot === 'r0' ? lower - g.receiverSpacingM : lower;
    return lower;
  }
  if (g.kind === 'downhole-pair') return slot === 'r1' ? loggedDepthM + g.receiverSpacingM : loggedDepthM;
  return loggedDepthM;
}

/** Depth key: the logged depth in whole millimetres (docs/project-format.md, "Keys"). */
export function loggedDepthKey(loggedDepthM: number): string {
  return String(Math.round(loggedDepthM * 1000));
}
