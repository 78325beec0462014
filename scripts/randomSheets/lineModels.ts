/**
 * The line model each raster efficiency and NPSHr trace of the random bed keeps, against the
 * drawn line's colour: where the colour kept is of another hue than the drawn line's, the model
 * was sampled on a neighbour or a bunch. Prints one row a trace (seed, id, drawn colour, kept
 * colour, the cosine between the two colours' chroma (NaN for a grey line), kept width, covered
 * share of the drawn line):
 *
 *   MODEL_SHEETS=40 MODEL_SEED=1 npx tsx scripts/randomSheets/lineModels.ts
 */
import { RENDER_VERSION } from './svg.ts';
import { existsSync, readFileSync } from 'node:fs';
import { join } from 'node:path';
import { traceRaster } from '../../src/digitize/rasterTrace.ts';
import { sheetPoint } from '../../src/digitize/points.ts';
import { siblingGuides } from '../../src/digitize/vectorChoice.ts';
import { applyH, decode } from './camera.ts';
import { sheetGeometry } from './randomSheet.ts';
import { nearest } from './traceGeometry.ts';
import type { TakeoffInput } from '../../src/model/takeoff.ts';

const count = Number(process.env.MODEL_SHEETS ?? 40);
const first = Number(process.env.MODEL_SEED ?? 1);
for (let seed = first; seed < first + count; seed++) {
  const kind = seed % 3 === 2 ? 'photo' : 'scan';
  const base = join(import.meta.dirname, '..', '..', 'artifacts', 'random-sheets', RENDER_VERSION, `${seed}-${kind}`);
  if (!existsSync(`${base}.jpg`)) continue;
  const takeoff = (JSON.parse(readFileSync(`${base}.json`, 'utf8')) as { takeoff: TakeoffInput }).takeoff;
  const { plan, shot } = sheetGeometry(seed, kind);
  const decoded = await decode(readFileSync(`${base}.jpg`));
  const image = { width: decoded.width, height: decoded.height, data: decoded.data, scale: 1 };
  const siblings = siblingGuides(takeoff.traces);
  takeoff.traces.forEach((trace, index) => {
    const id = trace.id as string;
    if (!trace.guides || !/^(efficiency|npshr)-/.test(id)) return;
    const line = plan.lines.find((l) => l.id === id);
    if (!line) return;
    const truth = line.points.map((p) => applyH(shot.h, p));
    const frame = takeoff.panels.find((p) => p.id === trace.panel)?.frame;
    const got = traceRaster(image, trace.guides.map(([x, y]) => sheetPoint(x, y)), { ...(frame ? { frame } : {}), siblings: siblings.filter((_, k) => k !== index) });
    const hex = line.style.colour;
    // Hue compared on the chroma alone (each colour less its grey mean): a grey line has none.
    const chroma = (c: readonly number[]) => c.map((v) => v - (c[0]! + c[1]! + c[2]!) / 3);
    const drawn = chroma([1, 3, 5].map((i) => parseInt(hex.slice(i, i + 2), 16)));
    const kept = chroma(got.line.colour);
    const norm = Math.hypot(...drawn) * Math.hypot(...kept);
    const dot = norm > 0 ? drawn.reduce((s, v, i) => s + v * (kept[i] as number), 0) / norm : NaN;
    const ks = got.points.map((p) => nearest(truth, p as unknown as readonly [number, number]).k);
    const from = ks.length ? Math.min(...ks) : 0;
    const to = ks.length ? Math.max(...ks) : 0;
    console.log(`${seed} ${kind} ${id} ${line.style.dash} ${hex} kept ${got.line.colour.map((v) => v.toFixed(0)).join(',')} cos ${dot.toFixed(2)} w ${got.line.widthPx.toFixed(2)} drawn w ${line.style.width.toFixed(2)} covers ${from.toFixed(2)}-${to.toFixed(2)}`);
  });
}
