/**
 * The automatic take-off of a scan (an image, or a PDF page that is one picture): panels and
 * their calibrations from the ink and the tick labels read (rasterPanels.ts), then the curves
 * of each panel (rasterCurves.ts): each found curve becomes a trace with guides placed where
 * its line stands alone, followed by the raster tracer on replay like a trace the engineer
 * clicked. The engineer's own traces are kept and win over a found curve of the same name.
 *
 * Pure: the sheet and the character reader are handed in.
 */
import { readSheetSpeed } from './sheetSpeed.ts';
import { TakeoffError, parseTakeoff, type TakeoffToDetect } from '../../model/takeoff.ts';
import { fromSI, parseUnit, toSI } from '../../units/index.ts';
import { safeScale, type Sheet } from '../sheet.ts';
import { givenUnitQuestion, givenValues, sheetUnitsRead, takeoffPanels, type DetectedTakeoff, type Detection } from './detect.ts';
import { findRasterCurves } from './rasterCurves.ts';
import { findRasterPanels, type DetectProgress } from './rasterPanels.ts';
import type { TextReader } from './rasterText.ts';

export const RASTER_DETECTOR = 'pumpscribe detect 2 (scans: panels and curves)';

/** A PDF page that is a scan is rendered at 300 dpi (within the pixel limit). */
const PDF_SCAN_SCALE = 300 / 72;

const r2 = (v: number) => Math.round(v * 100) / 100;

/** Nothing could be named on the scan: the sentence, and the questions whose answers let it be read again. */
export class ScanDetectRefused extends TakeoffError {
  constructor(message: string, readonly questions: readonly string[]) {
    super(message);
  }
}

