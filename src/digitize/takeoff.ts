/**
 * Replaying a take-off headless: calibrate each panel, capture every trace, turn the captured
 * sheet points into SI data points (iso-traces by crossing the head traces of their panel),
 * then fit and check them into a curve set. The workbench and the command line both call this,
 * so a replay gives the curve set the workbench gave.
 *
 * Pure: the sheet arrives as the Sheet interface, already loaded.
 */
import { buildCurveSet, type MemberInput } from '../fit/build.ts';
import { makeFinding, sortFindings } from '../fit/checks/finding.ts';
import { CurveSet, type CurvePoint, type Finding, type Quantity } from '../model/curveset.ts';
import { TakeoffError, takeoffFamily, type Takeoff, type Trace } from '../model/takeoff.ts';
import { minFlowLimit } from '../fit/speedFamilyLimits.ts';
import { SG_REFERENCE_DENSITY, toSI, type Unit } from '../units/index.ts';
import { calibrate, type Calibration } from './calibration.ts';
import { captureTrace, type CaptureOptions, type CaptureResult } from './capture.ts';
import { isoCrossings } from './isoCrossings.ts';
import { sheetPoint, type SheetPoint } from './points.ts';
import { safeScale, type Sheet } from './sheet.ts';
import { strokeLines } from './vectorCapture.ts';
import type { StrokeLine } from './strokeJoin.ts';
import { resolveTakeoffUnits, traceUnits } from './takeoffUnits.ts';
import type { RasterImage } from './raster.ts';

export interface ReplayOptions {
  /** File name of the take-off, for provenance. */
  takeoffName?: string;
  /** File name of the sheet, for provenance (defaults to the take-off's `sheet`). */
  sheetFile?: string;
  /** Use each trace's saved `captured` points instead of capturing again. */
  useCaptured?: boolean;
  /** Creation time written into the curve set (ISO 8601); defaults to now. */
  created?: string;
  capture?: CaptureOptions;
  /** Pixels per sheet unit when a PDF page must be rendered for line following (default 4). */
  rasterScale?: number;
}

export interface TraceOutcome {
  index: number;
  id: string;
  /** How the points were found (for saved points, as recorded when they were saved). */
  how: CaptureResult['how'] | 'saved';
  /** True when the points come from the take-off file's `captured` field. */
  fromFile: boolean;
  /** Captured points, sheet coordinates. */
  points: SheetPoint[];
  notes: string[];
}

export interface ReplayResult {
  curveSet: CurveSet;
  traces: TraceOutcome[];
  calibrations: ReadonlyMap<string, Calibration>;
}

const CAPTURE_ERRORS = ['CaptureError', 'TraceInputError'];
const METHOD = 'Take-off replay (calibration, capture, iso crossings)';

