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
import { z } from 'zod';
import { Finding as FindingSchema, Limits, type CurvePoint, type CurveSet, type DrawnAs, type Finding, type Quantity } from '../model/curveset.ts';
import { TakeoffError, takeoffFamily, type Takeoff, type Trace } from '../model/takeoff.ts';
import { minFlowLimit } from '../fit/speedFamilyLimits.ts';
import { SG_REFERENCE_DENSITY, toSI, type Unit } from '../units/index.ts';
import { formatSI } from '../units/format.ts';
import type { LostStretch } from './rasterTrace.ts';
import { auditIsoCrossings, auditTraces, type AuditedTrace, type AuditFinding, type IsoCount } from './traceAudit.ts';
import { calibratePanels, type Calibration } from './calibration.ts';
import { captureTrace, type CaptureOptions, type CaptureResult } from './capture.ts';
import { DEFAULT_TOUCH_TOLERANCE, endDirection, isoCrossings, REACH_HEAD_WIDTHS, REACH_ISO_WIDTHS, REACH_SLACK, readableCrossings, type IsoCrossing } from './isoCrossings.ts';
import { guideBeyondCrossing, guidesOffCrossings, type CrossedLine } from './isoGuides.ts';
import { arcLengths, nearestOnPolyline } from './polyline.ts';
import { sheetPoint, type SheetPoint } from './points.ts';
import { safeScale, type Sheet } from './sheet.ts';
import { strokeLines } from './vectorCapture.ts';
import { siblingGuides } from './vectorChoice.ts';
import { companionGuides } from './companions.ts';
import type { StrokeLine } from './strokeJoin.ts';
import { checkTotalPoints, checkTracePoints } from '../model/limits.ts';
import { resolveTakeoffUnits, traceUnits } from './takeoffUnits.ts';
import type { RasterImage } from './raster.ts';

const Findings = z.array(FindingSchema);

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
  /** Re-trace raster traces at the file's own resolution where the page was read reduced on load (closeTrace.ts). */
  fullResolution?: boolean;
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
  /** Stretches a raster capture could not see (empty or absent otherwise). */
  lost?: LostStretch[];
  /** Width of the followed line, sheet units (raster captures only). */
  lineWidth?: number;
}

export interface ReplayResult {
  curveSet: CurveSet;
  traces: TraceOutcome[];
  calibrations: ReadonlyMap<string, Calibration>;
  /**
   * The trace ↔ member link, as the replay made it: trace id → indexes into `curveSet.members`
   * of the members its points went into (one for a curve trace; one per head curve crossed for
   * an iso-trace; an empty list, or no entry, for a trace that added nothing and for a
   * minimum-flow line). Read it here: no layer rebuilds it by comparing diameters.
   */
  traceMembers: ReadonlyMap<string, readonly number[]>;
  /** Iso-trace id → where it met each head trace (member key: diameter or speed as the take-off writes it). */
  crossings: ReadonlyMap<string, readonly IsoCrossing<number>[]>;
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

  // A panel whose anchors define no calibration costs its own traces only: a fail, and the rest
  // goes on (as a trace that finds no line does); with no panel left there is nothing to read.
  const { calibrations, failed } = calibratePanels(takeoff.panels);
  if (calibrations.size === 0 && failed.size > 0) throw [...failed.values()][0] as Error;
  for (const [id, error] of failed) {
    const lost = takeoff.traces.filter((t) => t.panel === id).length;
    note('takeoff.panel-uncalibrated', 'fail', `${error.message} Its ${lost} trace${lost === 1 ? '' : 's'} were left out of the curve set until its anchors are set.`, undefined, { traces_left_out: lost });
  }
  for (const cal of calibrations.values()) {
    for (const w of cal.warnings) note('takeoff.calibration-residual', 'warn', w, undefined, { max_percent_of_span: cal.maxPercentOfSpan, max_sheet: cal.maxSheet });
  }

  let lines: Promise<readonly StrokeLine[]> | null = null;
  let raster: Promise<RasterImage> | null = null;
  const source = {
    kind: sheet.kind,
    lines: () => (lines ??= sheet.paths().then((p) => strokeLines(p, options.capture?.vector))),
    raster: () => (raster ??= sheet.render(sheet.kind === 'image' ? 1 : safeScale(sheet, options.rasterScale ?? 4))),
    closeRaster: options.fullResolution ? sheet.region : undefined,
  };

