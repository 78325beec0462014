/**
 * Calibration of one panel: the map between sheet points and data values.
 *
 * Both methods give an affine map from the sheet to the axes' linear cores (log10 for a log
 * axis), so rotation, skew and unequal scales are absorbed:
 *   [u, v] = M · [x, y, 1],   value_x = inverse_x(u),   value_y = inverse_y(v).
 * - 'affine': 3 or more anchors with both values, least squares on centred coordinates.
 * - 'axes': 2 or more anchors on each axis, each with the one value of its axis. Lines of
 *   constant x run parallel to the y-axis anchors' line and vice versa.
 * With 4 or more anchors with both values a homography (projective map, homography.ts) is
 * fitted beside the affine map, for photos of a sheet, whose perspective no affine map
 * absorbs. It is chosen when the anchors show perspective (see `chooseProjection`), or when
 * the panel asks for it. Each anchor's residual is checked honestly: leave-one-out with 5 or
 * more anchors on a homography; an exactly fixed map (3 anchors affine, 4 projective) cannot
 * be checked, and says so with a warning to add an anchor.
 * The residual shown (`maxPercentOfSpan`) is the error the map is expected to make over the
 * plot (`expectedError`): the anchors' scatter, as their own misfit and a prior for snapped
 * anchors give it, carried through the fit to the frame's corners. It is never 0 % from an
 * exactly fixed map, and it predicts the real error of the calibration (within a factor of 3
 * on 95 % of the panels of the random bed, scripts/randomSheets).
 * `toData` and `toSheet` are exact inverses (up to rounding) on the valid domain.
 */
import { dataPoint, sheetPoint, type DataPoint, type SheetPoint, type SheetCoordinates, type DataCoordinates } from './points.ts';
import { axisTransform, CalibrationError, type AxisTransform } from './axis.ts';
import type { AxisScaleType, Panel } from '../model/takeoff.ts';
import { applyHomography, fitHomography, invertHomography, threeOnALine, type H9 } from './homography.ts';
import { principalAxis } from './polyline.ts';

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

export type Projection = 'affine' | 'projective';

export interface Calibration {
  readonly method: 'affine' | 'axes';
  /** The map in use: affine, or projective (a homography, for photos in perspective). */
  readonly projection: Projection;
  /**
   * What the residuals are: 'fit' (anchors against the fitted map), 'leave-one-out' (each
   * anchor against the map fitted without it), 'estimated' (4 anchors fix a homography
   * exactly: each anchor's figure is the expected error), 'none' (3 anchors fix an affine map
   * exactly: no check at all; the figure is the same expected error).
   */
  readonly residualKind: 'fit' | 'leave-one-out' | 'estimated' | 'none';
  /** Sheet → linear cores as a homography (row-major 3 × 3), when projective. */
  readonly homography?: H9;
  readonly xScale: AxisScaleType;
  readonly yScale: AxisScaleType;
  /** Sheet → linear cores: u = m[0]·x + m[2]·y + m[4], v = m[1]·x + m[3]·y + m[5] (the affine fit, also when the projective map is in use). */
  readonly matrix: readonly [number, number, number, number, number, number];
  readonly residuals: readonly AnchorResidual[];
  /** Root-mean-square and largest anchor residual, sheet units. */
  readonly rmsSheet: number;
  readonly maxSheet: number;
  /**
   * The residual shown, % of span. With anchors carrying both values: the expected largest
   * error of the map over the plot (see `expectedError`), which predicts the real error of the
   * calibration; with axis anchors: the largest anchor residual.
   */
  readonly maxPercentOfSpan: number;
  /** Largest anchor residual in % of span (fit, left out or estimated, as `residualKind` says). */
  readonly anchorPercentOfSpan: number;
  /** Plain sentences for anchors off by more than the warning threshold. */
  readonly warnings: readonly string[];
  /** True when the anchors cannot reveal the perspective of a photo (three, three on one line, or along two lines) and the map is affine: `borrowPerspective` may lend it another panel's. */
  readonly perspectiveHidden?: boolean;
  /**
   * True when exactly four anchors fit an affine map within `PERSPECTIVE_PERCENT` and the map is
   * affine: four anchors show a photo's perspective only in the fourth one's misfit, and where
   * they stand away from the plot's corners the perspective over the plot can hide behind it.
   * `borrowPerspective` offers such a panel the page's perspective too.
   */
  readonly perspectiveWeak?: boolean;
  /** The panel whose projective calibration lent this one the page's perspective (see `borrowPerspective`). */
  readonly perspectiveFrom?: string;
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
  /** 'auto' (default): projective when 4 or more anchors show perspective; or force one map. */
  projection?: 'auto' | Projection;
  /** The panel's plot frame [left, top, right, bottom], sheet units: where the expected error is looked for (default: the anchors' extent). */
  frame?: readonly [number, number, number, number] | undefined;
  /**
   * A placement error the anchors share, sheet units (one standard error): anchors found on a
   * scan by the automatic take-off all stand on rules and tick labels read the same way, so
   * their errors do not average away as independent clicks do. Added to the expected error
   * shown; absent (0) for anchors placed by hand or read from a vector page.
   */
  anchorBias?: number | undefined;
  /** The page's perspective, lent by another panel of the same page (see `borrowPerspective`); used only when this panel's anchors cannot reveal it. */
  pagePerspective?: PagePerspective | undefined;
}

