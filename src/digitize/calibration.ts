/**
 * Calibration of one panel: the map between sheet points and data values.
 *
 * Both methods give an affine map from the sheet to the axes' linear cores (log10 for a log
 * axis), so rotation, skew and unequal scales are absorbed:
 *   [u, v] = M · [x, y, 1],   value_x = inverse_x(u),   value_y = inverse_y(v).
 * - 'affine': 3 or more anchors with both values, least squares on centred coordinates.
 * - 'axes': 2 or more anchors on each axis, each with the one value of its axis. Lines of
 *   constant x run parallel to the y-axis anchors' line and vice versa.
 * `toData` and `toSheet` are exact inverses (up to rounding) on the valid domain.
 */
import { dataPoint, sheetPoint, type DataPoint, type SheetPoint, type SheetCoordinates, type DataCoordinates } from './points.ts';
import { axisTransform, CalibrationError, type AxisTransform } from './axis.ts';
import type { AxisScaleType } from '../model/takeoff.ts';

export { CalibrationError } from './axis.ts';

export interface AnchorInput {
  at: readonly [number, number];
  x?: number | undefined;
  y?: number | undefined;
}

export interface AnchorResidual {
  /** Distance between the anchor as placed and where its value(s) map to, sheet units. */
  sheet: number;
  /** Largest error in % of the anchors' span on the axis (or axes) the anchor serves. */
  percentOfSpan: number;
}

export interface Calibration {
  readonly method: 'affine' | 'axes';
  readonly xScale: AxisScaleType;
  readonly yScale: AxisScaleType;
  /** Sheet → linear cores: u = m[0]·x + m[2]·y + m[4], v = m[1]·x + m[3]·y + m[5]. */
  readonly matrix: readonly [number, number, number, number, number, number];
  readonly residuals: readonly AnchorResidual[];
  /** Root-mean-square and largest anchor residual, sheet units. */
  readonly rmsSheet: number;
  readonly maxSheet: number;
  /** Largest anchor residual in % of span. */
  readonly maxPercentOfSpan: number;
  /** Plain sentences for anchors off by more than the warning threshold. */
  readonly warnings: readonly string[];
  toData(p: SheetCoordinates): DataPoint;
  toSheet(d: DataCoordinates): SheetPoint;
}

export interface CalibrateOptions {
  xScale?: AxisScaleType;
  yScale?: AxisScaleType;
  /** Residual above this, in % of span, gets a warning. */
  warnPercent?: number;
  /** Name of the panel for messages. */
  panel?: string;
}

export const RESIDUAL_WARN_PERCENT = 0.3;

type M6 = [number, number, number, number, number, number];

/** Builds a calibration from anchors; throws CalibrationError for anchors that cannot define one. */
export function calibrate(anchors: readonly AnchorInput[], options: CalibrateOptions = {}): Calibration {
  const where = options.panel ? `Panel "${options.panel}"` : 'The panel';
  const tx = axisTransform(options.xScale ?? 'linear');
  const ty = axisTransform(options.yScale ?? 'linear');
  anchors.forEach((a, i) => {
    if (!Number.isFinite(a.at[0]) || !Number.isFinite(a.at[1])) throw new CalibrationError(`${where}: anchor ${i + 1} has no finite sheet position.`);
  });
  const both = anchors.filter((a) => a.x !== undefined && a.y !== undefined);
  const xOnly = anchors.filter((a) => a.x !== undefined && a.y === undefined);
  const yOnly = anchors.filter((a) => a.y !== undefined && a.x === undefined);

  if (both.length === anchors.length && both.length >= 3) return affineCalibration(anchors, tx, ty, where, options);
  if (both.length === 0 && xOnly.length >= 2 && yOnly.length >= 2) return axesCalibration(xOnly, yOnly, tx, ty, where, options);
  throw new CalibrationError(
    `${where} needs either 3 or more anchors with both x and y values, or 2 or more anchors on each axis with one value each; it has ${both.length} with both, ${xOnly.length} with x only and ${yOnly.length} with y only.`,
  );
}