  const outcomes: TraceOutcome[] = [];
  let pointsSoFar = 0;
  // Each trace's guides, so a vector capture can tell which of several near lines is whose (vectorChoice.ts).
  const siblings = siblingGuides(takeoff.traces);
  // Each trace's companion: the same impeller's head trace, whose colour a raster trace tries where its guides sample lines run together.
  const companions = companionGuides(takeoff.traces);
  const captureOne = async (index: number, trace: Trace, guides: readonly SheetPoint[] | undefined, captured?: CaptureResult): Promise<void> => {
    const id = trace.id ?? String(index + 1);
    const saved = trace.captured && trace.captured.length > 0 ? trace.captured.map(([x, y]) => sheetPoint(x, y)) : null;
    const hasInput = (trace.points?.length ?? 0) > 0 || (trace.guides?.length ?? 0) > 0;
    let outcome: TraceOutcome;
    if (saved && (options.useCaptured || !hasInput)) {
      outcome = { index, id, how: trace.captured_by ?? 'saved', fromFile: true, points: saved, notes: [] };
    } else {
      const got = captured ?? await captureTrace(
        { points: trace.points?.map(([x, y]) => sheetPoint(x, y)), guides, method: trace.method, extent: trace.extent, frame: takeoff.panels.find((p) => p.id === trace.panel)?.frame, siblings: siblings.filter((_, k) => k !== index), companions: companions[index] },
        source,
        options.capture,
      ).catch((error: unknown) => {
        // Say which trace could not be captured; other errors pass through unchanged.
        if (error instanceof Error && CAPTURE_ERRORS.includes(error.name)) throw new TakeoffError(`Trace ${id} (${describeTrace(trace, takeoff.units.diameter)}): ${error.message}`);
        throw error;
      });
      outcome = { index, id, how: got.how, fromFile: false, points: got.points, notes: got.notes, lost: got.lost, ...(got.lineWidth ? { lineWidth: got.lineWidth } : {}) };
      if (got.notes.length > 0) {
        const lost = got.lost.length > 0;
        note(lost ? 'takeoff.capture-lost' : 'takeoff.capture-fallback', lost ? 'warn' : 'note', `Trace ${id} (${describeTrace(trace, takeoff.units.diameter)}): ${got.notes.join(' ')}`, id);
      }
      for (const doubt of got.doubts ?? []) note(doubt.code, 'warn', `Trace ${id} (${describeTrace(trace, takeoff.units.diameter)}): ${doubt.message}.`, id);
      for (const sentence of got.moved ?? []) note('takeoff.guide-on-label', 'note', `Trace ${id} (${describeTrace(trace, takeoff.units.diameter)}): ${sentence}`, id);
    }
    checkTracePoints(outcome.points.length, `Trace ${id} (${describeTrace(trace, takeoff.units.diameter)})`); // model/limits.ts
    checkTotalPoints((pointsSoFar += outcome.points.length), 'The take-off');
    if (outcome.points.length < 2) {
      // One trace that found no line must not cost the others: it is a fail, and it adds nothing.
      note('takeoff.trace-empty', 'fail', `Trace ${id} (${describeTrace(trace, takeoff.units.diameter)}) captured fewer than 2 points, so it adds nothing; place its guides on the line where it stands alone, or give its points.`, id);
      return;
    }
    const frame = takeoff.panels.find((p) => p.id === trace.panel)?.frame;
    const outside = frame ? outcome.points.filter((p) => !insideFrame(p, frame)).length : 0;
    if (outside > 0) {
      note('takeoff.outside-frame', 'warn', `Trace ${id} (${describeTrace(trace, takeoff.units.diameter)}): ${outside} of ${outcome.points.length} captured points lie outside the frame of panel "${trace.panel}"; check that the guides sit on this panel's line.`, id, { outside });
    }
    outcomes.push(outcome);
  };
  const guidesOf = (trace: Trace) => trace.guides?.map(([x, y]) => sheetPoint(x, y));
  // On a scan or photo, iso-traces are captured after the curves: a guide clicked where an
  // iso-line crosses a traced head curve is moved onto the iso-line alone (isoGuides.ts), so
  // that its line model is the thin line's and not the thick head curve's.
  const isoLater = (trace: Trace) => sheet.kind !== 'vector-pdf' && trace.iso !== undefined && trace.method !== 'vector' && (trace.guides?.length ?? 0) > 0;
  for (const [index, trace] of takeoff.traces.entries()) if (!isoLater(trace) && !failed.has(trace.panel)) await captureOne(index, trace, guidesOf(trace));
  for (const [index, trace] of takeoff.traces.entries()) {
    if (!isoLater(trace) || failed.has(trace.panel)) continue;
    const heads = outcomes.filter((o) => {
      const t = takeoff.traces[o.index] as Trace;
      return t.panel === trace.panel && t.quantity === 'head' && t.iso === undefined && o.lineWidth !== undefined;
    });
    const id = trace.id ?? String(index + 1);
    const wanted = (trace.points?.length ?? 0) === 0 && !(trace.captured && trace.captured.length > 0 && options.useCaptured);
    if (heads.length === 0 || !wanted) {
      await captureOne(index, trace, guidesOf(trace));
      continue;
    }
    const image = await source.raster();
    const lines = heads.map((o) => ({ points: o.points, width: o.lineWidth as number }));
    const { guides, moved } = guidesOffCrossings(image, guidesOf(trace) ?? [], lines);
    if (moved.length > 0) {
      note('takeoff.guide-on-crossing', 'note', `Iso-trace ${id} (${describeTrace(trace, takeoff.units.diameter)}): guide${moved.length === 1 ? '' : 's'} ${moved.map((m) => m.index + 1).join(', ')} sat where the iso-line crosses a head curve; the line was sampled a few line widths along the iso-line instead, so that the thick head curve does not lend it its colour and width.`, id);
    }
    const frame = takeoff.panels.find((p) => p.id === trace.panel)?.frame;
    const through = await throughCrossings(image, guides, lines, frame, (g) => captureTrace({ guides: g, method: trace.method, extent: trace.extent, frame }, source, options.capture).catch(() => undefined));
    const added = through.guides.length - guides.length;
    if (added > 0) {
      note('takeoff.iso-through-crossing', 'note', `Iso-trace ${id} (${describeTrace(trace, takeoff.units.diameter)}) stopped where it meets a head curve and was followed on beyond it (${added} guide${added === 1 ? '' : 's'} added past the crossing${added === 1 ? '' : 's'}).`, id);
    }
    await captureOne(index, trace, through.guides, through.captured);
  }
  outcomes.sort((a, b) => a.index - b.index);

