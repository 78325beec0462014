/**
 * The whole detection of a scan off the main thread (a Node worker thread), as the workbench runs
 * it in its sheet worker: the main thread posts the decoded image; the worker finds the panels,
 * then the curves of those panels, posting each progress step (the panels take the first 60 %,
 * the curves the rest, each frame, line and label step posted, as in `detectRasterTakeoff`) and then what it found (panel ids,
 * curves named, questions). Used by bench/detectScan.bench.ts.
 */
import { parentPort } from 'node:worker_threads';
import { findRasterCurves } from '../../src/digitize/detect/rasterCurves.ts';
import { findRasterPanels } from '../../src/digitize/detect/rasterPanels.ts';
import { closeTextReaderNode, textReaderNode } from '../../src/digitize/loaders/ocrNode.ts';

export type FromWorker =
  | { kind: 'ready' }
  | { kind: 'progress'; fraction: number; what: string }
  | { kind: 'found'; panels: string[]; curves: number; questions: string[] }
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
      const image = { width: m.width, height: m.height, data: m.data, scale: 1 };
      const found = await findRasterPanels(image, reader, (fraction, what) => port.postMessage({ kind: 'progress', fraction: 0.6 * fraction, what } satisfies FromWorker));
      port.postMessage({ kind: 'progress', fraction: 0.6, what: 'finding the curves' } satisfies FromWorker);
      const curves = await findRasterCurves(image, found, reader, { progress: (fraction, what) => port.postMessage({ kind: 'progress', fraction: 0.6 + 0.4 * fraction, what } satisfies FromWorker) });
      port.postMessage({ kind: 'found', panels: found.panels.map((p) => p.id), curves: curves.curves.length, questions: [...found.questions, ...curves.questions] } satisfies FromWorker);
    } catch (error) {
      port.postMessage({ kind: 'failed', message: error instanceof Error ? error.message : String(error) } satisfies FromWorker);
    }
  });
}
