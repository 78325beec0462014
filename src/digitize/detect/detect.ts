/**
 * The automatic take-off of a vector sheet: panels with their calibrations and quantities,
 * every curve with its diameter (or speed) or iso level, each with a confidence, and the
 * questions the detector asks instead of guessing. `detectTakeoff` turns a minimal take-off
 * (sheet, page, pump speed, units) into a complete one whose found parts carry origin
 * "detected"; the replay (takeoff.ts) then reads it like any other.
 *
 * Pure: the sheet arrives through the Sheet interface. Scans go to rasterDetect.ts (panels, and
 * curves followed by the raster tracer) when a character reader is handed in.
 */
import { TakeoffError, parseTakeoff, type Panel, type Takeoff, type TakeoffToDetect } from '../../model/takeoff.ts';
import { fromSI, parseUnit, toSI, type QuantityKind } from '../../units/index.ts';
import { QUANTITY_KIND } from '../../units/quantityUnits.ts';
import type { Sheet, SheetText, VectorPath } from '../sheet.ts';
import { sortCurves, type FoundCurve } from './curves.ts';
import { assignLabels, labelledStubs, describe, type GivenValues, type Labelled } from './labels.ts';
import { sheetLines } from './lines.ts';
import { findPanels, type FoundPanel } from './panels.ts';
import { detectRasterTakeoff } from './rasterDetect.ts';
import type { DetectProgress } from './rasterPanels.ts';
import type { TextReader } from './rasterText.ts';
import { speedOfTextItems, type SpeedRead } from './sheetSpeed.ts';

export const DETECTOR = 'pumpscribe detect 1 (vector sheets)';

export interface Detection {
  panels: FoundPanel[];
  curves: FoundCurve[];
  labelled: Labelled[];
  /** Lines labelled as the minimum continuous flow, kept as limit traces. */
  minFlow: FoundCurve[];
  family: 'diameter' | 'speed';
  /** Unit of the curve labels ('mm', 'in', 'rpm'), null when none was read. */
  labelUnit: string | null;
  /** Proposals of tick labels that belonged to no frame. */
  droppedProposals: number;
  questions: string[];
}

/** Everything the detector finds on a vector page. */
export function detectSheet(text: readonly SheetText[], paths: readonly VectorPath[], given?: GivenValues, isoLevels?: readonly number[], ratedRpm?: number): Detection {
  const found = findPanels(text, paths);
  const sorted = sortCurves(found.panels, sheetLines(paths));
  const stubs = labelledStubs(sorted.stubs, sorted.curves, text, isoLevels);
  const curves = [...sorted.curves, ...stubs.read];
  const curveQuestions = [...sorted.questions, ...stubs.questions];
  const labels = assignLabels(curves, text, given, isoLevels, ratedRpm);
  return {
    panels: found.panels,
    curves,
    labelled: labels.labelled,
    minFlow: labels.minFlow,
    family: labels.family,
    labelUnit: labels.unit,
    droppedProposals: found.dropped,
    questions: [...found.questions, ...curveQuestions, ...labels.questions],
  };
}

export interface DetectOptions {
  /** The character reader for scans (tick labels and titles); without it a scan is refused. */
  reader?: TextReader;
  progress?: DetectProgress;
}

export interface DetectedTakeoff {
  /** The complete take-off, validated. */
  takeoff: Takeoff;
  /** The same as a document to save (the input's fields kept, panels and traces added). */
  document: Record<string, unknown>;
  detection: Detection;
  questions: string[];
  /** The pump's speed as the sheet prints it (a vector page's text; a scan's title or footer), when one was read. */
  speedRead?: SpeedRead;
  /** The units the sheet prints, where its titles and labels say so without disagreeing (sheetUnitsRead). */
  sheetUnits: SheetUnits;
}

/** Units a sheet prints, by the take-off's unit fields; a field is absent where the sheet does not say, or says two things. */
export type SheetUnits = Partial<Record<'flow' | 'head' | 'power' | 'npsh' | 'diameter', string>>;

/**
 * The units the sheet is drawn in, from what the detection read: the flow unit all found panels'
 * flow titles agree on, the value units of the head, power and NPSHr panels, and the unit of
 * the diameter labels. A quantity whose panels name two units, or where one panel names none,
 * is left out. The take-off's own
 * values stay in its units; a shell may offer to show the sheet's (the workbench does).
 */
