/**
 * The panels of a scan found off the main thread (a Node worker thread), as the workbench will
 * run it in its worker: the main thread posts the decoded image, the worker posts back each
 * progress step and then what it found (panel ids, calibration figures, questions).
 * Used by bench/detectScan.bench.ts.
 */
import { parentPort } from 'node:worker_threads';
import { findRasterPanels } from '../../src/digitize/detect/rasterPanels.ts';
import { closeTextReaderNode, textReaderNode } from '../../src/digitize/loaders/ocrNode.ts';

export type FromWorker =
  | { kind: 'ready' }
  | { kind: 'progress'; fraction: number; what: string }
  | { kind: 'found'; panels: string[]; questions: string[] }
  | { kind: 'failed'; message: string };

export type ToWorker = { kind: 'detect'; width: number; height: number; data: Uint8ClampedArray } | { kind: 'close' };

const port = parentPort;
if (port) {
  const reader = textReaderNode();
  // Start the reader at once, so the first sheet does not wait for it.
  await reader.read({ width: 8, height: 8, grey: new Uint8Array(64).fill(255) }, 'digits');
  port.postMessage({ kind: 'ready' } satisfies FromWorker);
  port.on('message', async (m: ToWorker) => {
    if (m.kind === 'close') {
      await closeTextReaderNode();
      port.close();
      return;
    }
    try {
      const found = await findRasterPanels({ width: m.width, height: m.height, data: m.data, scale: 1 }, reader, (fraction, what) => port.postMessage({ kind: 'progress', fraction, what } satisfies FromWorker));
      port.postMessage({ kind: 'found', panels: found.panels.map((p) => p.id), questions: found.questions } satisfies FromWorker);
    } catch (error) {
      port.postMessage({ kind: 'failed', message: error instanceof Error ? error.message : String(error) } satisfies FromWorker);
    }
  });
}
