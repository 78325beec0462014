/**
 * A sheet of the independent bed drawn for a SPEED family: one INVENTED impeller at several
 * speeds (e.g. 100/90/80/70 % of rated, or 2900/2600/2300/2000 rpm), labelled "2600 rpm" or
 * "90 %", optionally with iso-efficiency lines and a minimum-flow line across the curves.
 * Nothing here describes a real product.
 *
 * Truth is the exact affinity-scaled family (speed law: Q ∝ n, H ∝ n², P ∝ n³, η constant
 * along Q/n, NPSH3 ∝ n²; Karassik, Pump Handbook; Lobanoff & Ross, Centrifugal Pumps): with
 * s = n / n_rated, every value at (Q, n) is the rated curve of pumpFamily.ts at Q/s, scaled by
 * s², s³ or 1. The sheet is drawn as SVG by svg.ts and then either printed to a vector PDF by
 * Chromium or rasterised and taken through the scanner of camera.ts; the take-off is made as
 * the random bed makes it (anchors on grid crossings, 1–3 guides a line: randomSheet.ts).
 */
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import type { CurveSet } from '../../src/model/curveset.ts';
import type { TakeoffInput } from '../../src/model/takeoff.ts';
import { applyH, chooseShot, rasterise, shoot, type Shot } from './camera.ts';
import { Dice } from './dice.ts';
import { niceStep, toFlat, type Dash, type LinePlan, type PanelPlan, type Pt, type SheetPlan } from './plan.ts';
import { drawnRange, exact, inventFamily, isoFlows, UNIT_NAMES, type PumpFamily, type Quantity } from './pumpFamily.ts';
import { anchorsFor, guidesFor, type TruthCurve } from './randomSheet.ts';
import type { TruthSource } from './score.ts';
import { sheetSvg } from './svg.ts';

export interface SpeedFamily extends PumpFamily {
  /** Drawn speeds in rpm, fastest (rated, = `speed`) first. */
  speeds: number[];
  /** How the curves are labelled on the sheet. */
  labels: 'rpm' | 'percent';
  /** Minimum continuous flow at rated speed (family flow unit); scales with n. */
  minFlow: number;
}

export interface SpeedSheetOptions {
  /** vector: printed by Chromium to PDF (96 dpi plan, PDF points = 0.75 flat pixels); scan: rasterised and scanned. */
  kind: 'vector' | 'scan';
  /** Efficiency as curves on their own panel, or as iso-lines across the head curves. */
  efficiencyAs?: 'curves' | 'iso';
  /** Draw a minimum-flow line across the head curves (a parabola H ∝ Q² through Q_min·n/n_rated). */
  minFlowLine?: boolean;
  /** Plan resolution of a scan, 200–300 dpi. */
  dpi?: number;
  /** Every speed's curves in one colour (near-black), as many printed sheets draw them; the dice are thrown as for a coloured sheet. */
  monochrome?: boolean;
}

/** An invented impeller drawn at four speeds, each within 20 % of the next (the law's close band). */
export function inventSpeedFamily(dice: Dice): SpeedFamily {
  const base = inventFamily(dice);
  const labels = dice.chance(0.5) ? 'rpm' : 'percent';
  const rated = dice.pick([1450, 1750, 2900, 3500]);
  const speeds = labels === 'percent' ? [100, 90, 80, 70].map((p) => (p * rated) / 100) : [rated, ...[0.9, 0.8, 0.7].map((r) => 50 * Math.round((r * rated) / 50))];
  return { ...base, speed: rated, diameters: [base.dMax], speeds, labels, minFlow: dice.between(0.25, 0.4) * base.qBest };
}

const ratio = (f: SpeedFamily, n: number) => n / f.speed;

/** Exact value at speed n (rpm) and flow q: the rated curve at q/s, scaled by the speed law. */
export function exactAtSpeed(f: SpeedFamily, quantity: Quantity, n: number, q: number): number {
  const s = ratio(f, n);
  const rated = exact(f, quantity, f.dMax, q / s);
  return quantity === 'efficiency' ? rated : quantity === 'power' ? s ** 3 * rated : s * s * rated;
}

/** The drawn flow range of the curve at speed n. */
export function drawnRangeAtSpeed(f: SpeedFamily, quantity: Quantity, n: number): [number, number] {
  const [a, b] = drawnRange(f, quantity, f.dMax);
  return [a * ratio(f, n), b * ratio(f, n)];
}

/** Flows on the head curve at speed n where efficiency equals `level` (%). */
export function isoFlowsAtSpeed(f: SpeedFamily, n: number, level: number): number[] {
  return isoFlows(f, f.dMax, level).map((q) => q * ratio(f, n));
}

