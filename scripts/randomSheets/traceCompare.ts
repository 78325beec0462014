/**
 * Compares two dumps of `traceGeometry.ts` taken on the same cached sheets (before and after a
 * change to the raster tracer): every trace whose coverage, p95 distance or share off the line
 * moved, marked + (longer, or nearer the line) or - , with G/b for whole-and-on-the-line or not
 * before and after; then the count of whole traces and, per quantity, the traces by kind of
 * failure (whole, off the line, short at one end or both).
 *
 *   npx tsx scripts/randomSheets/traceCompare.ts before.json after.json
 */
import { readFileSync } from 'node:fs';
import type { TraceGeometry } from './traceGeometry.ts';

const key = (t: TraceGeometry) => `${t.seed}/${t.id}`;

/** Whole and on the line: from the first to the last 5 % of the drawn line, p95 within a width (1.5 px at least). */
export const whole = (t: TraceGeometry) => t.from < 0.05 && t.to > 0.95 && t.p95 < Math.max(1.5, t.width);

/** The kind of failure of a trace: its points off the line, short at the low or high end, or whole. */
export function failure(t: TraceGeometry): string {
  if (t.offShare > 0.3) return 'off the line (>30 % of points)';
  if (t.offShare > 0.1) return 'partly off the line (10-30 %)';
  if (whole(t)) return 'whole';
  if (t.from >= 0.05 && t.to <= 0.95) return 'short at both ends';
  return t.from >= 0.05 ? 'short at the start' : 'short at the end';
}

function main(): void {
  const [beforeFile, afterFile] = process.argv.slice(2);
  if (!beforeFile || !afterFile) {
    process.stderr.write('Give two dumps of traceGeometry.ts: traceCompare.ts before.json after.json\n');
    process.exit(2);
  }
  const before = JSON.parse(readFileSync(beforeFile, 'utf8')) as TraceGeometry[];
  const after = JSON.parse(readFileSync(afterFile, 'utf8')) as TraceGeometry[];
  const old = new Map(before.map((t) => [key(t), t]));
  let better = 0;
  let worse = 0;
  for (const t of after) {
    const o = old.get(key(t));
    if (!o) continue;
    const longer = t.to - t.from - (o.to - o.from);
    const nearer = o.p95 - t.p95;
    if (Math.abs(longer) <= 0.05 && Math.abs(nearer) <= 1 && Math.abs(t.offShare - o.offShare) <= 0.05) continue;
    const up = (longer > 0.05 && nearer > -1) || (nearer > 1 && longer > -0.05);
    if (up) better++;
    else worse++;
    const f = (x: number) => x.toFixed(2);
    process.stdout.write(
      `${up ? '+' : '-'} ${key(t)} ${t.dash} ${t.mono ? 'black' : 'colour'}  covers ${f(o.from)}-${f(o.to)} -> ${f(t.from)}-${f(t.to)}  p95 ${o.p95.toFixed(1)} -> ${t.p95.toFixed(1)} px  off ${f(o.offShare)} -> ${f(t.offShare)}  ${whole(o) ? 'G' : 'b'}${whole(t) ? 'G' : 'b'}\n`,
    );
  }
  process.stdout.write(`moved: ${better} better, ${worse} worse; whole and on the line: ${before.filter(whole).length} -> ${after.filter(whole).length} of ${after.length}\n`);
  const quantities = [...new Set(after.map((t) => `${t.quantity}${t.iso ? ' (iso)' : ''}`))].sort();
  for (const q of quantities) {
    const of = (rows: TraceGeometry[]) => rows.filter((t) => `${t.quantity}${t.iso ? ' (iso)' : ''}` === q);
    const count = (rows: TraceGeometry[]) => {
      const c = new Map<string, number>();
      for (const t of of(rows)) c.set(failure(t), (c.get(failure(t)) ?? 0) + 1);
      return c;
    };
    const b = count(before);
    const a = count(after);
    const kinds = [...new Set([...b.keys(), ...a.keys()])].sort();
    process.stdout.write(`${q}: ${kinds.map((k) => `${k} ${b.get(k) ?? 0} -> ${a.get(k) ?? 0}`).join('; ')}\n`);
  }
}

if (import.meta.url === `file://${process.argv[1]}`) main();