/** Another panel's projective map from the sheet (any affine image of the flat page), its name and its residual shown (% of span). */
export interface PagePerspective {
  homography: H9;
  panel: string;
  percent: number;
}

/**
 * Largest misfit of an affine map to 4 anchors, in % of span, still put down to placement
 * rather than perspective. Anchors snapped to grid crossings land within about half a pixel
 * (0.05 % of a 1000-pixel span); a hand-held photo's keystone of 2–10 % puts the fourth anchor
 * off by 0.5 % or more (common practice: the threshold sits between the two).
 */
export const PERSPECTIVE_PERCENT = 0.1;
/** Placement uncertainty of an anchor, sheet units, for the residual estimated from exactly 4 anchors (from memory: snapping accuracy of about half a pixel). */
export const ANCHOR_UNCERTAINTY = 0.5;

export const RESIDUAL_WARN_PERCENT = 0.3;
/**
 * The expected error shown is this many standard errors at the worst place of the plot: about
 * the 95 % two-sided bound of one normal error (common practice), so that the largest of the
 * errors over the plot, which are strongly correlated, seldom exceeds it and is seldom far below.
 */
export const EXPECTED_COVERAGE = 1.13;
/** Weight, in degrees of freedom, of the prior placement scatter pooled with the anchors' own misfit. */
export const PRIOR_DOF = 2;

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

  const m = fitAffine(pts, us, vs);
  if (!m) throw new CalibrationError(`${where}: the anchors do not determine both axes; check their values and positions.`);
  const spanU = span(us);
  const spanV = span(vs);
  const misfit = (u: number, v: number, i: number) => 100 * Math.max(Math.abs(u - (us[i] as number)) / spanU, Math.abs(v - (vs[i] as number)) / spanV);

  const affineResiduals = anchors.map((anchor, i) => {
    const [u, v] = applyM(m, anchor.at[0], anchor.at[1]);
    const [x, y] = invertM(m, us[i] as number, vs[i] as number);
    return { sheet: Math.hypot(x - anchor.at[0], y - anchor.at[1]), percentOfSpan: misfit(u, v, i) };
  });
  const notices: string[] = [];
  const wanted = options.projection ?? 'auto';
  const canSeePerspective = anchors.length >= 4 && hasQuad(pts) && !alongTwoAxes(pts);
  if (wanted === 'projective' && !canSeePerspective) {
    throw new CalibrationError(`${where}: a projective calibration needs 4 or more anchors with both values, no three of them on one line and not all along two lines from one anchor (the axes); it has ${anchors.length}. Add anchors near the four corners of the plot.`);
  }
  const targets = us.map((u, i) => [u, vs[i] as number] as const);
  const h = wanted !== 'affine' && canSeePerspective ? fitHomography(pts, targets) : undefined;
  const looAffine = anchors.length >= 4 ? leaveOneOut(anchors.length, (keep) => fitAffine(keep.map((k) => pts[k] as readonly [number, number]), keep.map((k) => us[k] as number), keep.map((k) => vs[k] as number)), (map, i) => misfit(...applyM(map, (pts[i] as readonly [number, number])[0], (pts[i] as readonly [number, number])[1]), i)) : undefined;
  const looProjective =
    h && anchors.length >= 5
      ? leaveOneOut(anchors.length, (keep) => (hasQuad(keep.map((k) => pts[k] as readonly [number, number])) ? fitHomography(keep.map((k) => pts[k] as readonly [number, number]), keep.map((k) => targets[k] as readonly [number, number])) : undefined), (map, i) => misfit(...applyHomography(map, (pts[i] as readonly [number, number])[0], (pts[i] as readonly [number, number])[1]), i))
      : undefined;
  const affineMax = Math.max(...affineResiduals.map((r) => r.percentOfSpan));
  const fitRms =
    h && anchors.length >= 5
      ? { affine: Math.sqrt(sheetRss(pts, targets, (x, y) => applyM(m, x, y)) / (2 * anchors.length - 6)), projective: Math.sqrt(sheetRss(pts, targets, (x, y) => applyHomography(h, x, y)) / (2 * anchors.length - 8)) }
      : undefined;
  const projective = h !== undefined && (wanted === 'projective' || (wanted === 'auto' && chooseProjection(anchors.length, affineMax, looAffine, looProjective, fitRms)));

  // Four anchors that an affine map fits within placement error: on a photographed page whose
  // perspective another panel shows, that fit hides the perspective over the plot away from the
  // anchors (random bed photo 1127: NPSHr anchors at 1000/0, 3000/20, 0/40 and 4000/40 fitted
  // within 0.08 % of span, the plot 0.61 % off with 0.10 % shown). The page's perspective is
  // taken where it fits the anchors at least as well.
  const weak = !projective && anchors.length === 4 && canSeePerspective;
  if (!projective && (!canSeePerspective || weak) && wanted === 'auto' && options.pagePerspective) {
    const lent = lentPerspective(pts, us, vs, targets, spanU, spanV, m, tx, ty, where, options, options.pagePerspective, weak);
    if (lent && (!weak || lent.anchorPercentOfSpan <= affineMax)) return lent;
  }
  if (!projective) {
    if (anchors.length === 3) {
      // Exactly fixed: a fit residual would read 0 %. Show what a misplaced anchor would do instead.
      const expected = expectedError(pts, targets, spanU, spanV, affineFitter, 6, options);
      notices.push(`${where}: three anchors fix an affine map exactly, so neither a misplaced anchor nor the perspective of a photo can show; the residual shown (${expected.toFixed(2)} % of span) is the error expected over the plot from anchors placed within ${ANCHOR_UNCERTAINTY} units. Add a fourth anchor near the free corner of the plot.`);
      return { ...finish('affine', { affine: m }, tx, ty, anchors.map(() => ({ sheet: ANCHOR_UNCERTAINTY, percentOfSpan: expected })), 'none', where, options, notices, expected), perspectiveHidden: true };
    }
    else if (!canSeePerspective && !hasQuad(pts)) notices.push(`${where}: no four of the anchors are free of three on one line, so they cannot reveal the perspective of a photo; add an anchor off that line, near a free corner of the plot.`);
    else if (!canSeePerspective) notices.push(`${where}: the anchors lie on two lines (e.g. along the axes), so they cannot reveal the perspective of a photo; add an anchor off those lines (the far corner of the plot).`);
    return { ...finish('affine', { affine: m }, tx, ty, affineResiduals, anchors.length === 3 ? 'none' : 'fit', where, options, notices, expectedError(pts, targets, spanU, spanV, affineFitter, 6, options)), perspectiveHidden: !canSeePerspective, ...(weak ? { perspectiveWeak: true } : {}) };
  }
  const hi = invertHomography(h);
  let residuals: AnchorResidual[];
  let kind: Calibration['residualKind'];
  if (looProjective) {
    kind = 'leave-one-out';
    residuals = looProjective.map((r, i) => ({ percentOfSpan: r, sheet: sheetDistance(hi, pts[i] as readonly [number, number], us, vs, i, looProjective, h) }));
  } else {
    kind = 'estimated';
    const expected = expectedError(pts, targets, spanU, spanV, projectiveFitter, 8, options);
    residuals = anchors.map(() => ({ sheet: ANCHOR_UNCERTAINTY, percentOfSpan: expected }));
    const why = anchors.length === 4 ? 'four anchors fix the perspective exactly' : 'leaving out an anchor leaves three of the others on one line';
    notices.push(`${where}: ${why}, so the calibration cannot be checked; the residual shown (${expected.toFixed(2)} % of span) is the error expected over the plot from anchors placed within ${ANCHOR_UNCERTAINTY} units. Add a fifth anchor (a grid crossing inside the plot, off its diagonals) to check it.`);
  }
  return finish('affine', { affine: m, homography: h, inverse: hi }, tx, ty, residuals, kind, where, options, notices, expectedError(pts, targets, spanU, spanV, projectiveFitter, 8, options));
}