export function sheetUnitsRead(panels: readonly Pick<Panel, 'origin' | 'quantity' | 'units'>[], labelUnit: string | null): SheetUnits {
  const found = panels.filter((p) => p.origin === 'detected');
  // One unit for a quantity only when every panel of it names that unit: a panel that names none
  // is read in the take-off's unit, so a change of that unit would change its reading.
  const one = (values: (string | undefined)[]): string | undefined => {
    const set = new Set(values);
    return set.size === 1 && !set.has(undefined) ? [...set][0] : undefined;
  };
  const out: SheetUnits = {};
  const flow = one(found.map((p) => p.units?.x));
  if (flow) out.flow = flow;
  for (const [key, quantity] of [['head', 'head'], ['power', 'power'], ['npsh', 'npshr']] as const) {
    const unit = one(found.filter((p) => p.quantity === quantity).map((p) => p.units?.y));
    if (unit) out[key] = unit;
  }
  if (labelUnit === 'mm' || labelUnit === 'in') out.diameter = labelUnit;
  return out;
}

const r4 = (v: number) => Math.round(v * 1e4) / 1e4;

/** Unit token of a title for a kind, or null when the title names none this tool knows. */
function unitToken(kind: QuantityKind, token: string | null): string | null {
  if (token === null) return null;
  try {
    return parseUnit(kind, token).token;
  } catch {
    return null;
  }
}

/**
 * The take-off's panels: the engineer's, then each found panel that says what it plots, with
 * its anchors, scales, frame and units (a panel without a curve adds nothing, so callers pass
 * only those worth keeping). Questions about unknown flow units are added to `questions`.
 */
export function takeoffPanels(found: readonly FoundPanel[], userPanels: NonNullable<TakeoffToDetect['panels']>, units: TakeoffToDetect['units'], questions: string[]): { panels: NonNullable<TakeoffToDetect['panels']>; panelIds: Map<FoundPanel, string> } {
  const panels: NonNullable<TakeoffToDetect['panels']> = [...userPanels];
  const panelIds = new Map<FoundPanel, string>();
  // The flow unit is one question for the sheet, however many panels' titles leave it open.
  const unknownFlow: string[] = [];
  const noFlow: string[] = [];
  for (const p of found) {
    if (p.quantity === null) continue;
    const id = panels.some((k) => k.id === p.id) ? `${p.id}-detected` : p.id;
    panelIds.set(p, id);
    const x = unitToken('flow', p.xUnit);
    const y = p.quantity === 'efficiency' ? '%' : unitToken(QUANTITY_KIND[p.quantity], p.yUnit);
    if (p.xUnit !== null && x === null) unknownFlow.push(`"${p.flowTitle}" of panel "${id}"`);
    if (p.xUnit === null) noFlow.push(`"${id}"`);
    panels.push({
      id,
      origin: 'detected',
      confidence: p.confidence,
      quantity: p.quantity,
      anchors: p.proposal.anchors.map((a) => ({ at: [r4(a.at[0]), r4(a.at[1])] as [number, number], ...(a.x !== undefined ? { x: a.x } : {}), ...(a.y !== undefined ? { y: a.y } : {}) })),
      x_scale: p.proposal.xScale,
      y_scale: p.proposal.yScale,
      frame: p.frame.map(r4) as [number, number, number, number],
      ...(p.proposal.anchorBias ? { anchor_bias: r4(p.proposal.anchorBias) } : {}),
      ...(x || y ? { units: { ...(x ? { x } : {}), ...(y ? { y } : {}) } } : {}),
    });
  }
  const open = [
    ...(unknownFlow.length > 0 ? [`the flow title${unknownFlow.length === 1 ? '' : 's'} ${unknownFlow.join(', ')} ${unknownFlow.length === 1 ? 'names' : 'name'} a unit this tool does not know`] : []),
    ...(noFlow.length > 0 ? [`panel${noFlow.length === 1 ? '' : 's'} ${noFlow.join(', ')} ${noFlow.length === 1 ? 'has' : 'have'} no flow title with a unit`] : []),
  ];
  if (open.length > 0) questions.push(`${open.join(', and ').replace(/^./, (c) => c.toUpperCase())}; the take-off's flow unit ${units.flow} is used. Is that the sheet's?`);
  return { panels, panelIds };
}

