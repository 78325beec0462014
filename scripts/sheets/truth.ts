/**
 * Exact truth of a generated sheet, as JSON beside the sheet (`*.truth.json`), and the helpers
 * that measure a reading against it: sheet position → data value through the exact drawing
 * transform, the true value of every drawn curve at any flow, and errors in % of axis span
 * (efficiency in points) over 15–95 % of each curve's flow range.
 */
import { efficiency, head, npshr, power, type Family } from './family.ts';
import type { Axis, CurveQuantity, IsoCrossing, Layout, PanelId, SheetSpec } from './layout.ts';
import type { ScanSpec } from './renderRaster.ts';

export const TRUTH_FORMAT = 'pumpscribe.sheet-truth';

export interface TruthCurve {
  id: string;
  panel: PanelId;
  quantity: CurveQuantity;
  diameter: number;
  drawn_diameter: number;
  factor: number;
  flow_range: [number, number];
}

export interface Truth {
  format: typeof TRUTH_FORMAT;
  version: 1;
  invented: string;
  sheet: string;
  kind: 'vector-pdf' | 'raster-pdf' | 'image';
  spec: SheetSpec;
  scan: ScanSpec | null;
  /** Sheet points of the drawing → coordinates of the sheet file: x' = a·x + c·y + e, y' = b·x + d·y + f. */
  matrix: [number, number, number, number, number, number];
  family: Family;
  panels: Array<{ id: PanelId; frame_pt: [number, number, number, number]; x: Axis; y: Axis }>;
  curves: TruthCurve[];
  isos: Array<{ id: string; iso: number; branch: 'loop' | 'left' | 'right'; crossings: IsoCrossing[] }>;
  faults: Array<Record<string, unknown>>;
}

export function buildTruth(layout: Layout, sheet: string, kind: Truth['kind'], matrix: Truth['matrix'], scan: ScanSpec | null): Truth {
  const faults: Truth['faults'] = [];
  for (const c of layout.curves) {
    if (c.quantity === 'head' && c.diameter !== c.drawn_diameter) {
      faults.push({ kind: 'announced-diameter', drawn_diameter: c.drawn_diameter, announced_diameter: c.diameter, expect: `an affinity finding naming ${c.diameter}` });
    }
    if (c.factor !== 1) faults.push({ kind: 'power-high', diameter: c.diameter, factor: c.factor, expect: `a power-consistency finding naming ${c.diameter}` });
  }
  return {
    format: TRUTH_FORMAT,
    version: 1,
    invented: 'Invented data for testing Pumpscribe; not a real product.',
    sheet,
    kind,
    spec: layout.spec,
    scan,
    matrix,
    family: layout.family,
    panels: layout.panels.map((p) => ({ id: p.id, frame_pt: p.frame, x: p.x, y: p.y })),
    curves: layout.curves.map(({ points: _points, ...c }) => c),
    isos: layout.isos.map(({ points: _points, ...i }) => i),
    faults,
  };
}

/** Exact value of a drawn curve at flow q, in the panel's unit (efficiency in %). */
export function trueValue(truth: Pick<Truth, 'family'>, curve: Pick<TruthCurve, 'quantity' | 'drawn_diameter' | 'factor'>, q: number): number {
  const f = truth.family;
  const d = curve.drawn_diameter;
  const v = curve.quantity === 'head' ? head(f, d, q) : curve.quantity === 'efficiency' ? efficiency(f, d, q) : curve.quantity === 'power' ? power(f, d, q) : npshr(f, d, q);
  return v * curve.factor;
}

/** Coordinates of the sheet file → drawing points (inverse of the truth matrix). */
export function toDrawing(truth: Pick<Truth, 'matrix'>, p: readonly [number, number]): [number, number] {
  const [a, b, c, d, e, f] = truth.matrix;
  const det = a * d - b * c;
  const x = p[0] - e;
  const y = p[1] - f;
  return [(d * x - c * y) / det, (-b * x + a * y) / det];
}

/** Coordinates of the sheet file → data values of a panel, exactly. */
export function toData(truth: Pick<Truth, 'matrix' | 'panels'>, panelId: PanelId, p: readonly [number, number]): [number, number] {
  const panel = truth.panels.find((x) => x.id === panelId);
  if (!panel) throw new Error(`The truth has no panel ${panelId}.`);
  const [x, y] = toDrawing(truth, p);
  const [l, t, r, b] = panel.frame_pt;
  return [panel.x.min + ((x - l) / (r - l)) * (panel.x.max - panel.x.min), panel.y.min + ((b - y) / (b - t)) * (panel.y.max - panel.y.min)];
}

export interface CurveError {
  /** Worst |reading − truth| over 15–95 % of the curve's flow range: % of the y-axis span, or points for efficiency. */
  worst: number;
  /** Flow where the worst error occurs. */
  atFlow: number;
  /** Fraction of the 15–95 % window that the reading spans. */
  coverage: number;
}

/**
 * Errors of a captured line given as data points (flow, value) in order along the line: the
 * line is interpolated at 200 flows across 15–95 % of the true curve's flow range.
 */
export function curveError(truth: Pick<Truth, 'family' | 'panels'>, curve: TruthCurve, data: ReadonlyArray<readonly [number, number]>): CurveError {
  const panel = truth.panels.find((p) => p.id === curve.panel);
  if (!panel) throw new Error(`The truth has no panel ${curve.panel}.`);
  const span = curve.quantity === 'efficiency' ? 100 : panel.y.max - panel.y.min;
  const [q0, q1] = curve.flow_range;
  const sorted = [...data].sort((a, b) => a[0] - b[0]);
  let worst = 0;
  let atFlow = NaN;
  let covered = 0;
  const n = 200;
  for (let i = 0; i <= n; i++) {
    const q = q0 + (0.15 + (0.8 * i) / n) * (q1 - q0);
    const k = sorted.findIndex((p) => p[0] >= q);
    if (k <= 0) continue;
    const a = sorted[k - 1] as readonly [number, number];
    const b = sorted[k] as readonly [number, number];
    const v = b[0] === a[0] ? a[1] : a[1] + ((q - a[0]) / (b[0] - a[0])) * (b[1] - a[1]);
    covered++;
    const e = (Math.abs(v - trueValue(truth, curve, q)) / span) * 100;
    if (e > worst) {
      worst = e;
      atFlow = q;
    }
  }
  return { worst, atFlow, coverage: covered / (n + 1) };
}

/**
 * The efficiency a point on the head panel stands for: the diameter whose head curve passes
 * through (q, h), found by bisection between 80 % and 105 % of the largest diameter, and the
 * family's efficiency there. Used to judge iso-traces point by point.
 */
export function efficiencyAtHeadPoint(family: Family, q: number, h: number): number {
  const dm = family.diameters[0] as number;
  let lo = 0.75 * dm;
  let hi = 1.05 * dm;
  for (let i = 0; i < 60; i++) {
    const mid = (lo + hi) / 2;
    if (head(family, mid, q) < h) lo = mid;
    else hi = mid;
  }
  return efficiency(family, (lo + hi) / 2, q);
}
