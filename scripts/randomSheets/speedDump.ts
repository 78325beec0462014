/**
 * Per-trace dump of speed sheets (speedSheet.ts), for finding which traces are off and why:
 * for every curve trace, the captured points are read through the panel calibration and
 * compared with the exact curve of the trace's own speed and with every other speed's curve
 * (over the truth's 15–95 % window of the flow range). Prints, per trace, how it was captured,
 * its worst and p95 point error (% of span; efficiency in points), the speed whose curve the
 * points lie closest to, and the fitted curve's error from the bench scorer.
 *
 *   SPEED_SHEETS=3 SPEED_SEED=1 SPEED_KIND=vector npx tsx scripts/randomSheets/speedDump.ts
 *
 * SPEED_GUIDES=careful places the scan guides where each line stands alone (as the bench's careful view).
 * SPEED_ONLY=efficiency limits the rows to one quantity, SPEED_NOTES=1 adds the guides' flows and
 * the capture notes, SPEED_MONO=1 draws every speed in one colour (as the bench does).
 *
 * Sheets are cached in artifacts/speed-sheets/ (not committed), keyed by seed, kind and options.
 */
import { RENDER_VERSION } from './svg.ts';
import { createHash } from 'node:crypto';
import { existsSync, mkdirSync, readFileSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { imageSheet } from '../../src/digitize/loaders/imageSheet.ts';
import { loadPdfSheetNode } from '../../src/digitize/loaders/pdfNode.ts';
import type { Sheet } from '../../src/digitize/sheet.ts';
import { sheetPoint } from '../../src/digitize/points.ts';
import { replayTakeoff } from '../../src/digitize/takeoff.ts';
import { parseTakeoff } from '../../src/model/takeoff.ts';
import { decode } from './camera.ts';
import { carefulGuides } from './randomSheet.ts';
import { scoreReplay } from './score.ts';
import { drawnRangeAtSpeed, exactAtSpeed, makeSpeedSheet, speedTruthSource, type SpeedSheet, type SpeedSheetOptions } from './speedSheet.ts';

/** Bump when the generator changes, so that cached sheets are drawn again. */
const CACHE_VERSION = 1;
const CACHE = `artifacts/speed-sheets/${RENDER_VERSION}`;

/** The bench's options for a seed (bench/speedSheets.bench.ts). */
export function benchOptions(seed: number, kind: 'vector' | 'scan'): SpeedSheetOptions {
  return { kind, efficiencyAs: seed % 2 ? 'iso' : 'curves', minFlowLine: seed % 3 === 0, ...(process.env.SPEED_MONO === '1' ? { monochrome: true } : {}) };
}

/** The sheet's take-off with each scan trace's guides placed carefully where its line stands alone (vector guides are kept: they snap to the drawn paths). */
export function withCarefulGuides(s: SpeedSheet): SpeedSheet {
  if (s.takeoff.sheet.endsWith('.pdf')) return s;
  const traces = s.takeoff.traces.map((t) => {
    const line = s.plan.lines.find((l) => l.id === t.id);
    const guides = line && t.guides ? carefulGuides(s.plan, line, s.shot) : undefined;
    return guides ? { ...t, guides } : t;
  });
  return { ...s, takeoff: { ...s.takeoff, traces } };
}

/** A speed sheet from the cache, or drawn (and cached) when missing. */
export async function cachedSpeedSheet(seed: number, options: SpeedSheetOptions): Promise<SpeedSheet> {
  const name = `v${CACHE_VERSION}-${seed}-${options.kind}-${options.efficiencyAs ?? 'curves'}-${options.minFlowLine ? 'min' : 'nomin'}${options.monochrome ? '-mono' : ''}`;
  const file = join(CACHE, `${name}.json`);
  if (existsSync(file)) {
    const kept = JSON.parse(readFileSync(file, 'utf8')) as Omit<SpeedSheet, 'bytes'> & { bytes: string };
    return { ...kept, bytes: new Uint8Array(Buffer.from(kept.bytes, 'base64')) };
  }
  const s = await makeSpeedSheet(seed, options);
  mkdirSync(CACHE, { recursive: true });
  writeFileSync(file, JSON.stringify({ ...s, bytes: Buffer.from(s.bytes).toString('base64') }));
  return s;
}

export async function sheetOf(s: SpeedSheet): Promise<Sheet> {
  if (s.takeoff.sheet.endsWith('.pdf')) return loadPdfSheetNode(s.bytes);
  const d = await decode(Buffer.from(s.bytes));
  const raster = { width: d.width, height: d.height, data: d.data, scale: 1 };
  return imageSheet(raster, createHash('sha256').update(s.bytes).digest('hex'), () => raster);
}

const quantile = (values: number[], p: number): number => {
  const s = [...values].sort((a, b) => a - b);
  return s.length ? (s[Math.min(s.length - 1, Math.floor(p * (s.length - 1) + 0.5))] as number) : NaN;
};

async function main(): Promise<void> {
  const count = Number(process.env.SPEED_SHEETS ?? 3);
  const first = Number(process.env.SPEED_SEED ?? 1);
  const kinds = (process.env.SPEED_KIND ?? 'vector,scan').split(',') as ('vector' | 'scan')[];
  const only = process.env.SPEED_ONLY; // e.g. "efficiency"
  for (let seed = first; seed < first + count; seed++) {
    for (const kind of kinds) {
      const drawn = await cachedSpeedSheet(seed, benchOptions(seed, kind));
      const s = process.env.SPEED_GUIDES === 'careful' ? withCarefulGuides(drawn) : drawn;
      const sheet = await sheetOf(s);
      try {
        const result = await replayTakeoff(parseTakeoff(s.takeoff), sheet, { created: '2026-01-01T00:00:00.000Z' });
        const scores = scoreReplay(s.family, s.truth, result.curveSet, speedTruthSource(s.family));
        process.stdout.write(`seed ${seed} ${kind} (${benchOptions(seed, kind).efficiencyAs}) speeds ${s.family.speeds.join('/')}\n`);
        for (const t of result.traces) {
          const line = s.plan.lines.find((l) => l.id === t.id);
          if (!line || line.speed === undefined) continue;
          if (only && line.quantity !== only) continue;
          const cal = result.calibrations.get(line.panel);
          const panel = s.plan.panels.find((p) => p.id === line.panel);
          if (!cal || !panel) continue;
          const span = line.quantity === 'efficiency' ? 100 : panel.y.max - panel.y.min;
          const [a, b] = drawnRangeAtSpeed(s.family, line.quantity, line.speed);
          const data = t.points.map((p) => cal.toData(p) as unknown as [number, number]);
          const inWindow = data.filter(([x]) => x >= a + 0.15 * (b - a) && x <= a + 0.95 * (b - a));
          const errorsAt = (n: number) => inWindow.map(([x, y]) => (100 * Math.abs(y - exactAtSpeed(s.family, line.quantity, n, x))) / span);
          const own = errorsAt(line.speed);
          let closest = line.speed;
          let closestP50 = quantile(own, 0.5);
          for (const n of s.family.speeds) {
            const p50 = quantile(errorsAt(n), 0.5);
            if (p50 < closestP50) [closest, closestP50] = [n, p50];
          }
          const xs = data.map(([x]) => x);
          const score = scores.find((r) => r.id === `${line.quantity}-${line.speed}`);
          const flag = score?.flagged ? ` flags ${score.flags.join(',')}` : '';
          process.stdout.write(
            `  ${t.id.padEnd(18)} ${t.how.padEnd(6)} pts ${String(t.points.length).padStart(3)} x ${Math.min(...xs).toFixed(1)}..${Math.max(...xs).toFixed(1)} of ${a.toFixed(1)}..${b.toFixed(1)}  point max ${Math.max(...own).toFixed(2)} p95 ${quantile(own, 0.95).toFixed(2)}  fit ${score?.error.toFixed(2)}${closest !== line.speed ? `  LIES ON ${closest}` : ''}${flag}\n`,
          );
          if (process.env.SPEED_NOTES) {
            const guides = (s.takeoff.traces.find((u) => u.id === t.id)?.guides ?? []).map((g) => (cal.toData(sheetPoint(g[0], g[1])) as unknown as [number, number])[0]);
            process.stdout.write(`      guides at x ${guides.map((g) => g.toFixed(1)).join(', ')}\n`);
            for (const n of t.notes) process.stdout.write(`      ${n}\n`);
          }
        }
        for (const r of scores.filter((x) => x.source === 'iso')) {
          process.stdout.write(`  ${r.id.padEnd(18)} from iso-lines  fit ${r.error.toFixed(2)}${r.flagged ? ` flags ${r.flags.join(',')}` : ''}\n`);
        }
      } finally {
        await sheet.close();
      }
    }
  }
}

if (import.meta.url === `file://${process.argv[1]}`) await main();
