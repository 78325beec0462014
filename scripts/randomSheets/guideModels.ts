/**
 * The colour each guide of a raster efficiency or NPSHr trace samples alone, against the drawn
 * line's colour, beside the model the whole trace keeps: tells a model sampled on a neighbour at
 * every guide from one where a guide sampled the line well but another guide's model won.
 * One row a trace: seed, id, the chroma cosine (drawn vs kept) of the trace, then per guide its
 * cosine and width. `GUIDE_WRONG=DUMP.json` keeps the traces that dump marks wrong.
 *
 *   MODEL_SHEETS=40 MODEL_SEED=1 npx tsx scripts/randomSheets/guideModels.ts
 */
import { RENDER_VERSION } from './svg.ts';
import { existsSync, readFileSync } from 'node:fs';
import { join } from 'node:path';
import { traceRaster } from '../../src/digitize/rasterTrace.ts';
import { inkModel, lumaChroma } from '../../src/digitize/colour.ts';
import { sheetPoint } from '../../src/digitize/points.ts';
import { siblingGuides } from '../../src/digitize/vectorChoice.ts';
import { decode } from './camera.ts';
import { sheetGeometry } from './randomSheet.ts';
import type { TakeoffInput } from '../../src/model/takeoff.ts';

const count = Number(process.env.MODEL_SHEETS ?? 40);
const first = Number(process.env.MODEL_SEED ?? 1);
const wrongFile = process.env.GUIDE_WRONG;
const wrong = wrongFile ? new Set((JSON.parse(readFileSync(wrongFile, 'utf8')) as { rows: Array<{ seed: number; id: string; wrong: boolean }> }).rows.filter((r) => r.wrong).map((r) => `${r.seed} ${r.id}`)) : undefined;
const chroma = (c: readonly number[]) => c.map((v) => v - (c[0]! + c[1]! + c[2]!) / 3);
const cosine = (a: readonly number[], b: readonly number[]) => {
  const x = chroma(a);
  const y = chroma(b);
  const norm = Math.hypot(...x) * Math.hypot(...y);
  return norm > 0 ? x.reduce((s, v, i) => s + v * (y[i] as number), 0) / norm : NaN;
};
/** The colour's chroma as a share of its luma, both against the paper (colour.ts). */
const share = (l: { colour: readonly [number, number, number]; paper: readonly [number, number, number] }) => {
  const c = lumaChroma(l.paper, ...l.colour);
  return c.chroma / Math.max(c.luma, 1e-9);
};
for (let seed = first; seed < first + count; seed++) {
  const kind = seed % 3 === 2 ? 'photo' : 'scan';
  const base = join(import.meta.dirname, '..', '..', 'artifacts', 'random-sheets', RENDER_VERSION, `${seed}-${kind}`);
  if (!existsSync(`${base}.jpg`)) continue;
  const takeoff = (JSON.parse(readFileSync(`${base}.json`, 'utf8')) as { takeoff: TakeoffInput }).takeoff;
  const { plan } = sheetGeometry(seed, kind);
  const decoded = await decode(readFileSync(`${base}.jpg`));
  const image = { width: decoded.width, height: decoded.height, data: decoded.data, scale: 1 };
  const siblings = siblingGuides(takeoff.traces);
  takeoff.traces.forEach((trace, index) => {
    const id = trace.id as string;
    if (!trace.guides || !new RegExp(process.env.GUIDE_IDS ?? '^(efficiency|npshr)-').test(id)) return;
    if (wrong && !wrong.has(`${seed} ${id}`)) return;
    const line = plan.lines.find((l) => l.id === id);
    if (!line) return;
    const frame = takeoff.panels.find((p) => p.id === trace.panel)?.frame;
    const hex = line.style.colour;
    const drawn = [1, 3, 5].map((i) => parseInt(hex.slice(i, i + 2), 16));
    const options = { ...(frame ? { frame } : {}), extent: 'guides' as const, siblings: siblings.filter((_, k) => k !== index) };
    const all = traceRaster(image, trace.guides.map(([x, y]) => sheetPoint(x, y)), options);
    const each = trace.guides.map(([x, y]) => traceRaster(image, [sheetPoint(x, y)], options).line);
    const cell = (l: { colour: readonly [number, number, number]; paper: readonly [number, number, number]; widthPx: number }) => `${cosine(drawn, l.colour).toFixed(2)}/${l.widthPx.toFixed(1)}/${inkModel(l.colour, l.paper).mode.slice(0, 4)}/${share(l).toFixed(2)}`;
    console.log(`${seed} ${kind} ${id} ${line.style.dash} ${hex} w ${line.style.width.toFixed(2)} kept ${cell(all.line)} guides ${each.map(cell).join(' ')}`);
  });
}
