/**
 * The automatic take-off on scans of the independent random bed (scripts/randomSheets, scanner
 * kind: turned up to 2°, blurred, unevenly lit, noised, JPEG): panels found from the ink and
 * the tick labels read by tesseract.js, scored against the plan. The hurried engineer's traces
 * (guides) of the bed are kept, the bed's panels are not given, so the replay rests on the
 * detected calibrations alone; its curves are scored with the bed's own scorer.
 *
 *   DETECT_SCANS=20 DETECT_SEED=1 npx tsx scripts/detectSheets/scanBed.ts
 *   DETECT_KIND=photo DETECT_SCANS=10 npx tsx scripts/detectSheets/scanBed.ts   (hand-held photos: the page squared from its own lines, keystone.ts)
 *
 * Per sheet: panels found (right quantity) of those drawn, the real calibration error of each
 * found panel (% of span over a 9 × 9 grid, calibrationError of the bed), questions, the
 * detection time (reader already started), and the worst curve error of the replay.
 * "Wrong without a question": a panel missing or mis-named, or calibrated worse than 0.5 % of
 * span, on a sheet where the detector asked nothing. JPEGs are cached in artifacts/detect-sheets/.
 *
 * Curves: each scan is also taken off with no panels and no traces given; when the detector asks
 * for the diameters (labels missing or not read), the plan's diameters are given once and the
 * run repeated. Each drawn curve (not iso-lines) is scored with the bed's scorer at 15–95 % of
 * its flow range: within 0.5 % of span (1.5 points of efficiency; on photos 1 % and 2 points,
 * the photo acceptance), missed, invented or
 * mislabelled; "WRONG WITHOUT A FLAG" is a curve beyond tolerance (or invented, mislabelled,
 * missed on a sheet that asked nothing) with no finding of the replay, a confidence of 0.5 or
 * more, and no question. DETECT_GUIDES=1 also replays the bed's own guides on the found panels.
 */
