/**
 * Picture of one trace of the random bed, to see where a trace leaves its line: the sheet
 * cropped around the drawn line, with the guides (blue), the captured points (red) and the
 * drawn line (green dots).
 *
 *   npx tsx scripts/randomSheets/traceView.ts 12 efficiency-10.5 /tmp/out.png
 */
import type { Trace } from '../../src/model/takeoff.ts';
import { applyH } from './camera.ts';
import { bedReplay } from './bedReplay.ts';
import { markedCrop } from './markedCrop.ts';

const [seedArg, id, out = '/tmp/view.png', zoomArg = '3'] = process.argv.slice(2);
const seed = Number(seedArg);
const zoom = Number(zoomArg);
const { plan, shot, raster, takeoff, replay } = await bedReplay(seed);
const line = plan.lines.find((l) => l.id === id);
if (!line) throw new Error(`no line ${id}`);
const truth = line.points.map((p) => applyH(shot.h, p));
const traced = replay.traces.find((t) => t.id === id)?.points ?? [];
const guides = (takeoff.traces.find((t) => t.id === id) as Trace | undefined)?.guides ?? [];
const crop = markedCrop(raster, [...truth, ...guides, ...traced], zoom);
const dot = crop.dot;
for (const p of truth) dot(p, [0, 200, 0], 0.5);
for (const p of traced) dot(p, [255, 0, 0], 1);
for (const g of guides) dot(g, [0, 0, 255], 3);
await crop.save(out);
console.log(`${out}: ${crop.width}x${crop.height}, crop ${crop.box.join(',')}; ${guides.length} guides at ${guides.map((g) => `(${g[0].toFixed(0)},${g[1].toFixed(0)})`).join(' ')}`);