  // Data points per diameter and quantity, SI.
  const members = new Map<number, MemberInput>();
  const family = takeoffFamily(takeoff);
  const memberFor = (diameter: number, unit: Unit) => {
    let m = members.get(diameter);
    if (!m) members.set(diameter, (m = family === 'speed' ? { speed_rpm: diameter, points: {} } : { diameter_m: toSI(diameter, unit), points: {} }));
    return m;
  };
  const how = new Map<Quantity, Set<string>>();
  /** Trace id → the member keys (diameter or speed, as the take-off writes them) its points went into. */
  const traceKeys = new Map<string, Set<number>>();
  const add = (quantity: Quantity, diameter: number, pts: CurvePoint[], by: string, trace: string) => {
    const member = memberFor(diameter, units.diameter);
    const keys = traceKeys.get(trace) ?? new Set<number>();
    traceKeys.set(trace, keys.add(diameter));
    const list = (member.points[quantity] ??= []);
    for (const p of pts) list.push(p);
    const named = ((member.sources ??= {})[quantity] ??= []); // names a point the fit misses by its trace
    for (let i = 0; i < pts.length; i++) named.push({ text: `${by.startsWith('iso') ? 'iso-trace' : 'trace'} ${trace}`, trace });
    const ways = how.get(quantity) ?? new Set<string>();
    how.set(quantity, ways.add(by));
    const drawn: DrawnAs = by.startsWith('iso') ? 'iso-lines' : 'curve';
    const had = (member.drawnAs ??= {})[quantity];
    member.drawnAs[quantity] = had === undefined || had === drawn ? drawn : 'both';
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
      note('takeoff.negative-flow', 'warn', `Trace ${outcome.id} (${describeTrace(trace, takeoff.units.diameter)}): ${dropped} point${dropped === 1 ? '' : 's'} left of zero flow were dropped; check the panel's anchors.`, outcome.id, { dropped }),
    );
    add(trace.quantity, (trace.diameter ?? trace.speed) as number, pts, outcome.how, outcome.id);
  }

  const isoCounts: IsoCount[] = [];
  const crossingsOf = new Map<string, readonly IsoCrossing<number>[]>();
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
      .map((o) => ({ key: ((takeoff.traces[o.index] as Trace).diameter ?? (takeoff.traces[o.index] as Trace).speed) as number, points: o.points, width: o.lineWidth, how: o.how }));
    const crossings = isoCrossings(outcome.points, heads, DEFAULT_TOUCH_TOLERANCE, isoReach(cal, takeoff.panels.find((p) => p.id === trace.panel)?.anchors ?? []), outcome.lineWidth ?? 0);
    crossingsOf.set(outcome.id, crossings);
    const perHead = new Map<number, number>();
    for (const c of crossings) perHead.set(c.key, (perHead.get(c.key) ?? 0) + 1);
    isoCounts.push({ trace: outcome.id, describe: describeTrace(trace, takeoff.units.diameter), level: trace.iso, perHead });
    if (crossings.length === 0) {
      note('takeoff.iso-no-crossing', 'warn', `Iso-trace ${outcome.id} (${describeTrace(trace, takeoff.units.diameter)}) crosses no head trace of panel "${trace.panel}"; it adds no points. Extend it across the head curves or trace those curves.`, outcome.id);
      continue;
    }
    // A crossing is exact only where both lines are drawn paths; on a scan it is a reading.
    const exactAt = (key: number) => outcome.how === 'vector' && heads.every((h) => h.key !== key || h.how === 'vector');
    for (const c of readableCrossings(crossings)) {
      const flow = toSI(cal.toData(c.at)[0], u.flow);
      if (flow < 0) continue;
      add(trace.quantity, c.key, [[flow, toSI(trace.iso, u.value)]], exactAt(c.key) ? 'iso' : 'iso-read', outcome.id);
    }
  }

  // No silent misses: every trace held against the others (see traceAudit.ts).
  const panelOf = (t: Trace) => takeoff.panels.find((p) => p.id === t.panel);
  const audited: AuditedTrace[] = outcomes.map((o) => {
    const trace = takeoff.traces[o.index] as Trace;
    const cal = calibrations.get(trace.panel) as Calibration;
    const u = traceUnits(takeoff, units, trace);
    const length = o.points.length >= 2 ? (arcLengths(o.points).at(-1) as number) : 0;
    return {
      id: o.id,
      describe: describeTrace(trace, takeoff.units.diameter),
      quantity: trace.quantity,
      diameter: trace.diameter,
      speed: trace.speed,
      iso: trace.iso,
      how: o.how,
      flows: o.points.map((p) => toSI(cal.toData(p)[0], u.flow)),
      values: panelOf(trace)?.x_scale === 'log' || panelOf(trace)?.y_scale === 'log' ? undefined : o.points.map((p) => cal.toData(p)[1]),
      valueSpan: valueSpan(panelOf(trace)?.anchors ?? []),
      panel: trace.panel,
      length,
      lostLength: lostLength(o.lost ?? [], trace),
      refusedGuides: refusedGuides(o.lost ?? [], o.points, o.lineWidth),
      axisFlow: panelOf(trace)?.x_scale === 'log' ? undefined : axisFlow(panelOf(trace)?.anchors ?? [], u.flow),
    };
  });
  const said = (f: AuditFinding) => note(f.code, f.severity, f.message, f.trace, f.figures);
  auditTraces(audited, (q) => formatSI(q, units.flow, 3)).forEach(said);
  const headDiameters = [...new Set(audited.filter((t) => t.quantity === 'head' && t.iso === undefined && t.diameter !== undefined).map((t) => t.diameter as number))];
  auditIsoCrossings(isoCounts, headDiameters).forEach(said);

  if (members.size === 0) throw new TakeoffError('The take-off has no trace with a diameter or a speed; give each head, power, NPSHr or efficiency trace its impeller diameter (or its speed, on a sheet drawn for one impeller at several speeds).');

  const readingAccuracy: Partial<Record<Quantity, number>> = {};
  const exactQuantities: Quantity[] = [];
  for (const [quantity, ways] of how) {
    if (![...ways].every((w) => w === 'vector' || w === 'iso')) continue;
    readingAccuracy[quantity] = drawingPrecision(quantity, members.values());
    exactQuantities.push(quantity);
  }

  // Members largest first; buildCurveSet keeps them one for one and in this order.
  const ordered = [...members.entries()].sort((a, b) => b[0] - a[0]);
  const memberIndex = new Map(ordered.map(([key], i) => [key, i]));
  const traceMembers = new Map<string, readonly number[]>(
    outcomes.map((o) => [o.id, [...(traceKeys.get(o.id) ?? [])].map((key) => memberIndex.get(key) as number).sort((a, b) => a - b)]),
  );

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
      notes: [
        `captured from a ${sheet.kind} sheet: ${outcomes.length} traces on ${takeoff.panels.length} panel${takeoff.panels.length === 1 ? '' : 's'}`,
        ...[...calibrations].map(([id, c]) => `panel "${id}": ${c.projection} calibration, residual ${c.maxPercentOfSpan.toFixed(3)} % of span (${c.residualKind})`),
      ],
    },
    members: ordered.map(([, m]) => m),
    readingAccuracy,
    exactQuantities,
  });
  const limits = minFlowLimit(takeoff.min_flow !== undefined ? toSI(takeoff.min_flow, units.flow) : undefined, minFlowLine);
  // buildCurveSet validated the set; only what is added here is validated again (in schema order: limits, then findings).
  const { findings: fitted, ...rest } = built;
  const curveSet: CurveSet = { ...rest, ...(limits ? { limits: Limits.parse(limits) } : {}), findings: Findings.parse(sortFindings([...fitted, ...findings])) };
  return { curveSet, traces: outcomes, calibrations, traceMembers, crossings: crossingsOf };
}

