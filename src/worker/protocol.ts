/**
 * Messages between the page and the core worker. Everything is structured-clone friendly; errors travel
 * as ErrorInfo. Typed arrays the page sends are copies (the page keeps its records and bytes); results
 * the worker sends back are transferred (worker/transfer.ts). 'make-demo' answers with 'archive'.
 */
import type { ErrorInfo } from '../core';
import type { TestKind, Survey, WaveRecord } from '../core';
import type { Settings } from '../core';
import type { ProjectDocument, ProjectFile } from '../core';
import type { ReadOutcome } from '../core';
import type { Prepared } from '../core';
import type { AutoPickResult } from '../core';

export interface NamedBytes {
  /** Name in the session and in a saved project: unique, may hold folders ("day2/1.sg2"). */
  name: string;
  bytes: Uint8Array;
  /** Folder the file came from when a folder was dropped ('' or absent otherwise). */
  folder?: string;
  /** Sample interval for a text file without a time column (user-given), s. */
  sampleIntervalS?: number;
}

export type WorkerRequest =
  | { type: 'parse'; jobId: number; files: NamedBytes[] }
  | { type: 'open-archive'; jobId: number; name: string; bytes: Uint8Array }
  | { type: 'make-demo'; jobId: number; kind: TestKind }
  | {
      type: 'process';
      jobId: number;
      survey: Survey;
      records: WaveRecord[];
      settings: Settings;
      /** User-fixed azimuths (edits.azimuthDeg). */
      azimuthDeg?: Record<string, number>;
    };

export interface ParsedFile {
  name: string;
  outcome: ReadOutcome;
}

export interface OpenedArchive {
  doc: ProjectDocument;
  /** Every file of the archive (waveforms and deviation tables), bytes unchanged. */
  files: ProjectFile[];
  missing: string[];
  /** Read outcome of each waveform file (deviation-table files are not read as waveforms). */
  parsed: ParsedFile[];
  /** Problems the opener reported (missing, unreadable or unlisted files). */
  issues?: ErrorInfo[];
}

export type WorkerResponse =
  | { type: 'progress'; jobId: number; stage: string; done: number; total: number }
  | { type: 'parsed-file'; jobId: number; file: ParsedFile }
  | { type: 'parsed'; jobId: number }
  | { type: 'archive'; jobId: number; archive: OpenedArchive }
  | { type: 'processed'; jobId: number; prepared: Prepared; auto: AutoPickResult }
  | { type: 'failed'; jobId: number; error: ErrorInfo };
