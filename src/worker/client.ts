/**
 * Page side of the core worker: one job at a time per lane, progress callbacks, and cancel (terminate
 * the worker and start a fresh one, so a long auto-pick never blocks the page).
 */
import CoreWorker from './core.worker?worker&inline';
import type { ErrorInfo } from '../core/errors';
import type { WorkerRequest, WorkerResponse } from './protocol';

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
    const w = new CoreWorker();
    w.onmessage = (ev: MessageEvent<WorkerResponse>) => {
      const p = this.pending.get(ev.data.jobId);
      if (p && p.onMessage(ev.data)) this.pending.delete(ev.data.jobId);
    };
    w.onerror = (ev) => {
      const err: ErrorInfo = { code: 'WORKER_FAILED', message: `The background worker stopped: ${ev.message || 'unknown reason'}.` };
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

  get busy(): boolean {
    return this.pending.size > 0;
  }

  /** Stops every job of this lane at once; their promises reject with CANCELLED. */
  cancel(): void {
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