export async function replayTakeoff(takeoff: Takeoff, sheet: Sheet, options: ReplayOptions = {}): Promise<ReplayResult> {
  const units = resolveTakeoffUnits(takeoff);
  const findings: Finding[] = [];
  const note = (code: string, severity: Finding['severity'], message: string, trace?: string, figures?: Record<string, number>) =>
    findings.push(makeFinding({ code, severity, message, method: METHOD, ...(trace ? { trace } : {}), ...(figures ? { figures } : {}) }));

  if (takeoff.sheet_sha256 && takeoff.sheet_sha256 !== sheet.sha256) {
    note('takeoff.sheet-changed', 'warn', `The sheet is not the one the points were captured from (its SHA-256 differs); check that the anchors and guides still sit on its lines.`);
  }

  const calibrations = new Map<string, Calibration>();
  for (const panel of takeoff.panels) {
    const cal = calibrate(panel.anchors, { xScale: panel.x_scale, yScale: panel.y_scale, panel: panel.id });
    calibrations.set(panel.id, cal);
    for (const w of cal.warnings) note('takeoff.calibration-residual', 'warn', w, undefined, { max_percent_of_span: cal.maxPercentOfSpan, max_sheet: cal.maxSheet });
  }

  let lines: Promise<readonly StrokeLine[]> | null = null;
  let raster: Promise<RasterImage> | null = null;
  const source = {
    kind: sheet.kind,
    lines: () => (lines ??= sheet.paths().then((p) => strokeLines(p, options.capture?.vector))),
    raster: () => (raster ??= sheet.render(sheet.kind === 'image' ? 1 : safeScale(sheet, options.rasterScale ?? 4))),
  };

  const outcomes: TraceOutcome[] = [];
  for (const [index, trace] of takeoff.traces.entries()) {
    const id = trace.id ?? String(index + 1);
    const saved = trace.captured && trace.captured.length > 0 ? trace.captured.map(([x, y]) => sheetPoint(x, y)) : null;
    const hasInput = (trace.points?.length ?? 0) > 0 || (trace.guides?.length ?? 0) > 0;
    let outcome: TraceOutcome;
    if (saved && (options.useCaptured || !hasInput)) {
      outcome = { index, id, how: trace.captured_by ?? 'saved', fromFile: true, points: saved, notes: [] };
    } else {
      const got = await captureTrace(
        { points: trace.points?.map(([x, y]) => sheetPoint(x, y)), guides: trace.guides?.map(([x, y]) => sheetPoint(x, y)), method: trace.method, extent: trace.extent },
        source,
        options.capture,
      ).catch((error: unknown) => {
        // Say which trace could not be captured; other errors pass through unchanged.
        if (error instanceof Error && CAPTURE_ERRORS.includes(error.name)) throw new TakeoffError(`Trace ${id} (${describeTrace(trace)}): ${error.message}`);
        throw error;
      });
      outcome = { index, id, how: got.how, fromFile: false, points: got.points, notes: got.notes };
      if (got.notes.length > 0) {
        const lost = got.lost.length > 0;
        note(lost ? 'takeoff.capture-lost' : 'takeoff.capture-fallback', lost ? 'warn' : 'note', `Trace ${id} (${describeTrace(trace)}): ${got.notes.join(' ')}`, id);
      }
    }
    if (outcome.points.length < 2) throw new TakeoffError(`Trace ${id} (${describeTrace(trace)}) captured fewer than 2 points; place guides on its line or give its points.`);
    const frame = takeoff.panels.find((p) => p.id === trace.panel)?.frame;
    const outside = frame ? outcome.points.filter((p) => !insideFrame(p, frame)).length : 0;
    if (outside > 0) {
      note('takeoff.outside-frame', 'warn', `Trace ${id} (${describeTrace(trace)}): ${outside} of ${outcome.points.length} captured points lie outside the frame of panel "${trace.panel}"; check that the guides sit on this panel's line.`, id, { outside });
    }
    outcomes.push(outcome);
  }

  // Data points per diameter and quantity, SI.
  const members = new Map<number, MemberInput>();
  const family = takeoffFamily(takeoff);
  const memberFor = (diameter: number, unit: Unit) => {
    let m = members.get(diameter);
    if (!m) members.set(diameter, (m = family === 'speed' ? { speed_rpm: diameter, points: {} } : { diameter_m: toSI(diameter, unit), points: {} }));
    return m;
  };
  const how = new Map<Quantity, Set<string>>();
  const add = (quantity: Quantity, diameter: number, pts: CurvePoint[], by: string) => {
    const list = (memberFor(diameter, units.diameter).points[quantity] ??= []);
    list.push(...pts);
    const ways = how.get(quantity) ?? new Set<string>();
    how.set(quantity, ways.add(by));
  };

  const minFlowLine: CurvePoint[] = [];
  for (const outcome of outcomes) {
    const trace = takeoff.traces[outcome.index] as Trace;
    if (trace.iso !== undefined) continue;
    if (trace.limit === 'min-flow') {
      const cal = calibrations.get(trace.panel) as Calibration;
      const u = traceUnits(takeoff, units, trace);
      minFlowLine.push(...outcome.points.map((p) => cal.toData(p)).map((d) => [toSI(d[0], u.flow), toSI(d[1], u.value)] as CurvePoint));
      continue;
    }
    const cal = calibrations.get(trace.panel) as Calibration;
    const u = traceUnits(takeoff, units, trace);
    const raw = outcome.points.map((p) => cal.toData(p)).map((d) => [toSI(d[0], u.flow), toSI(d[1], u.value)] as CurvePoint);
    const pts = keepFlows(raw, (dropped) =>
      note('takeoff.negative-flow', 'warn', `Trace ${outcome.id} (${describeTrace(trace)}): ${dropped} point${dropped === 1 ? '' : 's'} left of zero flow were dropped; check the panel's anchors.`, outcome.id, { dropped }),
    );
    add(trace.quantity, (trace.diameter ?? trace.speed) as number, pts, outcome.how);
  }

  for (const outcome of outcomes) {
    const trace = takeoff.traces[outcome.index] as Trace;
    if (trace.iso === undefined) continue;
    const cal = calibrations.get(trace.panel) as Calibration;
    const u = traceUnits(takeoff, units, trace);
    const heads = outcomes
      .filter((o) => {
        const t = takeoff.traces[o.index] as Trace;
        return t.panel === trace.panel && t.quantity === 'head' && t.iso === undefined && (t.diameter ?? t.speed) !== undefined;
      })
      .map((o) => ({ key: ((takeoff.traces[o.index] as Trace).diameter ?? (takeoff.traces[o.index] as Trace).speed) as number, points: o.points }));
    const crossings = isoCrossings(outcome.points, heads);
    if (crossings.length === 0) {
      note('takeoff.iso-no-crossing', 'warn', `Iso-trace ${outcome.id} (${describeTrace(trace)}) crosses no head trace of panel "${trace.panel}"; it adds no points. Extend it across the head curves or trace those curves.`, outcome.id);
      continue;
    }
    for (const c of crossings) {
      const flow = toSI(cal.toData(c.at)[0], u.flow);
      if (flow < 0) continue;
      add(trace.quantity, c.key, [[flow, toSI(trace.iso, u.value)]], 'iso');
    }
  }

  if (members.size === 0) throw new TakeoffError('The take-off has no trace with a diameter; give each head, power, NPSHr or efficiency trace its impeller diameter.');

  const readingAccuracy: Partial<Record<Quantity, number>> = {};
  for (const [quantity, ways] of how) {
    // Exact vector geometry deserves a tighter reading accuracy than a scan.
    if ([...ways].every((w) => w === 'vector' || w === 'iso')) {
      const largest = Math.max(...[...members.values()].flatMap((m) => (m.points[quantity] ?? []).map((p) => Math.abs(p[1]))));
      readingAccuracy[quantity] = quantity === 'efficiency' ? 0.003 : Math.max(1e-9, 0.0005 * largest);
    }
  }

  const { speed_rpm, specific_gravity: sg, ...pump } = takeoff.pump;
  const built = buildCurveSet({
    pump,
    speed_rpm,
    family,
    fluid: { name: sg === 1 ? 'water' : `liquid of SG ${sg}`, density_kg_m3: sg * SG_REFERENCE_DENSITY, specific_gravity: sg },
    display_units: units.display,
    provenance: {
      source: { file: options.sheetFile ?? takeoff.sheet, sha256: sheet.sha256, page: takeoff.page },
      ...(options.takeoffName ? { takeoff: options.takeoffName } : {}),
      ...(options.created ? { created: options.created } : {}),
      notes: [`captured from a ${sheet.kind} sheet: ${outcomes.length} traces on ${takeoff.panels.length} panel${takeoff.panels.length === 1 ? '' : 's'}`],
    },
    members: [...members.entries()].sort((a, b) => b[0] - a[0]).map(([, m]) => m),
    readingAccuracy,
  });
  const limits = minFlowLimit(takeoff.min_flow !== undefined ? toSI(takeoff.min_flow, units.flow) : undefined, minFlowLine);
  const curveSet = CurveSet.parse({ ...built, ...(limits ? { limits } : {}), findings: sortFindings([...built.findings, ...findings]) });
  return { curveSet, traces: outcomes, calibrations };
}