/**
 * A panel whose anchors cannot reveal perspective, calibrated through the page's perspective
 * lent by another panel of the same photographed sheet. A printed sheet is one plane, so every
 * panel's map is an affine map of the flat page, and the lender's projective map H_l = A_l · P
 * (P the photo's perspective, A_l affine). This panel's map is then A · H_l with A affine:
 * the anchors, carried through H_l, are fitted by an affine map (exactly, with three).
 *   [u, v, 1]ᵀ ∝ A₃ · H_l · [x, y, 1]ᵀ,   A₃ = [[a0, a2, a4], [a1, a3, a5], [0, 0, 1]].
 * Valid where H_l stays finite over this panel (its horizon far off the page). The residual
 * shown adds the lender's to this panel's own expected error: the lent perspective carries the
 * lender's anchor errors across the page.
 */
function lentPerspective(
  pts: readonly (readonly [number, number])[],
  us: readonly number[],
  vs: readonly number[],
  targets: readonly (readonly [number, number])[],
  spanU: number,
  spanV: number,
  m: M6,
  tx: AxisTransform,
  ty: AxisTransform,
  where: string,
  options: CalibrateOptions,
  lent: PagePerspective,
  weak = false,
): Calibration | undefined {
  const P = lent.homography;
  const onPage = (x: number, y: number) => applyHomography(P, x, y);
  const flat = pts.map((p) => onPage(p[0], p[1]));
  if (!flat.every((f) => Number.isFinite(f[0]) && Number.isFinite(f[1]))) return undefined;
  const a = fitAffine(flat, us, vs);
  if (!a) return undefined;
  const h: H9 = [
    a[0] * P[0] + a[2] * P[3] + a[4] * P[6], a[0] * P[1] + a[2] * P[4] + a[4] * P[7], a[0] * P[2] + a[2] * P[5] + a[4] * P[8],
    a[1] * P[0] + a[3] * P[3] + a[5] * P[6], a[1] * P[1] + a[3] * P[4] + a[5] * P[7], a[1] * P[2] + a[3] * P[5] + a[5] * P[8],
    P[6], P[7], P[8],
  ];
  const misfit = (u: number, v: number, i: number) => 100 * Math.max(Math.abs(u - (us[i] as number)) / spanU, Math.abs(v - (vs[i] as number)) / spanV);
  const residuals = pts.map((p, i) => {
    const [u, v] = applyHomography(h, p[0], p[1]);
    return { sheet: Math.sqrt(sheetRss([p], [targets[i] as readonly [number, number]], (x, y) => applyHomography(h, x, y))), percentOfSpan: misfit(u, v, i) };
  });
  const lentFitter: Fitter = (from, to) => {
    const map = fitAffine(from.map((p) => onPage(p[0], p[1])), to.map((t) => t[0]), to.map((t) => t[1]));
    return map && ((x: number, y: number) => applyM(map, ...onPage(x, y)));
  };
  const own = expectedError(pts, targets, spanU, spanV, lentFitter, 6, options);
  if (!Number.isFinite(own)) return undefined;
  const expected = own + lent.percent;
  const notice = weak
    ? `${where}: its four anchors fit an affine map within placement error, which leaves a photo's perspective over the plot unseen, so the perspective of the page is taken from panel "${lent.panel}", whose anchors show it (a printed sheet is one plane); the residual shown (${expected.toFixed(2)} % of span) adds that panel's to this one's. Add a fifth anchor near a corner of this plot to check it.`
    : `${where}: its anchors cannot reveal the perspective of a photo, so the perspective of the page is taken from panel "${lent.panel}", whose anchors show it (a printed sheet is one plane); the residual shown (${expected.toFixed(2)} % of span) adds that panel's to this one's. Add a fourth anchor near the free corner of this plot to check it.`;
  return { ...finish('affine', { affine: m, homography: h, inverse: invertHomography(h) }, tx, ty, residuals, pts.length === 3 ? 'none' : 'fit', where, options, [notice], expected), perspectiveFrom: lent.panel };
}