/** Values the engineer gave for a sheet that prints none, in the take-off's diameter unit (or rpm). */
export function givenValues(input: Pick<TakeoffToDetect, 'units' | 'speeds' | 'diameters'>): GivenValues | undefined {
  const dUnit = parseUnit('diameter', input.units.diameter).token;
  return input.speeds
    ? { family: 'speed', values: input.speeds, unit: 'rpm' }
    : input.diameters && (dUnit === 'mm' || dUnit === 'in')
      ? { family: 'diameter', values: input.diameters, unit: dUnit }
      : undefined;
}

/**
 * The question when the diameters given and the labels the sheet prints are in different units
 * ("15.5" and "12.625" given in a take-off in mm, labels read 15.5"): the values were typed in
 * the sheet's unit while the take-off names another, a slip that would put 15.5 mm impellers in
 * the curve set. Where no label unit was read, diameters that no impeller of these sheets has in
 * the take-off's unit (all under 40 mm, or all over 60 in; common practice: catalogue impellers
 * run from about 80 to 800 mm) are asked about too. Null when nothing was given or all agrees.
 */
export function givenUnitQuestion(labelUnit: string | null, input: Pick<TakeoffToDetect, 'units' | 'diameters'>): string | null {
  if (!input.diameters || input.diameters.length === 0) return null;
  const unit = parseUnit('diameter', input.units.diameter).token;
  const words = (u: string) => (u === 'in' ? 'inches' : u === 'mm' ? 'millimetres' : u);
  if (labelUnit !== 'mm' && labelUnit !== 'in') {
    const small = unit === 'mm' && Math.max(...input.diameters) < 40;
    const large = unit === 'in' && Math.min(...input.diameters) > 60;
    if (!small && !large) return null;
    return `The diameters given (${input.diameters.join(', ')}) are ${small ? 'too small for impellers in millimetres' : 'too large for impellers in inches'}, the take-off's diameter unit; were they typed in ${small ? 'inches' : 'millimetres'}? Set the diameter unit to the sheet's, or give the diameters in ${unit}, and run --detect again.`;
  }
  if (unit === labelUnit) return null;
  return `The sheet labels its curves in ${words(labelUnit)}, but the take-off's diameters are in ${words(unit)}, so the diameters given (${input.diameters.join(', ')}) were taken as ${unit}; set the diameter unit to ${labelUnit} (the sheet's units), or give the diameters in ${unit}, and run --detect again.`;
}

/**
 * Completes a minimal take-off from the sheet. Panels and traces the engineer set (origin
 * absent or "user") are kept, and a curve the engineer traced is not added again; parts of an
 * earlier detection (origin "detected") are found afresh, so --detect can run again on a saved
 * take-off.
 * Throws TakeoffError when the sheet is not a vector page or nothing could be found.
 */