export async function detectRasterTakeoff(input: TakeoffToDetect, raw: Record<string, unknown>, sheet: Sheet, reader: TextReader, progress: DetectProgress = () => undefined): Promise<DetectedTakeoff> {
  const image = await sheet.render(sheet.kind === 'image' ? 1 : safeScale(sheet, PDF_SCAN_SCALE));
  const found = await findRasterPanels(image, reader, (f, what) => progress(0.6 * f, what));
  // The speed the sheet prints (its title or footer), to fill in or check the speed given.
  const speedRead = await readSheetSpeed(found, reader);
  progress(0.6, 'finding the curves');
  const given = givenValues(input);
  const curves = await findRasterCurves(image, found, reader, { ...(given ? { given: { family: given.family, values: given.values } } : {}), ratedRpm: input.pump.speed_rpm, ...(input.iso_levels ? { isoLevels: input.iso_levels } : {}), progress: (f, what) => progress(0.6 + 0.35 * f, what) });
  progress(0.95, 'writing the take-off');
  const questions = [...found.questions, ...curves.questions];
  const unitSlip = givenUnitQuestion(curves.labelUnit, input);
  if (unitSlip) questions.push(unitSlip);
  const userPanels = (input.panels ?? []).filter((p) => p.origin !== 'detected');
  // Every found panel is kept: the engineer's traces may rest on one where no curve was found.
  const { panels, panelIds } = takeoffPanels(found.panels, userPanels, input.units, questions);
  const detection: Detection = { panels: found.panels, curves: [], labelled: [], minFlow: [], family: curves.family, labelUnit: curves.labelUnit, droppedProposals: 0, questions };
  const named = panels.filter((p) => p.origin === 'detected').map((p) => p.id);
  const all = (input.traces ?? []).filter((t) => t.origin !== 'detected');
  // A trace on a panel neither given nor found waits, with a question, rather than failing the rest.
  const orphans = all.filter((t) => !panels.some((p) => p.id === t.panel));
  const traces = all.filter((t) => !orphans.includes(t));
  if (orphans.length > 0) {
    const names = [...new Set(orphans.map((t) => t.panel))];
    questions.push(`The panel${names.length === 1 ? '' : 's'} ${names.map((n) => `"${n}"`).join(', ')} of the trace${orphans.length === 1 ? '' : 's'} ${orphans.map((t) => `"${t.id}"`).join(', ')} ${names.length === 1 ? 'was' : 'were'} not found on this scan (found: ${named.join(', ') || 'none'}); those traces are left out until the panel is given in the take-off file.`);
  }
  const keyOf = (quantity: string, value: number | undefined, iso: boolean) => `${quantity}|${iso ? 'iso ' : ''}${value}`;
  const userKeys = new Set(traces.map((t) => (t.iso !== undefined ? keyOf(t.quantity, t.iso, true) : keyOf(t.quantity, t.diameter ?? t.speed, false))));
  const diameterUnit = parseUnit('diameter', input.units.diameter);
  const valueOf = (v: number): number => {
    if (curves.family === 'speed' || curves.valueUnit === null || curves.valueUnit === 'rpm') return v;
    return Number(fromSI(toSI(v, parseUnit('diameter', curves.valueUnit)), diameterUnit).toPrecision(10));
  };
  const ids = new Set(traces.map((t) => t.id));
  /** Traces unsure only for a reason a question or sentence of their own names (`RasterCurve.ownQuestion`). */
  const saidApart = new Set<string>();
  for (const c of curves.curves) {
    const panel = panelIds.get(c.panel);
    if (!panel || c.value === undefined) continue;
    const iso = c.kind === 'iso';
    const value = iso ? c.value : valueOf(c.value);
    if (userKeys.has(keyOf(c.quantity, value, iso))) continue; // the engineer's own trace of it wins
    const base = iso ? `iso-${value}` : `${c.quantity}-${value}`;
    let id = base;
    for (let k = 2; ids.has(id); k++) id = `${base}-${k}`;
    ids.add(id);
    if (c.ownQuestion) saidApart.add(id);
    traces.push({
      id,
      origin: 'detected',
      confidence: Math.round(c.confidence * 100) / 100,
      panel,
      quantity: c.quantity,
      ...(iso ? { iso: value } : curves.family === 'speed' ? { speed: value } : { diameter: value }),
      guides: c.guides.map((p) => [r2(p[0]), r2(p[1])] as [number, number]),
      method: 'raster',
    });
  }
  // What was left out or is unsure, said once: one question for the curves of the sheet.
  const unsure = traces.filter((t) => t.origin === 'detected' && (t.confidence ?? 1) < 0.5);
  const look = [...curves.leftOut];
  const saidAlready = (t: (typeof unsure)[number]) => t.id !== undefined && saidApart.has(t.id);
  if (unsure.some((t) => !saidAlready(t))) {
    const curvesUnsure = unsure.filter((t) => t.iso === undefined && !saidAlready(t));
    const isoUnsure = unsure.filter((t) => t.iso !== undefined);
    const list = (ts: typeof unsure) => ts.map((t) => `"${t.id}"`).join(', ');
    const why = [
      ...(curvesUnsure.length > 0 ? [`the tracer's line and the line found disagree for ${list(curvesUnsure)}`] : []),
      ...(isoUnsure.length > 0 ? [`the iso level${isoUnsure.length === 1 ? '' : 's'} of ${list(isoUnsure)} ${isoUnsure.length === 1 ? 'was' : 'were'} not read on both branches of ${isoUnsure.length === 1 ? 'its' : 'their'} level, or came from the order of the lines`] : []),
    ];
    look.push(`${why.join('; ').replace(/^./, (c) => c.toUpperCase())} (confidence under 0.5); look at ${curvesUnsure.length + isoUnsure.length === 1 ? 'it' : 'them'} on the sheet before using the curve set.`);
  }
  if (look.length > 0) questions.push(look.length === 1 ? (look[0] as string) : `Some curves need you: ${look.map((k, i) => `(${i + 1}) ${k}`).join(' ')}`);
  if (traces.length === 0) {
    const why = questions.length > 0 ? ` It asks: ${questions.join(' ')}` : '';
    throw new ScanDetectRefused(`The automatic take-off found ${named.length} panel${named.length === 1 ? '' : 's'} on this scan (${named.join(', ') || 'none calibrated'}) but no curve it could name; give the curves as traces with guides in the take-off file, or the diameters drawn ("diameters"), and run --detect again.${why}`, questions);
  }
  progress(1, 'done');
  const document: Record<string, unknown> = { ...raw, sheet_sha256: sheet.sha256, panels, traces, detected: { by: RASTER_DETECTOR, questions } };
  const takeoff = parseTakeoff(document);
  return { takeoff, document, detection, questions, ...(speedRead ? { speedRead } : {}), sheetUnits: sheetUnitsRead(takeoff.panels, curves.labelUnit) };
}
