/**
 * Where raster traces of efficiency and NPSHr leave their own line on the random bed, and for
 * which line: each trace point is put on its own drawn line, on another line of the same panel
 * (the neighbour it ran onto), or on neither; the dump gives the shares, whether the stray points
 * lie between the guides or beyond them, and whether the two lines share a colour. Traces are
 * followed with the other traces' guides as the replay hands them in (`siblingGuides`).
 *
 *   FORK_SHEETS=40 FORK_SEED=1 npx tsx scripts/randomSheets/forkDump.ts [--all] [out.json]
 *
 * `--all` lists every trace, not only those more than 30 % off their own line.
 */
import { RENDER_VERSION } from './svg.ts';
import { existsSync, readFileSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { traceRaster } from '../../src/digitize/rasterTrace.ts';
import { sheetPoint } from '../../src/digitize/points.ts';
import { siblingGuides } from '../../src/digitize/vectorChoice.ts';
import { applyH, decode } from './camera.ts';
import { makeRandomSheet, sheetGeometry } from './randomSheet.ts';
import { nearest } from './traceGeometry.ts';
import type { TakeoffInput } from '../../src/model/takeoff.ts';

const CACHE = join(import.meta.dirname, '..', '..', 'artifacts', 'random-sheets', RENDER_VERSION);

const distance = nearest;

export interface ForkRow {
  seed: number;
  id: string;
  quantity: string;
  guides: number;
  /** Where the guides sit along the drawn line (0–1). */
  guideAt: number[];
  colour: string;
  dash: string;
  width: number;
  /** Share of trace points off their own line, and of those, on a neighbour. */
  off: number;
  onOther: number;
  /** The neighbour most stray points lie on, and whether it has the trace's colour. */
  other?: string;
  sameColour?: boolean;
  /** Share of stray points between the first and the last guide. */
  between: number;
  /** Other traces' guides of the panel that the trace passes within two line widths (and 3 px) of. */
  siblingHits: number;
}

export async function forkSheet(seed: number): Promise<ForkRow[]> {
  const kind = seed % 3 === 2 ? 'photo' : 'scan';
  const base = join(CACHE, `${seed}-${kind}`);
  const cached = existsSync(`${base}.jpg`) ? { jpeg: readFileSync(`${base}.jpg`), takeoff: (JSON.parse(readFileSync(`${base}.json`, 'utf8')) as { takeoff: TakeoffInput }).takeoff } : await makeRandomSheet(seed, kind);
  const { plan, shot } = sheetGeometry(seed, kind);
  const decoded = await decode(cached.jpeg);
  const image = { width: decoded.width, height: decoded.height, data: decoded.data, scale: 1 };
  const traces = cached.takeoff.traces;
  const siblings = siblingGuides(traces);
  const out: ForkRow[] = [];
  traces.forEach((trace, index) => {
    const line = plan.lines.find((l) => l.id === trace.id);
    if (!line || !trace.guides || line.iso !== undefined || (line.quantity !== 'efficiency' && line.quantity !== 'npshr')) return;
    const truth = line.points.map((p) => applyH(shot.h, p));
    const others = plan.lines.filter((l) => l.panel === line.panel && l.id !== line.id).map((l) => ({ l, pts: l.points.map((p) => applyH(shot.h, p)) }));
    const frame = cached.takeoff.panels.find((p) => p.id === trace.panel)?.frame;
    const got = traceRaster(
      image,
      trace.guides.map(([x, y]) => sheetPoint(x, y)),
      { ...(frame ? { frame } : {}), siblings: siblings.filter((_, k) => k !== index) },
    );
    const near = Math.max(2, line.style.width);
    const guideAt = trace.guides.map((g) => distance(truth, g).k);
    const lo = Math.min(...guideAt);
    const hi = Math.max(...guideAt);
    let off = 0;
    let between = 0;
    const onto = new Map<string, number>();
    for (const p of got.points) {
      const own = distance(truth, p);
      if (own.d <= near) continue;
      off++;
      if (own.k > lo && own.k < hi) between++;
      let best: string | undefined;
      let bestD = near;
      for (const o of others) {
        const d = distance(o.pts, p).d;
        if (d <= bestD) {
          bestD = d;
          best = o.l.id;
        }
      }
      if (best) onto.set(best, (onto.get(best) ?? 0) + 1);
    }
    const n = got.points.length || 1;
    const reach = Math.max(3, 2 * line.style.width);
    const siblingHits = traces.filter((t, k) => k !== index && t.panel === trace.panel).flatMap((t) => t.guides ?? []).filter((g) => got.points.length >= 2 && distance(got.points, g).d <= reach && distance(truth, g).d > reach).length;
    const top = [...onto.entries()].sort((a, b) => b[1] - a[1])[0];
    const otherLine = top ? plan.lines.find((l) => l.id === top[0]) : undefined;
    out.push({
      seed,
      id: line.id,
      quantity: line.quantity,
      guides: trace.guides.length,
      guideAt: guideAt.map((k) => Number(k.toFixed(2))),
      colour: line.style.colour,
      dash: line.style.dash,
      width: Number(line.style.width.toFixed(2)),
      off: off / n,
      onOther: off ? [...onto.values()].reduce((s, v) => s + v, 0) / off : 0,
      ...(otherLine ? { other: otherLine.id, sameColour: otherLine.style.colour === line.style.colour } : {}),
      between: off ? between / off : 0,
      siblingHits,
    });
  });
  return out;
}

async function main(): Promise<void> {
  const args = process.argv.slice(2);
  const all = args.includes('--all');
  const file = args.find((a) => !a.startsWith('--'));
  const count = Number(process.env.FORK_SHEETS ?? 40);
  const first = Number(process.env.FORK_SEED ?? 1);
  const rows: ForkRow[] = [];
  for (let s = first; s < first + count; s++) rows.push(...(await forkSheet(s)));
  for (const q of ['efficiency', 'npshr']) {
    const list = rows.filter((r) => r.quantity === q);
    const bad = list.filter((r) => r.off > 0.3);
    process.stdout.write(`${q}: ${list.length} traces, ${bad.length} more than 30 % off their line (${bad.filter((r) => r.sameColour).length} onto a line of the same colour, ${bad.filter((r) => r.sameColour === false).length} of another colour); mean off ${(100 * list.reduce((s, r) => s + r.off, 0) / (list.length || 1)).toFixed(1)} %\n`);
  }
  for (const r of rows.filter((r) => all || r.off > 0.3)) {
    process.stdout.write(`  ${String(r.seed).padStart(3)} ${r.id.padEnd(16)} guides ${r.guideAt.join(',').padEnd(15)} ${r.colour} ${r.dash.padEnd(6)} w ${r.width.toFixed(1)}  off ${(100 * r.off).toFixed(0).padStart(3)} %  on other ${(100 * r.onOther).toFixed(0).padStart(3)} % ${r.other ?? '-'}${r.sameColour ? ' (same colour)' : ''}  between guides ${(100 * r.between).toFixed(0)} %  sibling guides passed ${r.siblingHits}\n`);
  }
  if (file) writeFileSync(file, JSON.stringify(rows));
}

if (import.meta.url === `file://${process.argv[1]}`) await main();