export function speedLabel(f: SpeedFamily, n: number): string {
  return f.labels === 'percent' ? `${Math.round(100 * ratio(f, n))} %` : `${Math.round(n)} rpm`;
}

function axisFor(max: number, divisions: number) {
  const step = niceStep(max / divisions);
  return { min: 0, max: Math.ceil(max / step - 1e-9) * step, step };
}

const COLOURS = ['#d62728', '#1f5fbf', '#2ca02c', '#9467bd', '#e07b00', '#111111'];

function sample(panel: PanelPlan, flows: readonly number[], value: (q: number) => number): Pt[] {
  return flows.map((q) => toFlat(panel, q, value(q)));
}

/** The plan of a speed sheet: head panel (with iso-lines and the min-flow line), efficiency, power and NPSHr panels. */
export function planSpeedSheet(dice: Dice, options: SpeedSheetOptions): SheetPlan {
  const family = inventSpeedFamily(dice);
  const efficiencyAs = options.efficiencyAs ?? 'curves';
  const dpi = options.kind === 'vector' ? 96 : (options.dpi ?? dice.whole(200, 300));
  const inch = (v: number) => v * dpi;
  const frames: Quantity[] = efficiencyAs === 'curves' ? ['head', 'efficiency', 'power', 'npshr'] : ['head', 'power', 'npshr'];
  const left = inch(dice.between(0.75, 1));
  const right = inch(6.8) - inch(dice.between(0.3, 0.6));
  let top = inch(dice.between(0.6, 0.8));
  const rated = family.speed;
  const xAxis = axisFor(drawnRangeAtSpeed(family, 'head', rated)[1] * dice.between(1.05, 1.2), dice.whole(5, 8));
  const valueMax = (q: Quantity) => {
    let m = 0;
    for (const n of family.speeds) {
      const [a, b] = drawnRangeAtSpeed(family, q, n);
      for (let i = 0; i <= 100; i++) m = Math.max(m, exactAtSpeed(family, q, n, a + ((b - a) * i) / 100));
    }
    return m;
  };
  const panels: PanelPlan[] = [];
  for (const q of frames) {
    const h = inch(q === 'head' ? dice.between(2.8, 3.4) : dice.between(1.5, 1.9));
    const y = q === 'efficiency' ? { min: 0, max: 100, step: 20 } : axisFor(valueMax(q) * dice.between(1.08, 1.25), q === 'head' ? dice.whole(5, 8) : dice.whole(3, 5));
    panels.push({ id: q, quantity: q, frame: [left, top, right, top + h], x: xAxis, y, side: 'left' });
    top += h + inch(dice.between(0.45, 0.6));
  }
  const panelOf = (q: Quantity) => panels.find((p) => p.quantity === q) as PanelPlan;
  const colours = dice.shuffle([...COLOURS]);
  const width = dice.between(0.8, 1.8) * Math.max(1, dpi / 150);
  const lines: LinePlan[] = [];
  family.speeds.forEach((n, k) => {
    for (const panel of panels) {
      const q = panel.quantity;
      const [a, b] = drawnRangeAtSpeed(family, q, n);
      const flows = Array.from({ length: 301 }, (_, i) => a + ((b - a) * i) / 300);
      const dash: Dash = q === 'npshr' ? 'dashed' : 'solid';
      const pattern = dash === 'dashed' ? [6 * (dpi / 96), 3 * (dpi / 96)] : [];
      lines.push({
        id: `${q}-${n}`,
        panel: panel.id,
        quantity: q,
        speed: n,
        style: { colour: options.monochrome ? '#111111' : (colours[k % colours.length] as string), width, dash, pattern },
        points: sample(panel, flows, (f) => exactAtSpeed(family, q, n, f)),
        flows,
        ...(q === 'head' || q === 'power' ? { label: { text: speedLabel(family, n), at: dice.between(0.55, 0.8), mode: 'beside' as const } } : {}),
      });
    }
  });
  const head = panelOf('head');
  const slowest = family.speeds[family.speeds.length - 1] as number;
  const lo = slowest * 0.97;
  const hi = rated * 1.03;
  if (efficiencyAs === 'iso') {
    // Iso-efficiency lines follow the affinity parabolas: at speed n, the crossing is at x·Q_best·n/n_rated.
    const peakLevel = Math.floor(100 * family.etaTop);
    const stepLevel = dice.pick([3, 4, 5]);
    for (let i = 1; i <= 3; i++) {
      const level = peakLevel - i * stepLevel;
      for (const branch of [0, 1]) {
        const flows: number[] = [];
        const points: Pt[] = [];
        for (let j = 0; j <= 60; j++) {
          const n = lo + ((hi - lo) * j) / 60;
          const q = isoFlowsAtSpeed(family, n, level)[branch];
          if (q === undefined) continue;
          flows.push(q);
          points.push(toFlat(head, q, exactAtSpeed(family, 'head', n, q)));
        }
        if (points.length < 10) continue;
        lines.push({ id: `iso-${level}-${branch === 0 ? 'left' : 'right'}`, panel: head.id, quantity: 'efficiency', iso: level, style: { colour: '#444444', width: 0.8 * width, dash: 'solid', pattern: [] }, points, flows, label: { text: `${level}%`, at: 0.5, mode: 'on' } });
      }
    }
  }
  if (options.minFlowLine) {
    const flows: number[] = [];
    const points: Pt[] = [];
    for (let j = 0; j <= 40; j++) {
      const n = lo + ((hi - lo) * j) / 40;
      const q = family.minFlow * ratio(family, n);
      flows.push(q);
      points.push(toFlat(head, q, exactAtSpeed(family, 'head', n, q)));
    }
    lines.push({ id: 'min-flow', panel: head.id, quantity: 'head', style: { colour: '#111111', width: 0.8 * width, dash: 'dashed', pattern: [5 * (dpi / 96), 3 * (dpi / 96)] }, points, flows, label: { text: 'min. flow', at: 0.9, mode: 'beside' } });
  }
  const shade = dice.whole(170, 215).toString(16).padStart(2, '0');
  return {
    dpi,
    width: Math.round(inch(6.8)),
    height: Math.round(top + inch(0.3)),
    family,
    panels,
    lines,
    efficiencyAs: efficiencyAs === 'iso' ? 'iso' : 'curves',
    grid: { minor: 0, colour: `#${shade}${shade}${shade}`, width: 0.6 * Math.max(1, dpi / 200) },
    fontPx: (8 / 72) * dpi,
  };
}