/**
 * Lends the page's perspective to the panels whose anchors cannot reveal it. A photo's
 * perspective is one for the whole sheet: when a panel of the page has a projective map (its
 * anchors show perspective, or the user asked for it), a panel calibrated affine only because
 * its anchors could not show perspective (three, or along the axes), and left on 'auto', is
 * calibrated again through the lender's map (`lentPerspective`). The lender is the projective
 * panel with the smallest residual shown. Returns the panels calibrated again, by id; every
 * shell calibrates a page's panels through this, so all show the same maps.
 */
export function borrowPerspective(panels: readonly { id: string; anchors: readonly AnchorInput[]; options: CalibrateOptions; calibration: Calibration | undefined }[]): Map<string, Calibration> {
  const out = new Map<string, Calibration>();
  const lenders = panels.filter((p) => p.calibration?.projection === 'projective' && p.calibration.homography && p.calibration.perspectiveFrom === undefined);
  if (lenders.length === 0) return out;
  const lender = lenders.reduce((a, b) => ((b.calibration as Calibration).maxPercentOfSpan < (a.calibration as Calibration).maxPercentOfSpan ? b : a));
  const cal = lender.calibration as Calibration;
  const lent: PagePerspective = { homography: cal.homography as H9, panel: lender.id, percent: cal.maxPercentOfSpan };
  for (const p of panels) {
    if (p === lender || !(p.calibration?.perspectiveHidden || p.calibration?.perspectiveWeak) || (p.options.projection ?? 'auto') !== 'auto') continue;
    try {
      const again = calibrate(p.anchors, { ...p.options, pagePerspective: lent });
      if (again.perspectiveFrom !== undefined) out.set(p.id, again);
    } catch {
      // The panel keeps its own calibration.
    }
  }
  return out;
}

