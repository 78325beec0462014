/**
 * Picture of one trace of a speed sheet (speedSheet.ts), as traceView.ts draws one of the random
 * bed: the sheet cropped around the trace, its guides (blue), the replay's points (red) and the
 * drawn lines of every speed of the same quantity (green for the trace's own, yellow the others).
 *
 *   SPEED_KIND=scan [SPEED_GUIDES=careful] npx tsx scripts/randomSheets/speedView.ts 10 efficiency-1450 /tmp/out.png [zoom]
 */
import { replayTakeoff } from '../../src/digitize/takeoff.ts';
import { parseTakeoff } from '../../src/model/takeoff.ts';
import { applyH, decode } from './camera.ts';
import { benchOptions, cachedSpeedSheet, sheetOf, withCarefulGuides } from './speedDump.ts';
import { markedCrop } from './markedCrop.ts';

const [seedArg, id, out = '/tmp/speed-view.png', zoomArg = '1'] = process.argv.slice(2);
const seed = Number(seedArg);
const zoom = Number(zoomArg);
const kind = (process.env.SPEED_KIND ?? 'scan') as 'scan' | 'vector';
// SPEED_GUIDES=careful: the guides placed where each line stands alone, as the bench's careful view.
const drawn = await cachedSpeedSheet(seed, benchOptions(seed, kind));
const s = process.env.SPEED_GUIDES === 'careful' ? withCarefulGuides(drawn) : drawn;
const sheet = await sheetOf(s);
const result = await replayTakeoff(parseTakeoff(s.takeoff), sheet, { created: '2026-01-01T00:00:00.000Z' });
await sheet.close();
const d = await decode(Buffer.from(s.bytes));
const line = s.plan.lines.find((l) => l.id === id);
if (!line) throw new Error(`no line ${id}`);
const toShot = (p: readonly [number, number]) => applyH(s.shot.h, p);
const own = line.points.map(toShot);
const others = s.plan.lines.filter((l) => l.id !== id && l.quantity === line.quantity && l.panel === line.panel).map((l) => l.points.map(toShot));
const traced = (result.traces.find((t) => t.id === id)?.points ?? []).map((p) => [p[0], p[1]] as [number, number]);
const guides = (s.takeoff.traces.find((t) => t.id === id)?.guides ?? []) as Array<[number, number]>;
const crop = markedCrop(d, [...own, ...guides], zoom);
const dot = crop.dot;
for (const l of others) l.forEach((p, k) => k % 3 === 0 && dot(p, [230, 200, 0], 0.5));
own.forEach((p, k) => k % 3 === 0 && dot(p, [0, 170, 0], 0.5));
for (const p of traced) dot(p, [230, 0, 0], 1);
for (const g of guides) dot(g, [0, 0, 255], 2.5);
await crop.save(out);
process.stdout.write(`${out}: ${crop.width}x${crop.height}, crop ${crop.box.join(',')}; guides ${guides.map((g) => `(${g[0].toFixed(0)},${g[1].toFixed(0)})`).join(' ')}\n`);