function affineCalibration(anchors: readonly AnchorInput[], tx: AxisTransform, ty: AxisTransform, where: string, options: CalibrateOptions): Calibration {
  const pts = anchors.map((a) => a.at);
  const us = anchors.map((a, i) => tx.forward(a.x as number, `x value of anchor ${i + 1}`));
  const vs = anchors.map((a, i) => ty.forward(a.y as number, `y value of anchor ${i + 1}`));
  refuseCoincident(pts, where);
  if (spreadRatio(pts) < 1e-3) throw new CalibrationError(`${where}: the anchors lie on one line on the sheet; place at least one anchor off that line (e.g. at a corner of the plot).`);
  if (span(us) === 0) throw new CalibrationError(`${where}: all anchors have the same x value; give anchors with different x values.`);
  if (span(vs) === 0) throw new CalibrationError(`${where}: all anchors have the same y value; give anchors with different y values.`);
  const values = us.map((u, i) => [u, vs[i] as number] as const);
  if (spreadRatio(values) < 1e-6) throw new CalibrationError(`${where}: the anchor values lie on one line in the plot (x and y change together); add an anchor that changes x without y or y without x.`);

  const [a, c, e] = fitPlane(pts, us);
  const [b, d, f] = fitPlane(pts, vs);
  const m: M6 = [a, b, c, d, e, f];
  const det = a * d - b * c;
  if (!Number.isFinite(det) || Math.abs(det) === 0) throw new CalibrationError(`${where}: the anchors do not determine both axes; check their values and positions.`);

  const spanU = span(us);
  const spanV = span(vs);
  const residuals = anchors.map((anchor, i) => {
    const [u, v] = applyM(m, anchor.at[0], anchor.at[1]);
    const du = u - (us[i] as number);
    const dv = v - (vs[i] as number);
    const [x, y] = invertM(m, us[i] as number, vs[i] as number);
    return { sheet: Math.hypot(x - anchor.at[0], y - anchor.at[1]), percentOfSpan: 100 * Math.max(Math.abs(du) / spanU, Math.abs(dv) / spanV) };
  });
  return finish('affine', m, tx, ty, residuals, where, options);
}

function axesCalibration(xs: readonly AnchorInput[], ys: readonly AnchorInput[], tx: AxisTransform, ty: AxisTransform, where: string, options: CalibrateOptions): Calibration {
  const px = xs.map((a) => a.at);
  const py = ys.map((a) => a.at);
  refuseCoincident(px, `${where} (x-axis anchors)`);
  refuseCoincident(py, `${where} (y-axis anchors)`);
  const us = xs.map((a, i) => tx.forward(a.x as number, `x value of x-axis anchor ${i + 1}`));
  const vs = ys.map((a, i) => ty.forward(a.y as number, `y value of y-axis anchor ${i + 1}`));
  if (span(us) === 0) throw new CalibrationError(`${where}: the x-axis anchors all have the same value; give them different x values.`);
  if (span(vs) === 0) throw new CalibrationError(`${where}: the y-axis anchors all have the same value; give them different y values.`);
  const ex = principalDirection(px);
  const ey = principalDirection(py);
  const cross = ex[0] * ey[1] - ex[1] * ey[0];
  if (Math.abs(cross) < 1e-3) throw new CalibrationError(`${where}: the x-axis anchors and the y-axis anchors lie along parallel lines; place the x anchors along the flow axis and the y anchors along the vertical axis.`);
  // Coordinates in the (ex, ey) basis: P = α·ex + β·ey.
  const inv = [ey[1] / cross, -ey[0] / cross, -ex[1] / cross, ex[0] / cross] as const;
  const alpha = (p: readonly [number, number]) => inv[0] * p[0] + inv[1] * p[1];
  const beta = (p: readonly [number, number]) => inv[2] * p[0] + inv[3] * p[1];
  const [ua, ub] = fitLine(px.map(alpha), us);
  const [va, vb] = fitLine(py.map(beta), vs);
  if (ub === 0 || vb === 0) throw new CalibrationError(`${where}: the axis anchors do not determine a scale; check their values and positions.`);
  // u = ua + ub·α(P), v = va + vb·β(P).
  const m: M6 = [ub * inv[0], vb * inv[2], ub * inv[1], vb * inv[3], ua, va];
  const spanU = span(us);
  const spanV = span(vs);
  const grad = (k: 0 | 1) => (k === 0 ? Math.hypot(m[0], m[2]) : Math.hypot(m[1], m[3]));
  const residuals = [
    ...xs.map((a, i) => {
      const du = applyM(m, a.at[0], a.at[1])[0] - (us[i] as number);
      return { sheet: Math.abs(du) / grad(0), percentOfSpan: (100 * Math.abs(du)) / spanU };
    }),
    ...ys.map((a, i) => {
      const dv = applyM(m, a.at[0], a.at[1])[1] - (vs[i] as number);
      return { sheet: Math.abs(dv) / grad(1), percentOfSpan: (100 * Math.abs(dv)) / spanV };
    }),
  ];
  return finish('axes', m, tx, ty, residuals, where, options);
}

function finish(method: Calibration['method'], m: M6, tx: AxisTransform, ty: AxisTransform, residuals: AnchorResidual[], where: string, options: CalibrateOptions): Calibration {
  const warnAt = options.warnPercent ?? RESIDUAL_WARN_PERCENT;
  const warnings = residuals.flatMap((r, i) =>
    r.percentOfSpan > warnAt
      ? [`${where}: anchor ${i + 1} is off by ${r.percentOfSpan.toFixed(2)} % of the axis span (${r.sheet.toFixed(2)} sheet units), more than ${warnAt} %; check its position and value.`]
      : [],
  );
  const rmsSheet = Math.sqrt(residuals.reduce((s, r) => s + r.sheet ** 2, 0) / Math.max(1, residuals.length));
  return {
    method,
    xScale: tx.type,
    yScale: ty.type,
    matrix: m,
    residuals,
    rmsSheet,
    maxSheet: Math.max(0, ...residuals.map((r) => r.sheet)),
    maxPercentOfSpan: Math.max(0, ...residuals.map((r) => r.percentOfSpan)),
    warnings,
    toData(p) {
      const [u, v] = applyM(m, p[0], p[1]);
      return dataPoint(tx.inverse(u), ty.inverse(v));
    },
    toSheet(d) {
      const [x, y] = invertM(m, tx.forward(d[0], 'x value'), ty.forward(d[1], 'y value'));
      return sheetPoint(x, y);
    },
  };
}