/** What calibrating a take-off panel reads of it: the record's own fields. */
export type PanelToCalibrate = Pick<Panel, 'id' | 'x_scale' | 'y_scale' | 'projection' | 'frame' | 'anchor_bias'>;

/** The calibration options of a take-off panel: its scales, name, projection, frame and the error its anchors share. */
export function panelCalibrateOptions(panel: PanelToCalibrate): CalibrateOptions {
  return { xScale: panel.x_scale, yScale: panel.y_scale, panel: panel.id, ...(panel.projection ? { projection: panel.projection } : {}), ...(panel.frame ? { frame: panel.frame } : {}), ...(panel.anchor_bias ? { anchorBias: panel.anchor_bias } : {}) };
}

/**
 * Calibrates every panel of a take-off's page, lending the page's perspective
 * (`borrowPerspective`). A panel whose anchors cannot define a calibration is in `failed` with
 * its CalibrationError, so that one panel does not cost the others.
 */
export function calibratePanels(panels: readonly (PanelToCalibrate & { anchors: readonly AnchorInput[] })[]): { calibrations: Map<string, Calibration>; failed: Map<string, CalibrationError> } {
  const failed = new Map<string, CalibrationError>();
  const list = panels.map((p) => {
    const options = panelCalibrateOptions(p);
    try {
      return { id: p.id, anchors: p.anchors, options, calibration: calibrate(p.anchors, options) as Calibration | undefined };
    } catch (error) {
      if (!(error instanceof CalibrationError)) throw error;
      failed.set(p.id, error);
      return { id: p.id, anchors: p.anchors, options, calibration: undefined };
    }
  });
  const lent = borrowPerspective(list);
  const calibrations = new Map<string, Calibration>();
  for (const p of list) {
    const cal = lent.get(p.id) ?? p.calibration;
    if (cal) calibrations.set(p.id, cal);
  }
  return { calibrations, failed };
}

/**
 * Projective when the anchors show perspective: with exactly 4, the affine map misses them by
 * more than placement explains (PERSPECTIVE_PERCENT); with 5 or more, the same, and either the
 * homography fits them with less than half the affine map's scatter per degree of freedom
 * (`fitRms`, sheet units: the two extra parameters explain what the affine map cannot), or it
 * predicts each left-out anchor clearly better (by a third or more). Leaving an anchor out of
 * five leaves four that fix a homography exactly, and often badly (two of them nearly on one
 * line with a third), so the left-out test alone misses plain perspective.
 */
export function chooseProjection(anchors: number, affineMax: number, looAffine: number[] | undefined, looProjective: number[] | undefined, fitRms?: { affine: number; projective: number }): boolean {
  if (anchors === 4) return affineMax > PERSPECTIVE_PERCENT;
  if (fitRms && affineMax > PERSPECTIVE_PERCENT && fitRms.projective < 0.5 * fitRms.affine) return true;
  // Otherwise only a homography that predicts every left-out anchor may win.
  if (!looAffine || !looProjective) return false;
  const a = Math.max(...looAffine);
  const p = Math.max(...looProjective);
  return a > PERSPECTIVE_PERCENT && p < (2 / 3) * a;
}

