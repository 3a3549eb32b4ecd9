/// <reference lib="webworker" />
/**
 * Heavy core work off the main thread: reading waveform files, opening project archives, making the
 * demo survey, and prepare + auto-pick with progress. Only calls the core; computes nothing itself.
 */
import { toErrorInfo } from '../core';
import type { WaveRecord } from '../core';
import { readWaveFile } from '../core';
import { memorySource, openProject, readProjectArchive, type OpenedProject } from '../core';
import { makeDemoProject } from '../core';
import { autoPick, prepare } from '../core';
import type { OpenedArchive, WorkerRequest, WorkerResponse } from './protocol';
import { buffersOf } from './transfer';

const ctx = self as unknown as DedicatedWorkerGlobalScope;

function post(msg: WorkerResponse, transfer: Transferable[] = []): void {
  ctx.postMessage(msg, transfer);
}

/** Posts a result the worker does not keep: its sample arrays and bytes move to the page. */
function handOver(msg: WorkerResponse): void {
  post(msg, buffersOf(msg));
}

/** What the page needs of an opened project (the one opener in the core read and placed it). */
function forPage(opened: OpenedProject): OpenedArchive {
  const { doc, files, missing, parsed, issues } = opened;
  return { doc, files, missing, parsed, issues };
}

function handle(req: WorkerRequest): void {
  const { jobId } = req;
  try {
    const progress = (done: number, total: number) => post({ type: 'progress', jobId, stage: 'read', done, total });
    if (req.type === 'parse') {
      req.files.forEach((f, i) => {
        const opts = f.sampleIntervalS !== undefined ? { sampleIntervalS: f.sampleIntervalS } : {};
        // The bytes came as a copy (the page keeps its own for the archive and autosave): only the record moves back.
        handOver({ type: 'parsed-file', jobId, file: { name: f.name, outcome: readWaveFile(f.bytes, f.name, opts) } });
        progress(i + 1, req.files.length);
      });
      post({ type: 'parsed', jobId });
    } else if (req.type === 'open-archive') {
      handOver({ type: 'archive', jobId, archive: forPage(readProjectArchive(req.bytes, req.name)) });
      progress(1, 1);
    } else if (req.type === 'make-demo') {
      // Opened by the one opener with the same checks as a saved archive, from memory (not zipped first).
      const demo = makeDemoProject(req.kind);
      const name = `demo-${req.kind}.zip`;
      handOver({ type: 'archive', jobId, archive: forPage(openProject(memorySource(demo.doc, demo.files, name))) });
      progress(1, 1);
    } else if (req.type === 'process') {
      const records = new Map<string, WaveRecord>(req.records.map((r) => [r.id, r]));
      post({ type: 'progress', jobId, stage: 'prepare', done: 0, total: 1 });
      const prepared = prepare(req.survey, records, req.settings, req.azimuthDeg ?? {});
      post({ type: 'progress', jobId, stage: 'prepare', done: 1, total: 1 });
      let last = 0;
      const auto = autoPick(prepared, req.settings, (done, total) => {
        const now = Date.now();
        if (now - last > 80 || done === total) {
          last = now;
          post({ type: 'progress', jobId, stage: 'auto-pick', done, total });
        }
      });
      handOver({ type: 'processed', jobId, prepared, auto });
    }
  } catch (e) {
    post({ type: 'failed', jobId, error: toErrorInfo(e, req.type === 'open-archive' ? req.name : undefined) });
  }
}

ctx.onmessage = (ev: MessageEvent<WorkerRequest>) => handle(ev.data);
