/**
 * The automatic take-off on vector sheets of the independent random bed: each sheet printed
 * by Chromium to a PDF (vectorSheet.ts), read by `detectTakeoff` from a minimal take-off, replayed,
 * and scored against the exact truth (scripts/randomSheets/score.ts) at 15–95 % of each
 * curve's flow range, plus what was found against what was drawn: panels, curves, labels.
 *
 *   DETECT_SHEETS=40 DETECT_SEED=1 npx tsx scripts/detectSheets/bed.ts
 *
 * PDFs are cached in artifacts/detect-sheets/ (not committed).
 */
import { RENDER_VERSION } from '../randomSheets/svg.ts';
import { existsSync, mkdirSync, readFileSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import type { Browser } from 'playwright-core';
import { loadPdfSheetNode } from '../../src/digitize/loaders/pdfNode.ts';
import { detectTakeoff } from '../../src/digitize/detect/detect.ts';
import { replayTakeoff } from '../../src/digitize/takeoff.ts';
import { parseTakeoffToDetect } from '../../src/model/takeoff.ts';
import { Dice } from '../randomSheets/dice.ts';
import { drawnRange, exact } from '../randomSheets/pumpFamily.ts';
import { planSheet } from '../randomSheets/plan.ts';
import { scoreReplay } from '../randomSheets/score.ts';
import { makeVectorSheet, minimalTakeoff, openPrinter, truthOf } from './vectorSheet.ts';

const CACHE = join(import.meta.dirname, '..', '..', 'artifacts', 'detect-sheets', `bed-${RENDER_VERSION}`);

/** The acceptance tolerance: 0.1 % of axis span (efficiency: 0.1 point of 100). */
export const ACCEPT_PERCENT = 0.1;

export interface SheetOutcome {
  seed: number;
  layout: string;
  panels: { expected: number; found: number };
  curves: { expected: number; found: number };
  iso: { expected: number; found: number };
  questions: string[];
  /** Time of the detection alone (text, paths, panels, curves, labels), ms. */
  detectMs: number;
  /** Tick-label proposals (autoCalibrate.ts, what `panels` prints) that belonged to no frame and were dropped. */
  dropped: number;
  /** Worst error of the detected curves' points against truth, % of axis span (15–95 % of each curve's flow range). */
  worst: number;
  /** Worst error of the curve set's fitted curves (the fit is the replay's, not the detector's), % of span or points. */
  worstFit: number;
  missing: string[];
  over: string[];
  mislabelled: string[];
  ok: boolean;
  error?: string;
}

let printer: Browser | null = null;

async function pdfFor(seed: number): Promise<Uint8Array> {
  const file = join(CACHE, `${seed}.pdf`);
  if (existsSync(file)) return new Uint8Array(readFileSync(file));
  printer ??= await openPrinter();
  const s = await makeVectorSheet(printer, seed);
  mkdirSync(CACHE, { recursive: true });
  writeFileSync(file, s.pdf);
  return s.pdf;
}

/** One sheet; with `answer`, the take-off also gives the diameters drawn (the engineer's answer to the detector's question on a sheet that prints none). */
export async function runSheet(seed: number, answer = false, answerIso = false): Promise<SheetOutcome> {
  const plan = planSheet(new Dice(seed));
  const truth = truthOf(plan);
  const pdf = await pdfFor(seed);
  const layout = `${plan.family.units} ${plan.efficiencyAs} ${plan.panels.map((p) => p.id).join('+')}`;
  const expectedCurves = plan.lines.filter((l) => l.diameter !== undefined);
  const expectedIso = plan.lines.filter((l) => l.iso !== undefined);
  const base: SheetOutcome = { seed, layout, panels: { expected: plan.panels.length, found: 0 }, curves: { expected: expectedCurves.length, found: 0 }, iso: { expected: expectedIso.length, found: 0 }, questions: [], detectMs: NaN, dropped: 0, worst: Infinity, worstFit: Infinity, missing: [], over: [], mislabelled: [], ok: false };
  const sheet = await loadPdfSheetNode(pdf, { name: `${seed}.pdf` });
  try {
    const isoLevels = [...new Set(plan.lines.flatMap((l) => (l.iso === undefined ? [] : [l.iso])))];
    const raw = { ...minimalTakeoff(plan, `${seed}.pdf`), ...(answer ? { diameters: plan.family.diameters } : {}), ...(answerIso ? { iso_levels: isoLevels } : {}) };
    const t0 = performance.now();
    const found = await detectTakeoff(parseTakeoffToDetect(raw), raw, sheet);
    base.detectMs = performance.now() - t0;
    const t = found.takeoff;
    base.panels.found = found.detection.panels.length;
    base.questions = found.questions;
    base.dropped = found.detection.droppedProposals;
    const curveTraces = t.traces.filter((k) => k.iso === undefined);
    const isoTraces = t.traces.filter((k) => k.iso !== undefined);
    base.curves.found = curveTraces.length;
    base.iso.found = isoTraces.length;
    // Curves: each drawn (quantity, diameter) found once, nothing else.
    const key = (q: string, d: number) => `${q}@${d}`;
    const want = new Set(expectedCurves.map((l) => key(l.quantity, l.diameter as number)));
    const got = curveTraces.map((k) => key(k.quantity, k.diameter as number));
    base.missing = [...want].filter((k) => !got.includes(k));
    base.over = got.filter((k, i) => !want.has(k) || got.indexOf(k) !== i);
    const wantIso = expectedIso.map((l) => l.iso as number).sort((a, b) => a - b);
    const gotIso = isoTraces.map((k) => k.iso as number).sort((a, b) => a - b);
    if (wantIso.join(',') !== gotIso.join(',')) base.mislabelled.push(`iso levels ${gotIso.join(',')} vs drawn ${wantIso.join(',')}`);
    const replay = await replayTakeoff(t, sheet);
    const scores = scoreReplay(plan.family, truth, replay.curveSet);
    base.worstFit = Math.max(0, ...scores.map((s) => s.error));
    base.worst = 0;
    for (const trace of t.traces) {
      if (trace.diameter === undefined) continue;
      const drawn = plan.lines.find((l) => l.quantity === trace.quantity && l.diameter === trace.diameter);
      const panel = plan.panels.find((p) => p.quantity === trace.quantity);
      const outcome = replay.traces.find((o) => o.id === trace.id);
      const cal = replay.calibrations.get(trace.panel);
      if (!drawn || !panel || !outcome || !cal) continue;
      const [a, b] = drawnRange(plan.family, trace.quantity, trace.diameter);
      let worst = 0;
      for (const p of outcome.points) {
        const [q, v] = cal.toData(p);
        if (q < a + 0.15 * (b - a) || q > a + 0.95 * (b - a)) continue;
        worst = Math.max(worst, (100 * Math.abs(v - exact(plan.family, trace.quantity, trace.diameter, q))) / (panel.y.max - panel.y.min));
      }
      base.worst = Math.max(base.worst, worst);
      if (!(worst <= ACCEPT_PERCENT)) base.mislabelled.push(`${trace.id} points off by ${worst.toFixed(3)} % of span`);
    }
    base.ok = base.panels.found === base.panels.expected && base.missing.length === 0 && base.over.length === 0 && base.mislabelled.length === 0;
  } catch (error) {
    base.error = error instanceof Error ? error.message : String(error);
  } finally {
    await sheet.close();
  }
  return base;
}

async function main(): Promise<void> {
  const count = Number(process.env.DETECT_SHEETS ?? 20);
  const first = Number(process.env.DETECT_SEED ?? 1);
  const outcomes: SheetOutcome[] = [];
  const answered: SheetOutcome[] = [];
  for (let seed = first; seed < first + count; seed++) {
    let o = await runSheet(seed);
    const asks = (k: SheetOutcome, word: string) => (k.error ?? '').includes(word) || k.questions.some((q) => q.includes(word));
    const needDiameters = asks(o, 'names no');
    const needIso = asks(o, 'iso_levels');
    if (needDiameters || needIso) {
      // The engineer answers the detector's question once, in the take-off file.
      o = await runSheet(seed, needDiameters, needIso);
      o.layout += ` (${[needDiameters ? 'diameters' : '', needIso ? 'iso levels' : ''].filter(Boolean).join(' and ')} given)`;
      answered.push(o);
    }
    outcomes.push(o);
    const line = `${String(seed).padStart(4)} ${o.ok ? 'OK  ' : 'FAIL'} ${o.layout.padEnd(38)} panels ${o.panels.found}/${o.panels.expected} curves ${o.curves.found}/${o.curves.expected} iso ${o.iso.found}/${o.iso.expected} worst ${Number.isFinite(o.worst) ? o.worst.toFixed(4) : '-'} % (fit ${Number.isFinite(o.worstFit) ? o.worstFit.toFixed(3) : '-'}) questions ${o.questions.length}`;
    process.stdout.write(`${line}\n`);
    if (!o.ok && process.env.DETECT_VERBOSE) {
      if (o.error) process.stdout.write(`      error: ${o.error}\n`);
      for (const m of [...o.missing.map((k) => `missing ${k}`), ...o.over.map((k) => `extra ${k}`), ...o.mislabelled]) process.stdout.write(`      ${m}\n`);
      for (const q of o.questions) process.stdout.write(`      ? ${q}\n`);
    }
  }
  if (printer) await printer.close();
  const ok = outcomes.filter((o) => o.ok).length;
  const clean = outcomes.filter((o) => !o.error && o.missing.length === 0 && o.over.length === 0);
  process.stdout.write(`\n${ok} of ${outcomes.length} sheets fully right (every panel, curve, label found; every detected curve within ${ACCEPT_PERCENT} % of span)\n`);
  const fitOk = outcomes.filter((o) => o.ok && o.worstFit <= ACCEPT_PERCENT).length;
  process.stdout.write(`of those, ${fitOk} also have every fitted curve of the curve set within ${ACCEPT_PERCENT} % of span (efficiency: points)\n`);
  process.stdout.write(`sheets read without any question: ${outcomes.filter((o) => o.ok && o.questions.length === 0 && !answered.includes(o)).length}\n`);
  process.stdout.write(`sheets on which the detector asked for the diameters or iso levels (not printed on the sheet) and was run again with the answer: ${answered.length}, of which fully right after the answer: ${answered.filter((o) => o.ok).length}\n`);
  process.stdout.write(`sheets with nothing invented and nothing missed: ${clean.length}; with questions: ${outcomes.filter((o) => o.questions.length > 0).length}; refused: ${outcomes.filter((o) => o.error).length}\n`);
  const ms = outcomes.map((o) => o.detectMs).filter(Number.isFinite).sort((a, b) => a - b);
  if (ms.length) process.stdout.write(`detection time per sheet (loaded PDF to take-off): p50 ${ms[Math.floor(ms.length / 2)]!.toFixed(0)} ms, max ${ms[ms.length - 1]!.toFixed(0)} ms\n`);
  process.stdout.write(`tick-label proposals dropped as belonging to no frame: ${outcomes.reduce((n, o) => n + o.dropped, 0)} on ${outcomes.filter((o) => o.dropped > 0).length} sheets\n`);
  const silentWrong = outcomes.filter((o) => !o.ok && o.questions.length === 0 && !o.error);
  process.stdout.write(`wrong without a question: ${silentWrong.length}${silentWrong.length ? ` (seeds ${silentWrong.map((o) => o.seed).join(', ')})` : ''}\n`);
  if (process.env.DETECT_DUMP) writeFileSync(process.env.DETECT_DUMP, JSON.stringify(outcomes, null, 1));
}

if (process.argv[1] && import.meta.url.endsWith(process.argv[1].split('/').pop() as string)) await main();