/**
 * Each anchor's misfit to the map fitted without it. An anchor whose leaving out leaves the
 * others unable to fix a map (three on one line, e.g. a middle anchor on a diagonal) gets the
 * largest misfit of the others; undefined when fewer than two anchors can be checked.
 */
function leaveOneOut<T>(n: number, fit: (keep: number[]) => T | undefined, error: (map: T, left: number) => number): number[] | undefined {
  const out: number[] = [];
  for (let i = 0; i < n; i++) {
    const keep = [...Array(n).keys()].filter((k) => k !== i);
    const map = fit(keep);
    out.push(map === undefined ? Number.NaN : error(map, i));
  }
  const seen = out.filter(Number.isFinite);
  if (seen.length < 2) return undefined;
  const worst = Math.max(...seen);
  return out.map((v) => (Number.isFinite(v) ? v : worst));
}

/**
 * All anchors lie on two lines through one of them (typically along the two axes from the
 * origin): the far corner of the plot is then unconstrained, and perspective cannot show.
 */
function alongTwoAxes(points: readonly (readonly [number, number])[]): boolean {
  const size = Math.max(...points.map((p) => Math.max(...points.map((q) => Math.hypot(p[0] - q[0], p[1] - q[1])))));
  return points.some((o) => {
    const directions: [number, number][] = [];
    for (const p of points) {
      const d = Math.hypot(p[0] - o[0], p[1] - o[1]);
      if (d < 1e-9 * size) continue;
      const u: [number, number] = [(p[0] - o[0]) / d, (p[1] - o[1]) / d];
      // Same line through o when the direction is parallel or opposite (within about 1°).
      if (!directions.some((v) => Math.abs(v[0] * u[1] - v[1] * u[0]) < 0.02)) directions.push(u);
      if (directions.length > 2) return false;
    }
    return true;
  });
}

/** Some four of the points have no three on one line (a homography can be fixed by them). */
function hasQuad(points: readonly (readonly [number, number])[]): boolean {
  const n = points.length;
  for (let a = 0; a < n; a++) for (let b = a + 1; b < n; b++) for (let c = b + 1; c < n; c++) for (let d = c + 1; d < n; d++) {
    if (!threeOnALine([points[a], points[b], points[c], points[d]] as (readonly [number, number])[])) return true;
  }
  return false;
}

/** Sheet distance between an anchor and where its values map through the full homography, scaled to its left-out misfit. */
function sheetDistance(hi: H9, at: readonly [number, number], us: readonly number[], vs: readonly number[], i: number, loo: readonly number[], h: H9): number {
  const [x, y] = applyHomography(hi, us[i] as number, vs[i] as number);
  const fitted = Math.hypot(x - at[0], y - at[1]);
  // Sheet units per % of span near the anchor, from the map's local scale.
  const [u0, v0] = applyHomography(h, at[0], at[1]);
  const [u1, v1] = applyHomography(h, at[0] + 1, at[1] + 1);
  const perUnit = Math.hypot(u1 - u0, v1 - v0) / Math.SQRT2;
  const spanU = span(us);
  const spanV = span(vs);
  const unitsPerPercent = perUnit > 0 ? (0.01 * Math.min(spanU, spanV)) / perUnit : 0;
  return Math.max(fitted, (loo[i] as number) * unitsPerPercent);
}

/** A map fitted from anchors to their values, as a function (undefined when the anchors cannot fix one). */
type Fitter = (from: readonly (readonly [number, number])[], to: readonly (readonly [number, number])[]) => ((x: number, y: number) => [number, number]) | undefined;

const affineFitter: Fitter = (from, to) => {
  const map = fitAffine(from, to.map((t) => t[0]), to.map((t) => t[1]));
  return map && ((x: number, y: number) => applyM(map, x, y));
};
const projectiveFitter: Fitter = (from, to) => {
  const map = fitHomography(from, to);
  return map && ((x: number, y: number) => applyHomography(map, x, y));
};