/**
 * An iso-line is followed from crossing to crossing: where a followed iso trace ends on a head
 * curve (the thick curve stops the follower) and the iso-line goes on beyond it, a guide is
 * added there (isoGuides.ts, `guideBeyondCrossing`) and the line followed again, up to once per
 * head curve. Returns the guides to trace with, and their capture when it was made.
 */
async function throughCrossings(
  image: RasterImage,
  start: readonly SheetPoint[],
  lines: readonly CrossedLine[],
  frame: readonly [number, number, number, number] | undefined,
  capture: (guides: readonly SheetPoint[]) => Promise<CaptureResult | undefined>,
): Promise<{ guides: SheetPoint[]; captured?: CaptureResult }> {
  let guides = [...start];
  for (let round = 0; round < lines.length; round++) {
    const got = await capture(guides);
    if (!got || got.how !== 'raster' || got.points.length < 2 || got.lost.length > 0) return { guides, ...(got ? { captured: got } : {}) };
    const pts = got.points;
    const isoWidth = got.lineWidth ?? 0;
    let added = false;
    for (const atEnd of [false, true]) {
      const end = (atEnd ? pts[pts.length - 1] : pts[0]) as SheetPoint;
      const dir = endDirection(pts, atEnd, Math.max(20, 6 * isoWidth));
      if (!dir) continue;
      const crossing = isoCrossings(pts, lines.map((l, key) => ({ key, points: l.points, width: l.width })), DEFAULT_TOUCH_TOLERANCE, 0, isoWidth)
        .filter((c) => Math.hypot(c.at[0] - end[0], c.at[1] - end[1]) <= REACH_HEAD_WIDTHS * (lines[c.key] as CrossedLine).width + REACH_ISO_WIDTHS * isoWidth + REACH_SLACK)
        .sort((a, b) => Math.hypot(a.at[0] - end[0], a.at[1] - end[1]) - Math.hypot(b.at[0] - end[0], b.at[1] - end[1]))[0];
      if (!crossing) continue;
      // Only towards another head curve: an iso-line ends on the outermost head curves it meets.
      const ahead: SheetPoint[] = [crossing.at, sheetPoint(crossing.at[0] + 4000 * dir[0], crossing.at[1] + 4000 * dir[1])];
      const further = lines.some((l, key) => key !== crossing.key && isoCrossings(ahead, [{ key, points: l.points }], 0).length > 0);
      if (!further) continue;
      const next = guideBeyondCrossing(image, crossing.at, dir, lines);
      if (!next || (frame && !insideFrame(next, frame)) || nearestOnPolyline(pts, next).distance < 2) continue;
      guides = atEnd ? [...guides, next] : [next, ...guides];
      added = true;
    }
    if (!added) return { guides, captured: got };
  }
  return { guides };
}

