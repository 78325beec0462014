/**
 * The independent random bed (scripts/randomSheets): INVENTED families drawn as SVG in random
 * styles, taken through a scanner or a hand-held camera, and read back by a take-off as a
 * hurried person makes it. For each quantity it prints p50, p95 and max of the worst error
 * over 15–95 % of each curve's flow range (% of axis span; efficiency in points), the share
 * of curves flagged, wrong (beyond 1 % of span, 1.5 points of efficiency from curves or 2 from iso-lines, or missing) and wrong but not
 * flagged, the figure that matters. Photos also compare the calibration residual shown with
 * the real error at the anchors' panel.
 *
 *   RANDOM_SHEETS=200 RANDOM_SEED=1 npm run bench -- randomSheets
 *
 * Sheets are cached in artifacts/random-sheets/ (not committed), keyed by seed and kind.
 */
import { RENDER_VERSION } from '../scripts/randomSheets/svg.ts';
import { createHash } from 'node:crypto';
import { existsSync, mkdirSync, readFileSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { imageSheet } from '../src/digitize/loaders/imageSheet.ts';
import { replayTakeoff } from '../src/digitize/takeoff.ts';
import { parseTakeoff, type TakeoffInput } from '../src/model/takeoff.ts';
import type { CurveSet } from '../src/model/curveset.ts';
import { decode } from '../scripts/randomSheets/camera.ts';
import { calibrationError, makeRandomSheet, sheetGeometry, withCarefulGuides, type TruthCurve } from '../scripts/randomSheets/randomSheet.ts';
import type { PumpFamily } from '../scripts/randomSheets/pumpFamily.ts';
import { scoreReplay, type CurveScore } from '../scripts/randomSheets/score.ts';

/** Bump when the generator changes, so that cached sheets are drawn again. */
const GENERATOR = RENDER_VERSION;
const CACHE = join(import.meta.dirname, '..', 'artifacts', 'random-sheets', GENERATOR);

interface Cached {
  takeoff: unknown;
  truth: TruthCurve[];
  family: PumpFamily;
  shot: { kind: 'scan' | 'photo'; dpi: number; keystone: number; rotationDeg: number; quality: number; efficiencyAs: string };
}

/** Exported for scripts/randomSheets/traceDump.ts (isocal). */
export async function sheetFor(seed: number, kind: 'scan' | 'photo'): Promise<{ jpeg: Buffer; meta: Cached }> {
  const base = join(CACHE, `${seed}-${kind}`);
  if (existsSync(`${base}.json`) && existsSync(`${base}.jpg`)) return { jpeg: readFileSync(`${base}.jpg`), meta: JSON.parse(readFileSync(`${base}.json`, 'utf8')) as Cached };
  const s = await makeRandomSheet(seed, kind);
  const meta: Cached = {
    takeoff: s.takeoff,
    truth: s.truth,
    family: s.plan.family,
    shot: { kind, dpi: s.plan.dpi, keystone: s.shot.keystone, rotationDeg: s.shot.rotationDeg, quality: s.shot.quality, efficiencyAs: s.plan.efficiencyAs },
  };
  mkdirSync(CACHE, { recursive: true });
  writeFileSync(`${base}.jpg`, s.jpeg);
  writeFileSync(`${base}.json`, JSON.stringify(meta));
  return { jpeg: s.jpeg, meta };
}

function quantile(values: number[], p: number): number {
  if (values.length === 0) return Number.NaN;
  // Missing curves (Infinity) sort last; a comparator must not return NaN for Infinity − Infinity.
  const s = values.map((v) => (Number.isFinite(v) ? v : Number.MAX_VALUE)).sort((a, b) => a - b);
  return s[Math.min(s.length - 1, Math.floor(p * (s.length - 1) + 0.5))] as number;
}

const fmt = (v: number) => (Number.isFinite(v) && v < Number.MAX_VALUE ? v.toFixed(v < 10 ? 3 : 1) : 'missing');
const pct = (a: number, b: number) => (b > 0 ? `${((100 * a) / b).toFixed(1)} %` : '–');

export interface Residual {
  seed: number;
  kind: 'scan' | 'photo';
  projection: string;
  shown: number;
  real: number;
}

/** Calibration residual shown against the real calibration error, per kind of sheet. */
export function residualReport(residuals: readonly Residual[]): string {
  const lines: string[] = [];
  for (const kind of ['scan', 'photo'] as const) {
    const list = residuals.filter((r) => r.kind === kind);
    if (list.length === 0) continue;
    const real = list.map((r) => r.real);
    const within = list.filter((r) => r.shown > 0 && r.shown / r.real <= 3 && r.real / r.shown <= 3).length;
    const projective = list.filter((r) => r.projection === 'projective').length;
    lines.push(`${kind} calibrations: ${list.length} panels, ${pct(projective, list.length)} projective; real error p50 ${fmt(quantile(real, 0.5))} p95 ${fmt(quantile(real, 0.95))} max ${fmt(Math.max(...real))} % of span; shown residual within 3x of the real error: ${pct(within, list.length)}; shown 0 %: ${list.filter((r) => r.shown === 0).length}`);
  }
  return lines.join('\n');
}

export interface BedRow extends CurveScore {
  seed: number;
  kind: 'scan' | 'photo';
  /** How the curve's first trace is drawn (for RANDOM_DUMP): dash, width in flat pixels, dpi, colour, and whether its panel's lines bunch. */
  style?: { dash: string; width: number; dpi: number; mono: boolean; efficiencyAs: string };
}

export async function runBed(count: number, firstSeed: number, log = true): Promise<{ rows: BedRow[]; residuals: Residual[]; times: number[] }> {
  const rows: BedRow[] = [];
  const residuals: Residual[] = [];
  const times: number[] = [];
  // RANDOM_GUIDES=careful: every guide where its line stands alone (the person did their part).
  const careful = process.env.RANDOM_GUIDES === 'careful';
  for (let i = 0; i < count; i++) {
    const seed = firstSeed + i;
    const kind = seed % 3 === 2 ? 'photo' : 'scan';
    const { jpeg, meta } = await sheetFor(seed, kind);
    const decoded = await decode(jpeg);
    const raster = { width: decoded.width, height: decoded.height, data: decoded.data, scale: 1 };
    const sheet = imageSheet(raster, createHash('sha256').update(jpeg).digest('hex'), () => raster);
    let set: CurveSet | { refused: string };
    const t0 = performance.now();
    try {
      const replay = await replayTakeoff(parseTakeoff(careful ? withCarefulGuides(meta.takeoff as TakeoffInput, seed, kind) : meta.takeoff), sheet);
      set = replay.curveSet;
      // What the screen shows for the calibration, against the real error of the calibration alone.
      const geometry = sheetGeometry(seed, kind);
      for (const [id, cal] of replay.calibrations) residuals.push({ seed, kind, projection: cal.projection, shown: cal.maxPercentOfSpan, real: calibrationError(geometry.plan, geometry.shot, id, (p) => cal.toData(p as never)) });
    } catch (error) {
      set = { refused: error instanceof Error ? error.message : String(error) };
    }
    times.push(performance.now() - t0);
    // RANDOM_SETS=dir keeps each replayed curve set (seed.json), for studying findings against the scores offline.
    if (process.env.RANDOM_SETS) writeFileSync(join(process.env.RANDOM_SETS, `${seed}.json`), JSON.stringify(set));
    const scores = scoreReplay(meta.family, meta.truth, set);
    const plan = sheetGeometry(seed, kind).plan;
    meta.truth.forEach((curve, k) => {
      const line = plan.lines.find((l) => l.id === curve.traces[0]);
      const style = line ? { dash: line.style.dash, width: Number(line.style.width.toFixed(2)), dpi: plan.dpi, mono: line.style.colour === '#111111', efficiencyAs: plan.efficiencyAs } : undefined;
      rows.push({ ...(scores[k] as CurveScore), seed, kind, ...(style ? { style } : {}) });
    });
    if (log && (i + 1) % 20 === 0) process.stdout.write(`  ${i + 1}/${count} sheets\n`);
  }
  return { rows, residuals, times };
}

export function report(rows: BedRow[]): string {
  const lines: string[] = [];
  const groups = new Map<string, BedRow[]>();
  for (const r of rows) {
    const key = `${r.kind} ${r.quantity}${r.quantity === 'efficiency' ? ` (${r.source})` : ''}`;
    groups.set(key, [...(groups.get(key) ?? []), r]);
  }
  lines.push('group                      curves   p50      p95      max      flagged  wrong    wrong+unflagged');
  for (const [key, list] of [...groups.entries()].sort()) {
    const errors = list.map((r) => r.error);
    const unit = key.includes('efficiency') ? 'pt' : '%';
    lines.push(
      `${key.padEnd(26)} ${String(list.length).padStart(6)}   ${fmt(quantile(errors, 0.5)).padEnd(8)} ${fmt(quantile(errors, 0.95)).padEnd(8)} ${fmt(Math.max(...errors)).padEnd(8)} ${pct(list.filter((r) => r.flagged).length, list.length).padEnd(8)} ${pct(list.filter((r) => r.wrong).length, list.length).padEnd(8)} ${pct(list.filter((r) => r.wrong && !r.flagged).length, list.length)}  [${unit}]`,
    );
  }
  const wu = rows.filter((r) => r.wrong && !r.flagged);
  lines.push(`all curves: ${rows.length}; flagged ${pct(rows.filter((r) => r.flagged).length, rows.length)}; wrong ${pct(rows.filter((r) => r.wrong).length, rows.length)}; WRONG AND UNFLAGGED ${pct(wu.length, rows.length)} (${wu.length})`);
  const worst = [...wu].sort((a, b) => b.error - a.error).slice(0, 12);
  if (worst.length) lines.push(`worst wrong-and-unflagged: ${worst.map((r) => `${r.seed}/${r.kind} ${r.id} ${fmt(r.error)}`).join('; ')}`);
  return lines.join('\n');
}

export default async function main(): Promise<void> {
  const count = Number(process.env.RANDOM_SHEETS ?? 30);
  const first = Number(process.env.RANDOM_SEED ?? 1);
  process.stdout.write(`Random sheet bed: ${count} sheets from seed ${first} (every third a photo with keystone), generator ${GENERATOR}\n`);
  const { rows, times, residuals } = await runBed(count, first);
  process.stdout.write(`${report(rows)}\n${residualReport(residuals)}\n`);
  process.stdout.write(`replay time per sheet: p50 ${quantile(times, 0.5).toFixed(0)} ms, max ${Math.max(...times).toFixed(0)} ms\n`);
  if (process.env.RANDOM_DUMP) writeFileSync(process.env.RANDOM_DUMP, JSON.stringify({ rows, residuals, times }));
}