export interface SpeedSheet {
  seed: number;
  plan: SheetPlan;
  family: SpeedFamily;
  /** Flat pixels → sheet points (PDF points for the vector sheet, scan pixels for the scan). */
  shot: Shot;
  /** The PDF (vector) or the JPEG (scan). */
  bytes: Uint8Array;
  takeoff: TakeoffInput;
  truth: TruthCurve[];
}

/** PDF points are 0.75 CSS pixels, and the vector plan is drawn at 96 dpi (one flat pixel = one CSS pixel). */
const PDF_POINT = 0.75;

function printShot(plan: SheetPlan): Shot {
  return { kind: 'scan', h: [PDF_POINT, 0, 0, 0, PDF_POINT, 0, 0, 0, 1], width: plan.width * PDF_POINT, height: plan.height * PDF_POINT, keystone: 0, rotationDeg: 0, blur: 0, light: 0, noise: 0, quality: 100 };
}

/** Prints an SVG page to PDF with Chromium (headless, a throw-away profile). */
export async function printSvgToPdf(svg: string, width: number, height: number, chromiumPath = '/usr/bin/chromium'): Promise<Uint8Array> {
  const { chromium } = await import('playwright-core');
  const profile = mkdtempSync(join(tmpdir(), 'pumpscribe-speed-sheet-'));
  const context = await chromium.launchPersistentContext(profile, { executablePath: chromiumPath, headless: true, args: ['--headless', '--no-sandbox', '--disable-gpu', '--no-first-run', '--disable-background-networking', '--disable-component-update', '--disable-sync'] });
  try {
    const page = await context.newPage();
    await page.setContent(`<!doctype html><html><head><style>@page { size: ${width}px ${height}px; margin: 0 } html, body { margin: 0 } svg { display: block }</style></head><body>${svg}</body></html>`);
    return new Uint8Array(await page.pdf({ width: `${width}px`, height: `${height}px`, printBackground: true, preferCSSPageSize: true }));
  } finally {
    await context.close();
    rmSync(profile, { recursive: true, force: true });
  }
}

