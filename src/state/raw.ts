/**
 * Raw waveforms and original file bytes, outside React state (keyed by record id / file name) so that
 * edits never copy sample arrays. The store keeps only metadata about them.
 */
import type { WaveRecord } from '../core';

/** Parsed records by record id. */
export const rawRecords = new Map<string, WaveRecord>();
/** Original bytes of every loaded file by file name (waveforms and deviation tables), for the archive and autosave. */
export const rawFiles = new Map<string, Uint8Array>();

export function clearRaw(): void {
  rawRecords.clear();
  rawFiles.clear();
}