import { existsSync, mkdirSync, readFileSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { detectTakeoff } from '../../src/digitize/detect/detect.ts';
import { loadImageSheetNode } from '../../src/digitize/loaders/imageNode.ts';
import { closeTextReaderNode, textReaderNode } from '../../src/digitize/loaders/ocrNode.ts';
import { replayTakeoff } from '../../src/digitize/takeoff.ts';
import { calibratePanels } from '../../src/digitize/calibration.ts';
import { parseTakeoff, parseTakeoffToDetect, type TakeoffInput } from '../../src/model/takeoff.ts';
import { calibrationError, sheetGeometry, truthOf } from '../randomSheets/randomSheet.ts';
import { makeRandomSheetApart } from '../randomSheets/sheetApart.ts';
import type { SheetPlan } from '../randomSheets/plan.ts';
import type { TruthCurve } from '../randomSheets/randomSheet.ts';
import { exact, siFactor } from '../randomSheets/pumpFamily.ts';
import type { CurveSet } from '../../src/model/curveset.ts';
import { scoreReplay } from '../randomSheets/score.ts';
import { RENDER_VERSION } from '../randomSheets/svg.ts';

/** Where the rendered scans are kept; DETECT_CACHE=DIR reads and writes another folder (sheets rendered with other fonts, say). */
const CACHE = process.env.DETECT_CACHE ?? join(import.meta.dirname, '..', '..', 'artifacts', 'detect-sheets', `scan-${RENDER_VERSION}`);

/** The acceptance tolerance on scans: 0.5 % of axis span. */
export const SCAN_ACCEPT_PERCENT = 0.5;

export interface ScanOutcome {
  seed: number;
  dpi: number;
  turnDeg: number;
  panels: { expected: number; found: number };
  /** Real calibration error of each found panel, % of span, by quantity. */
  calibration: Record<string, number>;
  /** The residual the take-off shows for each found panel (its calibration recomputed from the saved anchors), % of span, by quantity. */
  shown: Record<string, number>;
  questions: string[];
  detectMs: number;
  /** Worst error of the replayed curves (the engineer's guides on the detected calibrations), % of span or points. */
  worstCurve: number;
  /** The same with the bed's own hand-placed panels: what the tracer does alone, for comparison. */
  worstGiven: number;
  wrong: string[];
  error?: string;
  /** Curves found on the scan (no traces given), scored against the truth at 15–95 % of each curve's flow range. */
  curves: CurveOutcome;
}

export interface CurveOutcome {
  /** Drawn curves (not iso-lines) of the plan, and how many came back within tolerance. */
  drawn: number;
  right: number;
  /** Error of each found curve, % of span (head, power, NPSHr) or points (efficiency). */
  errors: { id: string; quantity: string; error: number; flagged: boolean; confidence: number; flags: string[] }[];
  invented: number;
  missed: number;
  /** Found with a value that is not the drawn one: a diameter not drawn, or a curve beyond tolerance that fits another diameter's truth (a swapped name). */
  mislabelled: number;
  /** Drawn, found and within tolerance, by quantity. */
  byQuantity: Record<string, { drawn: number; found: number; right: number }>;
  /** Wrong (beyond tolerance, a wrong name, invented) with neither a finding of the replay, a confidence under 0.5, nor a question. */
  silent: string[];
  /** The iso levels were given in the take-off: the detector asked for them (iso-lines left without a level), and the engineer answered once. */
  gaveLevels?: boolean;
  /** The diameters were given in the take-off: the detector asked for them (labels missing or not read), and the engineer answered once. */
  gaveDiameters: boolean;
  /** Head curves named from the labels read on the scan. */
  namedByLabels: number;
  /** Efficiency from iso-lines, per diameter (sheets that draw iso-lines): drawn, found (an efficiency curve came back), within tolerance, and each error in points. */
  iso: { drawn: number; found: number; right: number; errors: number[] };
  questions: string[];
  error?: string;
}

export async function scanFor(seed: number, kind: 'scan' | 'photo' = 'scan'): Promise<{ jpeg: Uint8Array; takeoff: TakeoffInput }> {
  const name = kind === 'scan' ? `${seed}` : `${seed}-photo`;
  const file = join(CACHE, `${name}.jpg`);
  const meta = join(CACHE, `${name}.takeoff.json`);
  if (existsSync(file) && existsSync(meta)) return { jpeg: new Uint8Array(readFileSync(file)), takeoff: JSON.parse(readFileSync(meta, 'utf8')) as TakeoffInput };
  // Drawn in a child process (sheetApart.ts): a rare native crash while drawing is run again
  // instead of ending the process that asked, a browser test's among them.
  const s = makeRandomSheetApart(seed, kind);
  mkdirSync(CACHE, { recursive: true });
  writeFileSync(file, s.jpeg);
  writeFileSync(meta, JSON.stringify(s.takeoff));
  return { jpeg: new Uint8Array(s.jpeg), takeoff: s.takeoff };
}

export async function runScan(seed: number, kind: 'scan' | 'photo' = 'scan'): Promise<ScanOutcome> {
  const { plan, shot } = sheetGeometry(seed, kind);
  const { jpeg, takeoff } = await scanFor(seed, kind);
  const out: ScanOutcome = { seed, dpi: plan.dpi, turnDeg: shot.rotationDeg, panels: { expected: plan.panels.length, found: 0 }, calibration: {}, shown: {}, questions: [], detectMs: NaN, worstCurve: Infinity, worstGiven: Infinity, wrong: [], curves: emptyCurves(plan) };
  const sheet = await loadImageSheetNode(jpeg, { name: `${seed}.jpg` });
  try {
    // The engineer's traces, without the panels: the panels must come from the detector.
    const raw: Record<string, unknown> = { ...takeoff, sheet: `${seed}.jpg` };
    delete raw.panels;
    const t0 = performance.now();
    const found = await detectTakeoff(parseTakeoffToDetect(raw), raw, sheet, { reader: textReaderNode() });
    out.detectMs = performance.now() - t0;
    out.questions = found.questions;
    const shownCal = calibratePanels(found.takeoff.panels).calibrations;
    for (const p of plan.panels) {
      const d = found.detection.panels.find((k) => k.quantity === p.quantity);
      if (!d) {
        out.wrong.push(`panel ${p.id} not found`);
        continue;
      }
      out.panels.found++;
      const err = calibrationError(plan, shot, p.id, (q) => d.proposal.calibration.toData(q as never) as unknown as readonly [number, number]);
      out.calibration[p.id] = err;
      const saved = found.takeoff.panels.find((k) => k.origin === 'detected' && k.quantity === p.quantity);
      const shown = saved ? shownCal.get(saved.id)?.maxPercentOfSpan : undefined;
      if (shown !== undefined) out.shown[p.id] = shown;
      if (!(err <= SCAN_ACCEPT_PERCENT)) out.wrong.push(`panel ${p.id} calibrated ${err.toFixed(2)} % of span off`);
    }
    for (const d of found.detection.panels) if (d.quantity && !plan.panels.some((p) => p.quantity === d.quantity)) out.wrong.push(`panel ${d.id} invented`);
    const worst = async (t: Parameters<typeof replayTakeoff>[0]) => {
      const replay = await replayTakeoff(t, sheet, { created: '2026-01-01T00:00:00.000Z' });
      return Math.max(0, ...scoreReplay(plan.family, truthOf(plan), replay.curveSet).map((s) => s.error));
    };
    if (process.env.DETECT_GUIDES) {
      out.worstCurve = await worst(found.takeoff);
      out.worstGiven = await worst(parseTakeoff({ ...takeoff, sheet: `${seed}.jpg` }));
    }
    out.curves = await scoreFoundCurves(seed, plan, takeoff, sheet, kind);
  } catch (error) {
    out.error = error instanceof Error ? error.message : String(error);
  } finally {
    await sheet.close();
  }
  return out;
}

function emptyCurves(plan: SheetPlan): CurveOutcome {
  return { drawn: plan.lines.filter((l) => l.iso === undefined).length, right: 0, errors: [], invented: 0, missed: 0, mislabelled: 0, byQuantity: {}, silent: [], gaveDiameters: false, namedByLabels: 0, iso: { drawn: 0, found: 0, right: 0, errors: [] }, questions: [] };
}

/** Tolerances of the acceptance on scans: 0.5 % of span, 1.5 points of efficiency from curves, 2 points from iso-lines. */
export const SCAN_CURVE_PERCENT = 0.5;
export const SCAN_ISO_POINTS = 2;
export const SCAN_EFFICIENCY_POINTS = 1.5;

/** The tolerances a kind of sheet is held to: a scan's above; a hand-held photo's those of its own acceptance, 1 % of span and 2 points of efficiency. */
export function curveTolerance(kind: 'scan' | 'photo'): { percent: number; points: number; isoPoints: number } {
  return kind === 'scan' ? { percent: SCAN_CURVE_PERCENT, points: SCAN_EFFICIENCY_POINTS, isoPoints: SCAN_ISO_POINTS } : { percent: 1, points: 2, isoPoints: 2 };
}

/**
 * The take-off with no panels and no traces: the detector finds both. When it asks for the
 * diameters (labels missing or not read), or for the iso levels (lines left without one), the
 * engineer answers once, in the take-off file: the run is repeated with the plan's diameters,
 * or every level it draws as iso-lines, given. Each list asked for counts as one question.
 */
async function scoreFoundCurves(seed: number, plan: SheetPlan, takeoff: TakeoffInput, sheet: Awaited<ReturnType<typeof loadImageSheetNode>>, kind: 'scan' | 'photo'): Promise<CurveOutcome> {
  const out = emptyCurves(plan);
  const tol = curveTolerance(kind);
  const raw: Record<string, unknown> = { ...takeoff, sheet: `${seed}.jpg` };
  delete raw.panels;
  delete raw.traces;
  const truth = truthOf(plan).filter((t) => t.source === 'curve');
  const isoTruth = truthOf(plan).filter((t) => t.source === 'iso');
  out.drawn = truth.length;
  out.iso.drawn = isoTruth.length;
  const askedForValues = (text: string) => /give the diameters \(or speeds\) drawn/.test(text);
  const askedForLevels = (text: string) => /"iso_levels"/.test(text);
  const run = () => detectTakeoff(parseTakeoffToDetect(raw), raw, sheet, { reader: textReaderNode() });
  let found;
  let first: string[] = [];
  try {
    found = await run();
    first = found.questions;
  } catch (error) {
    const message = error instanceof Error ? error.message : String(error);
    if (!askedForValues(message) && !askedForLevels(message)) {
      out.error = message;
      out.missed = truth.length;
      return out;
    }
    first = [message];
  }
  const levels = [...new Set(plan.lines.flatMap((l) => (l.iso === undefined ? [] : [l.iso])))];
  const askLevels = levels.length > 0 && first.some(askedForLevels);
  if (!found || first.some(askedForValues) || askLevels) {
    if (first.some(askedForValues)) {
      raw.diameters = [...plan.family.diameters];
      out.gaveDiameters = true;
    }
    if (askLevels) {
      raw.iso_levels = levels;
      out.gaveLevels = true;
    }
    try {
      found = await run();
    } catch (error) {
      out.error = error instanceof Error ? error.message : String(error);
      out.missed = truth.length;
      out.questions = first;
      return out;
    }
  }
  // The questions of the sheet: those answered (the diameters, the iso levels), then what the second run still asks.
  out.questions = [...(out.gaveDiameters ? ['give the diameters drawn'] : []), ...(out.gaveLevels ? ['give the iso levels drawn'] : []), ...found.questions];
  out.namedByLabels = found.takeoff.traces.filter((t) => t.origin === 'detected' && t.quantity === 'head').length * (out.gaveDiameters ? 0 : 1);
  const detected = found.takeoff.traces.filter((t) => t.origin === 'detected');
  const replay = await replayTakeoff(found.takeoff, sheet, { created: '2026-01-01T00:00:00.000Z' });
  const scores = scoreReplay(plan.family, truth, replay.curveSet);
  const asked = found.questions.length > 0;
  for (const t of truth) {
    const trace = detected.find((d) => d.quantity === t.quantity && d.diameter === t.diameter);
    const s = scores.find((k) => k.id === `${t.quantity}-${t.diameter}`);
    if (!trace || !s) {
      out.missed++;
      if (!asked) out.silent.push(`${t.quantity}-${t.diameter} missed`);
      continue;
    }
    const limit = t.quantity === 'efficiency' ? tol.points : tol.percent;
    const confidence = trace.confidence ?? 1;
    out.errors.push({ id: s.id, quantity: t.quantity, error: s.error, flagged: s.flagged, confidence, flags: [...new Set(s.flags)] });
    if (s.error <= limit) out.right++;
    else {
      // Beyond tolerance: a swapped name when the curve fits another diameter's truth.
      const other = truth.find((o) => o !== t && o.quantity === t.quantity && fitsOther(plan, replay.curveSet, t, o, limit));
      if (other) out.mislabelled++;
      if (!s.flagged && confidence >= 0.5) out.silent.push(`${s.id} ${s.error.toFixed(2)} off${other ? ` (it is ${other.quantity}-${other.diameter})` : ''}`);
    }
  }
  for (const t of truth) {
    const k = (out.byQuantity[t.quantity] = out.byQuantity[t.quantity] ?? { drawn: 0, found: 0, right: 0 });
    k.drawn++;
    const e = out.errors.find((x) => x.id === `${t.quantity}-${t.diameter}`);
    if (e) {
      k.found++;
      if (e.error <= (t.quantity === 'efficiency' ? tol.points : tol.percent)) k.right++;
    }
  }
  // Efficiency from the iso-lines, per diameter, within 2 points (the acceptance on scans).
  const isoTraces = detected.filter((d) => d.iso !== undefined);
  for (const s of scoreReplay(plan.family, isoTruth, replay.curveSet)) {
    if (!Number.isFinite(s.error)) continue;
    out.iso.found++;
    out.iso.errors.push(s.error);
    if (s.error <= tol.isoPoints) out.iso.right++;
    else if (!s.flagged && !asked && isoTraces.every((d) => (d.confidence ?? 1) >= 0.5)) out.silent.push(`${s.id} from iso-lines ${s.error.toFixed(2)} points off`);
  }
  for (const d of detected) {
    if (d.iso !== undefined) continue;
    if (truth.some((t) => t.quantity === d.quantity && t.diameter === d.diameter)) continue;
    if (plan.family.diameters.includes(d.diameter as number)) out.invented++;
    else out.mislabelled++;
    if ((d.confidence ?? 1) >= 0.5) out.silent.push(`${d.id} ${plan.family.diameters.includes(d.diameter as number) ? 'invented' : 'mislabelled'}`);
  }
  return out;
}

/** True when the found curve `t` (its member's fit) lies within `limit` of the exact curve of `o` over o's range. */
function fitsOther(plan: SheetPlan, set: CurveSet | { refused: string }, t: TruthCurve, o: TruthCurve, limit: number): boolean {
  const si = siFactor(plan.family);
  const [score] = scoreReplay(plan.family, [{ ...o, diameter: t.diameter }], set, {
    member: (s) => s.members.find((m) => m.diameter_m !== undefined && Math.abs(m.diameter_m - t.diameter * si.diameter) < 1e-9),
    value: (_c, flow) => exact(plan.family, o.quantity, o.diameter, flow),
  });
  return score !== undefined && score.error <= limit;
}

const q = (values: number[], p: number) => {
  const s = [...values].sort((a, b) => a - b);
  return s.length ? (s[Math.min(s.length - 1, Math.floor(p * s.length))] as number) : NaN;
};

/**
 * The automatic take-off of bed scan `seed` with no panels and no traces, the plan's diameters
 * given (as the engineer answers once), and `changes` laid over the take-off (other units, say).
 */
export async function detectBedScan(seed: number, changes: Record<string, unknown> = {}): Promise<{ plan: SheetPlan; sheet: Awaited<ReturnType<typeof loadImageSheetNode>>; found: Awaited<ReturnType<typeof detectTakeoff>> }> {
  const { plan } = sheetGeometry(seed, 'scan');
  const { jpeg, takeoff } = await scanFor(seed);
  const sheet = await loadImageSheetNode(jpeg, { name: `${seed}.jpg` });
  const raw: Record<string, unknown> = { ...takeoff, sheet: `${seed}.jpg`, diameters: [...plan.family.diameters], ...changes };
  delete raw.panels;
  delete raw.traces;
  const found = await detectTakeoff(parseTakeoffToDetect(raw), raw, sheet, { reader: textReaderNode() });
  return { plan, sheet, found };
}

async function main(): Promise<void> {
  const count = Number(process.env.DETECT_SCANS ?? 10);
  const first = Number(process.env.DETECT_SEED ?? 1);
  const kind = process.env.DETECT_KIND === 'photo' ? 'photo' : 'scan';
  const t0 = performance.now();
  await textReaderNode().read({ width: 8, height: 8, grey: new Uint8Array(64).fill(255) }, 'digits');
  process.stdout.write(`reader start: ${(performance.now() - t0).toFixed(0)} ms (once per process)\n`);
  const outcomes: ScanOutcome[] = [];
  for (let seed = first; seed < first + count; seed++) {
    const o = await runScan(seed, kind);
    outcomes.push(o);
    const cal = Object.entries(o.calibration).map(([k, v]) => `${k} ${v.toFixed(3)}${o.shown[k] !== undefined ? ` (shown ${(o.shown[k] as number).toFixed(3)})` : ""}`).join(", ");
    process.stdout.write(`${String(seed).padStart(4)} ${o.dpi} dpi turn ${o.turnDeg.toFixed(2)}° panels ${o.panels.found}/${o.panels.expected} calibration % of span: ${cal || '-'}; questions ${o.questions.length}; curves from the bed's guides, worst: on found panels ${Number.isFinite(o.worstCurve) ? o.worstCurve.toFixed(2) : 'missing'}, on the bed's panels ${Number.isFinite(o.worstGiven) ? o.worstGiven.toFixed(2) : 'missing'}; ${o.detectMs.toFixed(0)} ms${o.error ? `; refused: ${o.error}` : ''}\n`);
    const c = o.curves;
    process.stdout.write(`       curves found: ${c.right}/${c.drawn} within tolerance${c.iso.drawn ? `, iso efficiency ${c.iso.right}/${c.iso.drawn} (found ${c.iso.found}${c.iso.errors.length ? `, worst ${Math.max(...c.iso.errors).toFixed(2)} points` : ''})` : ''}, worst ${c.errors.length ? Math.max(...c.errors.map((e) => e.error)).toFixed(2) : '-'}; missed ${c.missed}, invented ${c.invented}, mislabelled ${c.mislabelled}; questions ${c.questions.length}${c.gaveDiameters ? ' (asked for the diameters, given)' : ` (${c.namedByLabels} head curves named from labels)`}${c.silent.length ? `; WRONG WITHOUT A FLAG: ${c.silent.join(', ')}` : ''}${c.error ? `; refused: ${c.error.slice(0, 160)}` : ''}\n`);
    if (process.env.DETECT_VERBOSE) for (const k of [...o.wrong, ...o.questions.map((x) => `? ${x}`), ...c.errors.map((e) => `  ${e.id} ${e.error.toFixed(2)}${e.flagged ? ` flagged (${e.flags.join(', ')})` : ''} conf ${e.confidence}`), ...c.questions.map((x) => `?c ${x}`)]) process.stdout.write(`      ${k}\n`);
  }
  await closeTextReaderNode();
  const expected = outcomes.reduce((n, o) => n + o.panels.expected, 0);
  const found = outcomes.reduce((n, o) => n + o.panels.found, 0);
  const errors = outcomes.flatMap((o) => Object.values(o.calibration));
  const ms = outcomes.map((o) => o.detectMs).filter(Number.isFinite);
  const silent = outcomes.filter((o) => o.wrong.length > 0 && o.questions.length === 0 && !o.error);
  process.stdout.write(`\npanels found with the right quantity: ${found} of ${expected} (${((100 * found) / Math.max(1, expected)).toFixed(0)} %)\n`);
  process.stdout.write(`calibration error of found panels, % of span: p50 ${q(errors, 0.5).toFixed(3)} p95 ${q(errors, 0.95).toFixed(3)} max ${Math.max(...errors).toFixed(3)}; within ${SCAN_ACCEPT_PERCENT} %: ${errors.filter((e) => e <= SCAN_ACCEPT_PERCENT).length} of ${errors.length}\n`);
  const pairs = outcomes.flatMap((o) => Object.entries(o.calibration).flatMap(([k, real]) => (o.shown[k] !== undefined ? [{ real, shown: o.shown[k] as number }] : [])));
  const ratios = pairs.map((p) => p.real / Math.max(p.shown, 1e-9));
  process.stdout.write(`residual shown against the real error (${pairs.length} panels): shown p50 ${q(pairs.map((p) => p.shown), 0.5).toFixed(3)} p95 ${q(pairs.map((p) => p.shown), 0.95).toFixed(3)} max ${Math.max(...pairs.map((p) => p.shown)).toFixed(3)} % of span; within 3x of the real error ${pairs.filter((p) => p.shown <= 3 * p.real && p.real <= 3 * p.shown).length}; real more than 3x the shown ${ratios.filter((r) => r > 3).length}; shown more than 3x the real ${ratios.filter((r) => r < 1 / 3).length}; shown over ${0.3} %: ${pairs.filter((p) => p.shown > 0.3).length}\n`);
  process.stdout.write(`questions per sheet: ${outcomes.map((o) => o.questions.length).join(' ')}; sheets with at most one: ${outcomes.filter((o) => o.questions.length <= 1).length} of ${outcomes.length}\n`);
  process.stdout.write(`sheets fully right (every panel found, named and within ${SCAN_ACCEPT_PERCENT} %): ${outcomes.filter((o) => o.wrong.length === 0 && !o.error).length} of ${outcomes.length}; refused: ${outcomes.filter((o) => o.error).length}\n`);
  process.stdout.write(`wrong without a question: ${silent.length}${silent.length ? ` (seeds ${silent.map((o) => o.seed).join(', ')})` : ''}\n`);
  process.stdout.write(`detection time per sheet (decoded image to take-off, reader started): p50 ${q(ms, 0.5).toFixed(0)} ms, max ${Math.max(...ms).toFixed(0)} ms\n`);
  const cs = outcomes.map((o) => o.curves);
  const byKind = (f: (e: CurveOutcome['errors'][number]) => boolean) => cs.flatMap((c) => c.errors.filter(f).map((e) => e.error));
  const spanErrors = byKind((e) => e.quantity !== 'efficiency');
  const points = byKind((e) => e.quantity === 'efficiency');
  const sum = (f: (c: CurveOutcome) => number) => cs.reduce((n, c) => n + f(c), 0);
  process.stdout.write(`\ncurves found on the scans (no panels, no traces given): ${sum((c) => c.right)} of ${sum((c) => c.drawn)} drawn curves within ${curveTolerance(kind).percent} % of span / ${curveTolerance(kind).points} points; found ${sum((c) => c.errors.length)}\n`);
  process.stdout.write(`  error, % of span (head, power, NPSHr): p50 ${q(spanErrors, 0.5).toFixed(3)} p95 ${q(spanErrors, 0.95).toFixed(3)} max ${spanErrors.length ? Math.max(...spanErrors).toFixed(3) : '-'} (${spanErrors.length} curves)\n`);
  process.stdout.write(`  efficiency curves, points: p50 ${q(points, 0.5).toFixed(2)} p95 ${q(points, 0.95).toFixed(2)} max ${points.length ? Math.max(...points).toFixed(2) : '-'} (${points.length} curves)\n`);
  const isoErrors = cs.flatMap((c) => c.iso.errors);
  process.stdout.write(`  efficiency from iso-lines, per diameter: drawn ${sum((c) => c.iso.drawn)} (on ${cs.filter((c) => c.iso.drawn > 0).length} sheets), found ${sum((c) => c.iso.found)}, within ${curveTolerance(kind).isoPoints} points ${sum((c) => c.iso.right)}; points p50 ${q(isoErrors, 0.5).toFixed(2)} p95 ${q(isoErrors, 0.95).toFixed(2)} max ${isoErrors.length ? Math.max(...isoErrors).toFixed(2) : '-'}\n`);
  process.stdout.write(`  missed ${sum((c) => c.missed)}, invented ${sum((c) => c.invented)}, mislabelled ${sum((c) => c.mislabelled)}; refused sheets ${cs.filter((c) => c.error).length}; head curves named from labels read: ${sum((c) => c.namedByLabels)}; sheets where the detector asked for the diameters and got them: ${cs.filter((c) => c.gaveDiameters).length} (of ${cs.length}); for the iso levels: ${cs.filter((c) => c.gaveLevels).length}\n`);
  process.stdout.write(`  questions per sheet: ${cs.map((c) => c.questions.length).join(' ')}; sheets with at most one: ${cs.filter((c) => c.questions.length <= 1).length} of ${cs.length}\n`);
  // The automatic take-off's acceptance speaks of 200–300-dpi scans: the same figures for those alone.
  const fine = outcomes.filter((o) => o.dpi >= 200).map((o) => o.curves);
  const fineSum = (f: (c: CurveOutcome) => number) => fine.reduce((n, c) => n + f(c), 0);
  process.stdout.write(`  of which 200–300 dpi (${fine.length} sheets): ${fineSum((c) => c.right)} of ${fineSum((c) => c.drawn)} curves within tolerance, missed ${fineSum((c) => c.missed)}, iso efficiency within ${curveTolerance(kind).isoPoints} points ${fineSum((c) => c.iso.right)} of ${fineSum((c) => c.iso.drawn)}; sheets with at most one question ${fine.filter((c) => c.questions.length <= 1).length}; asked for the diameters ${fine.filter((c) => c.gaveDiameters).length}\n`);
  for (const quantity of ['head', 'efficiency', 'power', 'npshr']) {
    const k = cs.map((c) => c.byQuantity[quantity] ?? { drawn: 0, found: 0, right: 0 });
    const n = (f: (x: { drawn: number; found: number; right: number }) => number) => k.reduce((a, x) => a + f(x), 0);
    process.stdout.write(`  ${quantity} (sheets not refused): drawn ${n((x) => x.drawn)}, found ${n((x) => x.found)}, within tolerance ${n((x) => x.right)}\n`);
  }
  process.stdout.write(`  WRONG WITHOUT A FLAG: ${sum((c) => c.silent.length)}${cs.some((c) => c.silent.length) ? ` (${outcomes.filter((o) => o.curves.silent.length).map((o) => `${o.seed}: ${o.curves.silent.join(', ')}`).join('; ')})` : ''}\n`);
  const replayed = outcomes.filter((o) => !o.error);
  const same = replayed.filter((o) => o.worstCurve === o.worstGiven || Math.abs(o.worstCurve - o.worstGiven) <= 0.1);
  process.stdout.write(`replayed curves from the bed's guides: worst per sheet on found panels within 0.1 (% of span or points) of the same guides on the bed's own panels: ${same.length} of ${replayed.length} replayed (the curve errors are the tracer's, see randomSheets)\n`);
}

if (process.argv[1] && import.meta.url.endsWith(process.argv[1].split('/').pop() as string)) await main();