/**
 * How far an iso-line's end is extended to meet a head curve, sheet units: 2 % of the panel's
 * flow span (a tolerance in data units: common practice, about the gap a thick head curve
 * leaves at an iso-line's end on a printed sheet), measured at the middle of the panel.
 */
/**
 * The reading accuracy of a quantity read only from drawn paths and their exact crossings: the
 * precision of the drawing itself, not of an eye. A vector path holds the maker's plotted line
 * to about 0.01 pt (flatten.ts) and a crossing of two paths is exact; what is left is how finely
 * the maker plotted the curve, taken as 0.05 % of the quantity's largest value (about 0.15 pt on
 * a 300-pt panel, below a hairline; common practice). The same for every quantity: efficiency
 * drawn as a curve or as iso-lines is no coarser than head (a fixed 0.3 points let a parabola
 * stand 0.22 points off an exactly drawn efficiency curve).
 */
function drawingPrecision(quantity: Quantity, members: Iterable<MemberInput>): number {
  const largest = Math.max(0, ...[...members].flatMap((m) => (m.points[quantity] ?? []).map((p) => Math.abs(p[1]))));
  return Math.max(1e-9, 0.0005 * largest);
}

function isoReach(cal: Calibration, anchors: readonly { x?: number | undefined; y?: number | undefined }[]): number {
  const xs = anchors.flatMap((a) => (a.x === undefined ? [] : [a.x]));
  const ys = anchors.flatMap((a) => (a.y === undefined ? [] : [a.y]));
  if (xs.length < 2 || ys.length < 2 || cal.xScale === 'log') return 0;
  const x0 = Math.min(...xs);
  const x1 = Math.max(...xs);
  const ym = (Math.min(...ys) + Math.max(...ys)) / 2;
  const a = cal.toSheet([(x0 + x1) / 2, ym]);
  const b = cal.toSheet([(x0 + x1) / 2 + 0.02 * (x1 - x0), ym]);
  const reach = Math.hypot(b[0] - a[0], b[1] - a[1]);
  return Number.isFinite(reach) ? reach : 0;
}

