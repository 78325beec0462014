/**
 * The page's side of the sheet worker: typed calls that resolve with the result and
 * report progress on the way.
 */
import { UserError } from '../../model/errors.ts';
import type { Progress, WorkerCall, WorkerReply } from './rpc.ts';
import type { Request, RequestName, Requests } from './protocol.ts';

/** An error raised inside the worker, with the worker's name and message kept. */
export class WorkerError extends UserError {
  constructor(name: string, message: string) {
    super(message);
    this.name = name;
  }
}

interface Pending {
  resolve: (value: unknown) => void;
  reject: (error: Error) => void;
  onProgress: ((p: Progress) => void) | undefined;
}

export class SheetWorkerClient {
  private readonly worker: Worker;
  private readonly pending = new Map<number, Pending>();
  private nextId = 1;

  constructor(worker?: Worker) {
    this.worker = worker ?? new Worker(new URL('./sheetWorker.ts', import.meta.url), { type: 'module', name: 'sheet' });
    this.worker.onmessage = (event: MessageEvent<WorkerReply<unknown>>) => this.receive(event.data);
    this.worker.onerror = (event) => {
      const error = new WorkerError('WorkerError', `The sheet worker stopped: ${event.message || 'unknown error'}.`);
      for (const p of this.pending.values()) p.reject(error);
      this.pending.clear();
    };
  }

  call<K extends RequestName>(op: K, args: Requests[K]['args'], onProgress?: (p: Progress) => void, transfer: Transferable[] = []): Promise<Requests[K]['result']> {
    const id = this.nextId++;
    const message: WorkerCall<Request> = { id, request: { op, args } as Request };
    return new Promise((resolve, reject) => {
      this.pending.set(id, { resolve: resolve as (v: unknown) => void, reject, onProgress });
      this.worker.postMessage(message, transfer);
    });
  }

  private receive(reply: WorkerReply<unknown>): void {
    const p = this.pending.get(reply.id);
    if (!p) return;
    if (reply.kind === 'progress') {
      p.onProgress?.(reply.progress);
      return;
    }
    this.pending.delete(reply.id);
    if (reply.kind === 'result') p.resolve(reply.result);
    else p.reject(new WorkerError(reply.name, reply.message));
  }
}
