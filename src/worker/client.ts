/**
 * Page side of the core worker: one job at a time per lane, progress callbacks, and cancel (terminate
 * the worker and start a fresh one, so a long auto-pick never blocks the page).
 */
import CoreWorker from './core.worker?worker&inline';
import type { ErrorInfo } from '../core';
import type { WorkerRequest, WorkerResponse } from './protocol';

/**
 * Starts the inline worker. Opened from file:// (the single-file build), Chromium refuses a module
 * worker whose script is a blob: URL of the page's opaque origin, while a data: URL works; Vite's inline
 * wrapper falls back to a data: URL only when the blob: construction throws, so for file:// pages the
 * Worker constructor is wrapped for that one call to refuse blob: URLs.
 */
export function startCoreWorker(): Worker {
  if (typeof location === 'undefined' || location.protocol !== 'file:') return new CoreWorker();
  const Native = globalThis.Worker;
  class DataUrlOnly extends Native {
    constructor(url: string | URL, options?: WorkerOptions) {
      if (String(url).startsWith('blob:')) throw new Error('blob: worker refused on file://');
      super(url, options);
    }
  }
  globalThis.Worker = DataUrlOnly;
  try {
    return new CoreWorker();
  } finally {
    globalThis.Worker = Native;
  }
}

type Pending = {
  onMessage: (m: WorkerResponse) => boolean;
  reject: (e: ErrorInfo) => void;
};

type RequestBody = WorkerRequest extends infer R ? (R extends { jobId: number } ? Omit<R, 'jobId'> : never) : never;

export class WorkerLane {
  private worker: Worker | null = null;
  private pending = new Map<number, Pending>();
  private nextId = 1;

  private ensure(): Worker {
    if (this.worker) return this.worker;
    const w = startCoreWorker();
    w.onmessage = (ev: MessageEvent<WorkerResponse>) => {
      const p = this.pending.get(ev.data.jobId);
      if (p && p.onMessage(ev.data)) this.pending.delete(ev.data.jobId);
    };
    w.onerror = (ev) => {
      const err: ErrorInfo = {
        code: 'WORKER_FAILED',
        message: `The background worker stopped: ${ev.message || 'unknown reason'}.`,
      };
      for (const p of this.pending.values()) p.reject(err);
      this.pending.clear();
      this.worker?.terminate();
      this.worker = null;
    };
    this.worker = w;
    return w;
  }

  /**
   * Sends a request; `onMessage` sees every response of the job and returns true when the job is done.
   * Resolves with nothing; the caller collects results in onMessage.
   */
  run(body: RequestBody, onMessage: (m: WorkerResponse) => boolean, transfer: Transferable[] = []): Promise<void> {
    const jobId = this.nextId++;
    return new Promise<void>((resolve, reject) => {
      this.pending.set(jobId, {
        onMessage: (m) => {
          if (m.type === 'failed') {
            reject(m.error);
            return true;
          }
          const done = onMessage(m);
          if (done) resolve();
          return done;
        },
        reject,
      });
      this.ensure().postMessage({ ...body, jobId } as WorkerRequest, transfer);
    });
  }

  /** Starts the worker ahead of its first job (its script is compiled while the page is idle). */
  warm(): void {
    this.ensure();
  }

  get busy(): boolean {
    return this.pending.size > 0;
  }

  /**
   * Stops every job of this lane at once; their promises reject with CANCELLED. An idle worker is kept
   * (it holds nothing between jobs), so the next job does not pay for starting a new one.
   */
  cancel(): void {
    if (this.pending.size === 0) return;
    const err: ErrorInfo = { code: 'CANCELLED', message: 'Stopped by the user.' };
    for (const p of this.pending.values()) p.reject(err);
    this.pending.clear();
    this.worker?.terminate();
    this.worker = null;
  }
}

/** Reading files and archives. */
export const ioLane = new WorkerLane();
/** Prepare + auto-pick (cancelled and restarted whenever the inputs change). */
export const processLane = new WorkerLane();