/** One speed sheet from a seed: plan, picture (PDF or JPEG), a hurried take-off labelled by speed, and the exact truth. */
export async function makeSpeedSheet(seed: number, options: SpeedSheetOptions): Promise<SpeedSheet> {
  const dice = new Dice(seed);
  const plan = planSpeedSheet(dice, options);
  const family = plan.family as SpeedFamily;
  const svg = sheetSvg(plan);
  let shot: Shot;
  let bytes: Uint8Array;
  if (options.kind === 'vector') {
    shot = printShot(plan);
    bytes = await printSvgToPdf(svg, plan.width, plan.height);
  } else {
    const flat = await rasterise(svg, plan.width, plan.height);
    shot = chooseShot(dice, 'scan', plan.width, plan.height);
    bytes = new Uint8Array(await shoot(dice, flat, plan.width, plan.height, shot));
  }
  const u = UNIT_NAMES[family.units];
  const panels: TakeoffInput['panels'] = plan.panels.map((p) => {
    const corners = [toFlat(p, p.x.min, p.y.min), toFlat(p, p.x.max, p.y.max)].map((c) => applyH(shot.h, c));
    const xs = corners.map((c) => c[0]);
    const ys = corners.map((c) => c[1]);
    let anchors = anchorsFor(dice, p, shot, 6);
    // A vector sheet's anchors snap to the grid crossing exactly (the workbench snaps to the drawn lines).
    if (options.kind === 'vector') anchors = anchors.map((a) => ({ ...a, at: applyH(shot.h, toFlat(p, a.x as number, a.y as number)) }));
    const frame: [number, number, number, number] = [Math.min(...xs), Math.min(...ys), Math.max(...xs), Math.max(...ys)];
    return { id: p.id, anchors, frame, units: { y: p.quantity === 'efficiency' ? '%' : p.quantity === 'power' ? u.power : p.quantity === 'npshr' ? u.npsh : u.head } };
  });
  const head = plan.panels.find((p) => p.quantity === 'head') as PanelPlan;
  const traces: TakeoffInput['traces'] = plan.lines.map((line) => {
    const crossings: Pt[] = [];
    if (line.iso !== undefined) for (const n of family.speeds) for (const q of isoFlowsAtSpeed(family, n, line.iso)) crossings.push(toFlat(head, q, exactAtSpeed(family, 'head', n, q)));
    const near = crossings.filter((c) => line.points.some((p) => Math.hypot(p[0] - c[0], p[1] - c[1]) < 2));
    const label = line.id === 'min-flow' ? { limit: 'min-flow' as const } : line.iso !== undefined ? { iso: line.iso } : { speed: line.speed as number };
    // Each drawn line is taken to its own ends (a person traces the whole curve, not the stretch between clicks).
    return { id: line.id, panel: line.panel, quantity: line.quantity, ...label, guides: guidesFor(dice, line, near, shot), extent: 'line' as const };
  });
  const truth: TruthCurve[] = [];
  for (const line of plan.lines) {
    if (line.speed === undefined) continue;
    const panel = plan.panels.find((p) => p.id === line.panel) as PanelPlan;
    const [a, b] = drawnRangeAtSpeed(family, line.quantity, line.speed);
    truth.push({ quantity: line.quantity, diameter: family.dMax, speed: line.speed, source: 'curve', range: [a + 0.15 * (b - a), a + 0.95 * (b - a)], span: line.quantity === 'efficiency' ? 100 : panel.y.max - panel.y.min, traces: [line.id] });
  }
  const isoLines = plan.lines.filter((l) => l.iso !== undefined);
  if (isoLines.length > 0) {
    for (const n of family.speeds) {
      const flows = isoLines.flatMap((l) => isoFlowsAtSpeed(family, n, l.iso as number));
      const [a, b] = drawnRangeAtSpeed(family, 'head', n);
      const from = Math.max(Math.min(...flows), a + 0.15 * (b - a));
      const to = Math.min(Math.max(...flows), a + 0.95 * (b - a));
      if (flows.length >= 3 && to > from) truth.push({ quantity: 'efficiency', diameter: family.dMax, speed: n, source: 'iso', range: [from, to], span: 100, traces: [...isoLines.map((l) => l.id), `head-${n}`] });
    }
  }
  const takeoff: TakeoffInput = {
    sheet: options.kind === 'vector' ? `speed-${seed}.pdf` : `speed-${seed}.jpg`,
    pump: { name: `Invented speed family ${seed} (not a real product)`, speed_rpm: family.speed },
    units: { flow: u.flow, head: u.head, power: u.power, npsh: u.npsh, diameter: u.diameter },
    panels,
    traces,
  };
  return { seed, plan, family, shot, bytes, takeoff, truth };
}

/** Scoring a speed sheet with score.ts: members are found by speed, values from the exact speed family. */
export function speedTruthSource(family: SpeedFamily): TruthSource {
  return {
    member: (set: CurveSet, curve: TruthCurve) => set.members.find((m) => curve.speed !== undefined && Math.abs(m.speed_rpm / curve.speed - 1) < 1e-9),
    value: (curve: TruthCurve, q: number) => exactAtSpeed(family, curve.quantity, curve.speed as number, q),
  };
}

/** The exact minimum flow (family flow unit) at speed n. */
export function minFlowAtSpeed(family: SpeedFamily, n: number): number {
  return family.minFlow * ratio(family, n);
}
