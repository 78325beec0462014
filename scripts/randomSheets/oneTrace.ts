/**
 * Raster traces of the random bed followed alone, with what each found (points off the drawn
 * line, coverage, the model kept, lost stretches, doubts, time):
 * `npx tsx scripts/randomSheets/oneTrace.ts 28 efficiency-310 efficiency-259`.
 */
import { RENDER_VERSION } from './svg.ts';
import { existsSync, readFileSync } from 'node:fs';
import { join } from 'node:path';
import { traceRaster } from '../../src/digitize/rasterTrace.ts';
import { sheetPoint } from '../../src/digitize/points.ts';
import { siblingGuides } from '../../src/digitize/vectorChoice.ts';
import { applyH, decode } from './camera.ts';
import { sheetGeometry, withCarefulGuides } from './randomSheet.ts';
import { nearest } from './traceGeometry.ts';
import type { TakeoffInput } from '../../src/model/takeoff.ts';

const [seedArg, ...ids] = process.argv.slice(2);
const seed = Number(seedArg);
const kind = seed % 3 === 2 ? 'photo' : 'scan';
const base = join(import.meta.dirname, '..', '..', 'artifacts', 'random-sheets', RENDER_VERSION, `${seed}-${kind}`);
if (!existsSync(`${base}.jpg`)) throw new Error('sheet not in the cache');
const jpeg = readFileSync(`${base}.jpg`);
const stored = (JSON.parse(readFileSync(`${base}.json`, 'utf8')) as { takeoff: TakeoffInput }).takeoff;
// RANDOM_GUIDES=careful: the guides placed where each line stands alone, as the bench's careful view.
const takeoff = process.env.RANDOM_GUIDES === 'careful' ? withCarefulGuides(stored, seed, kind) : stored;
const { plan, shot } = sheetGeometry(seed, kind);
const decoded = await decode(jpeg);
const image = { width: decoded.width, height: decoded.height, data: decoded.data, scale: 1 };
const siblings = siblingGuides(takeoff.traces);
takeoff.traces.forEach((trace, index) => {
  if (!ids.includes(trace.id as string) || !trace.guides) return;
  const line = plan.lines.find((l) => l.id === trace.id);
  if (!line) return;
  const truth = line.points.map((p) => applyH(shot.h, p));
  const frame = takeoff.panels.find((p) => p.id === trace.panel)?.frame;
  console.log(`${trace.id}: drawn ${line.style.colour} ${line.style.dash} w ${line.style.width.toFixed(2)}; guides ${trace.guides.map((g) => `(${g[0].toFixed(0)},${g[1].toFixed(0)}) at ${nearest(truth, g).k.toFixed(2)} off ${nearest(truth, g).d.toFixed(1)}`).join(' ')}`);
  const t0 = performance.now();
  const got = traceRaster(image, trace.guides.map(([x, y]) => sheetPoint(x, y)), { ...(frame ? { frame } : {}), siblings: siblings.filter((_, k) => k !== index) });
  const ms = performance.now() - t0;
  const near = Math.max(2, line.style.width);
  const off = got.points.filter((p) => nearest(truth, p).d > near).length;
  const covered = truth.filter((t) => got.points.length > 1 && nearest(got.points, t).d <= Math.max(3, 2 * line.style.width)).length / truth.length;
  console.log(`  ${got.points.length} pts, ${off} off, covers ${(100 * covered).toFixed(0)} %, colour ${got.line.colour.map((v) => v.toFixed(0)).join(',')} w ${got.line.widthPx.toFixed(2)}${got.line.dashed ? ' dashed' : ''}, ${ms.toFixed(0)} ms`);
  if (process.env.SHOW_OFF) for (const p of got.points) { const n = nearest(truth, p); if (n.d > near) console.log(`    off (${p[0].toFixed(0)},${p[1].toFixed(0)}) at ${n.k.toFixed(2)} by ${n.d.toFixed(1)}`); }
  for (const l of got.lost) console.log(`  lost ${l.between.join('-')}: ${l.reason}`);
  for (const d of got.doubts) console.log(`  doubt ${d.code}: ${d.message.slice(0, 100)}`);
});