export async function detectTakeoff(input: TakeoffToDetect, raw: Record<string, unknown>, sheet: Sheet, options: DetectOptions = {}): Promise<DetectedTakeoff> {
  if (sheet.kind !== 'vector-pdf') {
    if (options.reader) return detectRasterTakeoff(input, raw, sheet, options.reader, options.progress);
    throw new TakeoffError(`The automatic take-off reads scans only with a character reader, and this sheet is ${sheet.kind === 'image' ? 'an image' : 'a scanned PDF page'}; give the panels and traces in the take-off file.`);
  }
  const text = await sheet.text();
  const detection = detectSheet(text, await sheet.paths(), givenValues(input), input.iso_levels, input.pump.speed_rpm);
  const speedRead = speedOfTextItems(text.map((t) => t.text));
  const questions = [...detection.questions];
  const unitSlip = givenUnitQuestion(detection.labelUnit, input);
  if (unitSlip) questions.push(unitSlip);
  // Parts the engineer set stay; parts found by an earlier detection are found again.
  const userPanels = (input.panels ?? []).filter((p) => p.origin !== 'detected');
  const userTraces = (input.traces ?? []).filter((t) => t.origin !== 'detected');
  const userKeys = new Set(userTraces.map((t) => `${t.quantity}|${t.iso !== undefined ? `iso ${t.iso}` : (t.diameter ?? t.speed)}`));
  const units = input.units;

  const { panels, panelIds } = takeoffPanels(
    detection.panels.filter((p) => p.quantity === 'head' || detection.labelled.some((l) => l.curve.panel === p)),
    userPanels,
    units,
    questions,
  );

  const diameterUnit = parseUnit('diameter', units.diameter);
  const valueOf = (l: Labelled): number => {
    if (l.curve.kind === 'iso' || detection.family === 'speed' || detection.labelUnit === null) return l.value;
    const from = parseUnit('diameter', detection.labelUnit);
    return Number(fromSI(toSI(l.value, from), diameterUnit).toPrecision(10));
  };
  // Efficiency from iso-lines needs every iso-line of the panel: levels missing on some lines
  // would leave the curves resting on part of their crossings, so the panel's iso-lines wait.
  const isoWaiting = new Set<FoundPanel>();
  for (const c of detection.curves) if (c.kind === 'iso' && !detection.minFlow.includes(c) && !detection.labelled.some((l) => l.curve === c)) isoWaiting.add(c.panel);
  for (const p of isoWaiting) questions.push(`The efficiency read from the iso-lines of panel "${p.id}" is left out until every iso-line there has its level; answer the questions about them, or trace them by hand.`);
  const traces: NonNullable<TakeoffToDetect['traces']> = [...userTraces];
  const ids = new Set(traces.map((t) => t.id));
  for (const l of [...detection.labelled].sort((a, b) => a.curve.id - b.curve.id)) {
    const panel = panelIds.get(l.curve.panel);
    if (!panel || (l.curve.kind === 'iso' && isoWaiting.has(l.curve.panel))) continue;
    const value = valueOf(l);
    if (userKeys.has(`${l.curve.quantity}|${l.curve.kind === 'iso' ? `iso ${value}` : value}`)) continue; // the engineer's own trace of it wins
    let id = l.curve.kind === 'iso' ? `iso-${value}` : `${l.curve.quantity}-${value}`;
    for (let k = 2; ids.has(id); k++) id = `${l.curve.kind === 'iso' ? `iso-${value}` : `${l.curve.quantity}-${value}`}-${k}`;
    ids.add(id);
    traces.push({
      id,
      origin: 'detected',
      confidence: l.confidence,
      panel,
      quantity: l.curve.quantity,
      ...(l.curve.kind === 'iso' ? { iso: value } : detection.family === 'speed' ? { speed: value } : { diameter: value }),
      // Exact geometry of the drawn path: saved as captured vector points, as a vector capture saves them.
      captured: l.curve.points.map((p) => [r4(p[0]), r4(p[1])] as [number, number]),
      captured_by: 'vector',
      method: 'vector',
    });
  }
  // The minimum-flow line, once per panel, unless the engineer traced it.
  for (const c of detection.minFlow) {
    const panel = panelIds.get(c.panel);
    if (!panel || traces.some((t) => t.limit === 'min-flow' && t.panel === panel)) continue;
    let id = 'min-flow';
    for (let k = 2; ids.has(id); k++) id = `min-flow-${k}`;
    ids.add(id);
    traces.push({ id, origin: 'detected', confidence: 0.9, panel, quantity: 'head', limit: 'min-flow', captured: c.points.map((p) => [r4(p[0]), r4(p[1])] as [number, number]), captured_by: 'vector', method: 'vector' });
  }
  if (!traces.some((t) => t.iso === undefined && t.limit === undefined)) {
    const why = questions.length > 0 ? ` It asks: ${questions.join(' ')}` : '';
    throw new TakeoffError(`The automatic take-off found no curve whose diameter or speed it could name on page ${input.page} (${detection.panels.length} panels, ${detection.curves.length} lines).${why}`);
  }
  const document: Record<string, unknown> = {
    ...raw,
    sheet_sha256: sheet.sha256,
    panels,
    traces,
    detected: { by: DETECTOR, questions },
  };
  const takeoff = parseTakeoff(document);
  return { takeoff, document, detection, questions, ...(speedRead ? { speedRead } : {}), sheetUnits: sheetUnitsRead(takeoff.panels, detection.labelUnit) };
}

export { describe as describeCurve };