/** Span of the panel's value axis as its anchors give it (undefined with fewer than two values). */
function valueSpan(anchors: readonly { y?: number | undefined }[]): number | undefined {
  const ys = anchors.flatMap((a) => (a.y === undefined ? [] : [a.y]));
  const span = ys.length >= 2 ? Math.max(...ys) - Math.min(...ys) : 0;
  return span > 0 ? span : undefined;
}

/** The flow axis as the panel's anchors span it, m³/s (undefined with fewer than two flow values). */
function axisFlow(anchors: readonly { x?: number | undefined }[], unit: Unit): [number, number] | undefined {
  const xs = anchors.flatMap((a) => (a.x === undefined ? [] : [toSI(a.x, unit)]));
  return xs.length >= 2 ? [Math.min(...xs), Math.max(...xs)] : undefined;
}

/** Distance from a refused guide, in widths of the followed line (and at least one sheet unit), within which the trace still honours it. */
export const REFUSED_GUIDE_WIDTHS = 3;

/**
 * Guides of a raster capture that found no line of the traced colour near them (a `lost`
 * entry naming one guide) and that the trace does not pass: the line the user pointed at there
 * may not be the one followed. A guide the trace passes within REFUSED_GUIDE_WIDTHS line widths
 * of was refused only because its line was hidden there (under a crossing line, in a dash gap):
 * the followed line runs where the user placed it, so it does not count.
 */
export function refusedGuides(lost: readonly LostStretch[], points: readonly SheetPoint[], lineWidth: number | undefined): number {
  const near = Math.max(1, REFUSED_GUIDE_WIDTHS * (lineWidth ?? 0));
  return lost.filter((l) => l.between[0] === l.between[1] && !(lineWidth !== undefined && points.length >= 2 && nearestOnPolyline(points, l.at).distance <= near)).length;
}

/** Sheet length of the stretches a raster capture did not see: to where it was seen again, or to the next guide. */
function lostLength(lost: readonly LostStretch[], trace: Trace): number {
  let total = 0;
  for (const l of lost) {
    if (l.between[0] === l.between[1]) continue;
    const to = l.resumedAt ?? trace.guides?.[l.between[1] - 1];
    if (to) total += Math.hypot(to[0] - l.at[0], to[1] - l.at[1]);
  }
  return total;
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

/** A trace in words: what it plots and at which diameter (in the take-off's `diameterUnit`, when given), speed or iso level, and its panel. */
export function describeTrace(trace: Trace, diameterUnit?: string): string {
  const what = trace.iso !== undefined ? `${trace.quantity} iso-trace ${trace.iso} %` : trace.speed !== undefined ? `${trace.quantity} at ${trace.speed} rpm` : trace.limit === 'min-flow' ? 'minimum-flow line' : `${trace.quantity} at diameter ${trace.diameter}${diameterUnit ? ` ${diameterUnit}` : ''}`;
  return `${what} on panel "${trace.panel}"`;
}
