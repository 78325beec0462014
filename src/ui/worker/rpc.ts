/**
 * The envelope of messages between the page and the sheet worker: each request carries
 * an id; the worker answers with progress reports and then one result or one error.
 */
export interface Progress {
  /** 0…1, or null when the amount of work is not known. */
  fraction: number | null;
  label: string;
}

export type WorkerReply<R> =
  | { id: number; kind: 'progress'; progress: Progress }
  | { id: number; kind: 'result'; result: R }
  | { id: number; kind: 'error'; name: string; message: string };

export interface WorkerCall<Q> {
  id: number;
  request: Q;
}
