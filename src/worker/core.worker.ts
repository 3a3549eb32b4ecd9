/// <reference lib="webworker" />
/**
 * Heavy core work off the main thread: reading waveform files, opening project archives, making the
 * demo survey, and prepare + auto-pick with progress. Only calls the core; computes nothing itself.
 */
import { toErrorInfo } from '../core';
import type { WaveRecord } from '../core';
import { readWaveFile } from '../core';
import { readProjectArchive, writeProjectArchive } from '../core';
import { makeDemoProject } from '../core';
import { autoPick, prepare } from '../core';
import type { WorkerRequest, WorkerResponse } from './protocol';

const ctx = self as unknown as DedicatedWorkerGlobalScope;

function post(msg: WorkerResponse, transfer: Transferable[] = []): void {
  ctx.postMessage(msg, transfer);
}

function handle(req: WorkerRequest): void {
  const { jobId } = req;
  try {
    if (req.type === 'parse') {
      req.files.forEach((f, i) => {
        const opts = f.sampleIntervalS !== undefined ? { sampleIntervalS: f.sampleIntervalS } : {};
        post({ type: 'parsed-file', jobId, file: { name: f.name, outcome: readWaveFile(f.bytes, f.name, opts) } });
        post({ type: 'progress', jobId, stage: 'read', done: i + 1, total: req.files.length });
      });
      post({ type: 'parsed', jobId });
    } else if (req.type === 'open-archive') {
      const opened = readProjectArchive(req.bytes, req.name);
      post({ type: 'progress', jobId, stage: 'read', done: 1, total: 1 });
      const { doc, files, missing, parsed, issues } = opened;
      post({ type: 'archive', jobId, archive: { doc, files, missing, parsed, issues } });
    } else if (req.type === 'make-demo') {
      const demo = makeDemoProject(req.kind);
      const bytes = writeProjectArchive(demo.doc, demo.files);
      post({ type: 'demo', jobId, name: `demo-${req.kind}.zip`, bytes }, [bytes.buffer as ArrayBuffer]);
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
      post({ type: 'processed', jobId, prepared, auto });
    }
  } catch (e) {
    post({ type: 'failed', jobId, error: toErrorInfo(e, req.type === 'open-archive' ? req.name : undefined) });
  }
}

ctx.onmessage = (ev: MessageEvent<WorkerRequest>) => handle(ev.data);