/**
 * The calibration's expected largest error over the plot, % of span: the anchors' placement
 * scatter σ carried through the fit (linear error propagation: each anchor moved along x and
 * along y, the map fixed again, the changes added in quadrature) to the corners, edge middles
 * and centre of the frame (or of the anchors' extent), the worst of them, times
 * EXPECTED_COVERAGE. σ (sheet units) pools the anchors' own misfit to the map, RSS over its
 * 2n − p degrees of freedom (n anchors, p parameters), with a prior of PRIOR_DOF degrees at
 * ANCHOR_UNCERTAINTY/√3 (a snap within half a unit either way, uniform): an exactly fixed map
 * (3 anchors affine, 4 projective) shows the prior alone, and a misfit (a misplaced anchor, or
 * perspective under an affine map) raises σ and the figure with it.
 */
function expectedError(pts: readonly (readonly [number, number])[], targets: readonly (readonly [number, number])[], spanU: number, spanV: number, fit: Fitter, params: number, options: Pick<CalibrateOptions, 'frame' | 'anchorBias'>): number {
  const frame = options.frame;
  const bias = options.anchorBias ?? 0;
  const base = fit(pts, targets);
  if (!base) return Number.NaN;
  const rss = sheetRss(pts, targets, base);
  const dof = Math.max(0, 2 * pts.length - params);
  const prior = ANCHOR_UNCERTAINTY / Math.sqrt(3);
  const sigma = Math.sqrt((rss + PRIOR_DOF * prior * prior) / (dof + PRIOR_DOF));
  const xs = frame ? [Math.min(frame[0], frame[2]), Math.max(frame[0], frame[2])] : [Math.min(...pts.map((p) => p[0])), Math.max(...pts.map((p) => p[0]))];
  const ys = frame ? [Math.min(frame[1], frame[3]), Math.max(frame[1], frame[3])] : [Math.min(...pts.map((p) => p[1])), Math.max(...pts.map((p) => p[1]))];
  const probes: [number, number][] = [];
  for (const fx of [0, 0.5, 1]) for (const fy of [0, 0.5, 1]) probes.push([(xs[0] as number) + fx * ((xs[1] as number) - (xs[0] as number)), (ys[0] as number) + fy * ((ys[1] as number) - (ys[0] as number))]);
  const at = probes.map(([x, y]) => base(x, y));
  const varU = new Array<number>(probes.length).fill(0);
  const varV = new Array<number>(probes.length).fill(0);
  // A small move keeps the propagation linear; its effect is scaled up to σ.
  const step = 0.1 * Math.max(sigma, 1e-6);
  for (let k = 0; k < pts.length; k++) {
    for (const [dx, dy] of [[step, 0], [0, step]] as const) {
      const moved = pts.map((p, j) => (j === k ? ([p[0] + dx, p[1] + dy] as const) : p));
      const map = fit(moved, targets);
      if (!map) return Number.NaN;
      probes.forEach(([x, y], i) => {
        const [u1, v1] = map(x, y);
        const [u0, v0] = at[i] as [number, number];
        varU[i] = (varU[i] as number) + ((u1 - u0) * (sigma / step)) ** 2;
        varV[i] = (varV[i] as number) + ((v1 - v0) * (sigma / step)) ** 2;
      });
    }
  }
  // A placement error the anchors share moves the whole map with it: more anchors do not
  // average it away. Either direction on the sheet, carried through the map's local slopes.
  if (bias > 0) {
    probes.forEach(([x, y], i) => {
      const [u0, v0] = at[i] as [number, number];
      const [ux, vx] = base(x + bias, y);
      const [uy, vy] = base(x, y + bias);
      varU[i] = (varU[i] as number) + (ux - u0) ** 2 + (uy - u0) ** 2;
      varV[i] = (varV[i] as number) + (vx - v0) ** 2 + (vy - v0) ** 2;
    });
  }
  // Per cent of the plot's own spans when the frame is known (the axes as drawn), else of the anchors'.
  const plotU = frame ? span(at.map((p) => p[0])) : spanU;
  const plotV = frame ? span(at.map((p) => p[1])) : spanV;
  let worst = 0;
  for (let i = 0; i < probes.length; i++) worst = Math.max(worst, Math.sqrt(varU[i] as number) / (plotU > 0 ? plotU : spanU), Math.sqrt(varV[i] as number) / (plotV > 0 ? plotV : spanV));
  return 100 * EXPECTED_COVERAGE * worst;
}