/** Inside the frame [left, top, right, bottom], with 1 % of its size to spare for line widths and rounding. */
function insideFrame(p: SheetPoint, frame: readonly [number, number, number, number]): boolean {
  const [l, t, r, b] = [Math.min(frame[0], frame[2]), Math.min(frame[1], frame[3]), Math.max(frame[0], frame[2]), Math.max(frame[1], frame[3])];
  const mx = 0.01 * (r - l);
  const my = 0.01 * (b - t);
  return p[0] >= l - mx && p[0] <= r + mx && p[1] >= t - my && p[1] <= b + my;
}

/** Clamps flows a hair below zero (calibration noise at the head axis) and drops the rest. */
function keepFlows(points: CurvePoint[], dropped: (n: number) => void): CurvePoint[] {
  const largest = Math.max(0, ...points.map((p) => Math.abs(p[0])));
  const out: CurvePoint[] = [];
  let lost = 0;
  for (const [q, y] of points) {
    if (q >= 0) out.push([q, y]);
    else if (q >= -0.01 * largest) out.push([0, y]);
    else lost++;
  }
  if (lost > 0) dropped(lost);
  return out;
}

export function describeTrace(trace: Trace): string {
  const what = trace.iso !== undefined ? `${trace.quantity} iso-trace ${trace.iso}` : trace.speed !== undefined ? `${trace.quantity} at ${trace.speed} rpm` : `${trace.quantity} at diameter ${trace.diameter}`;
  return `${what} on panel "${trace.panel}"`;
}