function applyM(m: M6, x: number, y: number): [number, number] {
  return [m[0] * x + m[2] * y + m[4], m[1] * x + m[3] * y + m[5]];
}

function invertM(m: M6, u: number, v: number): [number, number] {
  const det = m[0] * m[3] - m[1] * m[2];
  const du = u - m[4];
  const dv = v - m[5];
  return [(m[3] * du - m[2] * dv) / det, (m[0] * dv - m[1] * du) / det];
}

function span(values: readonly number[]): number {
  return Math.max(...values) - Math.min(...values);
}

/** √(λmin/λmax) of the points' covariance: 0 for points on a line, 1 for a round cloud. */
function spreadRatio(points: readonly (readonly [number, number])[]): number {
  const [sxx, sxy, syy] = covariance(points);
  const tr = sxx + syy;
  if (tr === 0) return 0;
  const disc = Math.sqrt(Math.max(0, ((sxx - syy) / 2) ** 2 + sxy * sxy));
  const hi = tr / 2 + disc;
  const lo = Math.max(0, tr / 2 - disc);
  return Math.sqrt(lo / hi);
}

function covariance(points: readonly (readonly [number, number])[]): [number, number, number] {
  const n = points.length;
  const mx = points.reduce((s, p) => s + p[0], 0) / n;
  const my = points.reduce((s, p) => s + p[1], 0) / n;
  let sxx = 0;
  let sxy = 0;
  let syy = 0;
  for (const p of points) {
    sxx += (p[0] - mx) ** 2;
    sxy += (p[0] - mx) * (p[1] - my);
    syy += (p[1] - my) ** 2;
  }
  return [sxx, sxy, syy];
}

/** Unit vector along the points' main direction (from the first point's side to the last's). */
function principalDirection(points: readonly (readonly [number, number])[]): [number, number] {
  const [sxx, sxy, syy] = covariance(points);
  const angle = 0.5 * Math.atan2(2 * sxy, sxx - syy);
  let d: [number, number] = [Math.cos(angle), Math.sin(angle)];
  const first = points[0] as readonly [number, number];
  const last = points[points.length - 1] as readonly [number, number];
  if ((last[0] - first[0]) * d[0] + (last[1] - first[1]) * d[1] < 0) d = [-d[0], -d[1]];
  return d;
}

function refuseCoincident(points: readonly (readonly [number, number])[], where: string): void {
  const xs = points.map((p) => p[0]);
  const ys = points.map((p) => p[1]);
  const size = Math.max(span(xs), span(ys));
  for (let i = 0; i < points.length; i++) {
    for (let j = i + 1; j < points.length; j++) {
      const a = points[i] as readonly [number, number];
      const b = points[j] as readonly [number, number];
      if (Math.hypot(a[0] - b[0], a[1] - b[1]) <= 1e-9 * Math.max(1, size) || size === 0) {
        throw new CalibrationError(`${where}: anchors ${i + 1} and ${j + 1} sit on the same sheet point; move one of them to its own grid line or tick.`);
      }
    }
  }
}

/** Least squares w = a·x + c·y + e on centred coordinates; returns [a, c, e]. */
function fitPlane(points: readonly (readonly [number, number])[], w: readonly number[]): [number, number, number] {
  const n = points.length;
  const mx = points.reduce((s, p) => s + p[0], 0) / n;
  const my = points.reduce((s, p) => s + p[1], 0) / n;
  const mw = w.reduce((s, v) => s + v, 0) / n;
  const [sxx, sxy, syy] = covariance(points);
  let sxw = 0;
  let syw = 0;
  points.forEach((p, i) => {
    sxw += (p[0] - mx) * ((w[i] as number) - mw);
    syw += (p[1] - my) * ((w[i] as number) - mw);
  });
  const det = sxx * syy - sxy * sxy;
  const a = (syy * sxw - sxy * syw) / det;
  const c = (sxx * syw - sxy * sxw) / det;
  return [a, c, mw - a * mx - c * my];
}

/** Least squares w = a + b·t; returns [a, b]. */
function fitLine(t: readonly number[], w: readonly number[]): [number, number] {
  const n = t.length;
  const mt = t.reduce((s, v) => s + v, 0) / n;
  const mw = w.reduce((s, v) => s + v, 0) / n;
  let stt = 0;
  let stw = 0;
  t.forEach((v, i) => {
    stt += (v - mt) ** 2;
    stw += (v - mt) * ((w[i] as number) - mw);
  });
  const b = stt > 0 ? stw / stt : 0;
  return [mw - b * mt, b];
}