/** Sum of the anchors' squared misfits to a map, in sheet units: each data misfit carried back through the map's local Jacobian. */
function sheetRss(pts: readonly (readonly [number, number])[], targets: readonly (readonly [number, number])[], map: (x: number, y: number) => [number, number]): number {
  let rss = 0;
  for (let i = 0; i < pts.length; i++) {
    const [x, y] = pts[i] as readonly [number, number];
    const [u, v] = map(x, y);
    const [ux, vx] = map(x + 1, y);
    const [uy, vy] = map(x, y + 1);
    // Solve J·d = (target − mapped) for the sheet displacement d.
    const du = (targets[i] as readonly [number, number])[0] - u;
    const dv = (targets[i] as readonly [number, number])[1] - v;
    const a = ux - u;
    const b = uy - u;
    const c = vx - v;
    const d = vy - v;
    const det = a * d - b * c;
    if (det === 0) continue;
    const dx = (d * du - b * dv) / det;
    const dy = (a * dv - c * du) / det;
    rss += dx * dx + dy * dy;
  }
  return rss;
}

/** Least-squares affine map sheet → (u, v); undefined when the points do not determine it. */
function fitAffine(pts: readonly (readonly [number, number])[], us: readonly number[], vs: readonly number[]): M6 | undefined {
  if (pts.length < 3 || spreadRatio(pts) < 1e-6) return undefined;
  const [a, c, e] = fitPlane(pts, us);
  const [b, d, f] = fitPlane(pts, vs);
  const det = a * d - b * c;
  if (!Number.isFinite(det) || Math.abs(det) === 0) return undefined;
  return [a, b, c, d, e, f];
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
  return finish('axes', { affine: m }, tx, ty, residuals, 'fit', where, options, []);
}

interface Maps {
  affine: M6;
  homography?: H9;
  inverse?: H9;
}

function finish(
  method: Calibration['method'],
  maps: Maps,
  tx: AxisTransform,
  ty: AxisTransform,
  residuals: AnchorResidual[],
  residualKind: Calibration['residualKind'],
  where: string,
  options: CalibrateOptions,
  notices: readonly string[],
  expected?: number,
): Calibration {
  const warnAt = options.warnPercent ?? RESIDUAL_WARN_PERCENT;
  const what = residualKind === 'leave-one-out' ? ' (left out of the fit)' : '';
  const warnings = [
    ...residuals.flatMap((r, i) =>
      r.percentOfSpan > warnAt && residualKind !== 'estimated' && residualKind !== 'none'
        ? [`${where}: anchor ${i + 1} is off by ${r.percentOfSpan.toFixed(2)} % of the axis span${what} (${r.sheet.toFixed(2)} sheet units), more than ${warnAt} %; check its position and value.`]
        : [],
    ),
    ...notices,
  ];
  const rmsSheet = Math.sqrt(residuals.reduce((s, r) => s + r.sheet ** 2, 0) / Math.max(1, residuals.length));
  const m = maps.affine;
  const h = maps.homography;
  const hi = maps.inverse;
  const forward = h ? (x: number, y: number) => applyHomography(h, x, y) : (x: number, y: number) => applyM(m, x, y);
  const backward = hi ? (u: number, v: number) => applyHomography(hi, u, v) : (u: number, v: number) => invertM(m, u, v);
  return {
    method,
    projection: h ? 'projective' : 'affine',
    residualKind,
    ...(h ? { homography: h } : {}),
    xScale: tx.type,
    yScale: ty.type,
    matrix: m,
    residuals,
    rmsSheet,
    maxSheet: Math.max(0, ...residuals.map((r) => r.sheet)),
    maxPercentOfSpan: expected !== undefined && Number.isFinite(expected) ? expected : Math.max(0, ...residuals.map((r) => r.percentOfSpan)),
    anchorPercentOfSpan: Math.max(0, ...residuals.map((r) => r.percentOfSpan)),
    warnings,
    toData(p) {
      const [u, v] = forward(p[0], p[1]);
      return dataPoint(tx.inverse(u), ty.inverse(v));
    },
    toSheet(d) {
      const [x, y] = backward(tx.forward(d[0], 'x value'), ty.forward(d[1], 'y value'));
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
  const { sxx, sxy, syy } = principalAxis(points);
  return [sxx, sxy, syy];
}

/** Unit vector along the points' main direction (from the first point's side to the last's). */
function principalDirection(points: readonly (readonly [number, number])[]): [number, number] {
  const { angle } = principalAxis(points);
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

/** Least squares w = a + b·t; returns [a, b] (b is 0 where the t do not spread). */
export function fitLine(t: readonly number[], w: readonly number[]): [number, number] {
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
