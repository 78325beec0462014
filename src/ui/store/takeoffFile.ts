/**
 * Between the workbench document and the take-off file (`*.takeoff.json`). The document is the
 * take-off record with a few view-only extras (see draft.ts), so both ways are the identity on
 * the record: reading adds the extras, writing takes them off again and keeps every other field
 * as it is. Writing also drops what is not yet usable (anchors without a value, panels that do
 * not calibrate, traces without points or guides) and says so.
 */
import { UserError } from '../../model/errors.ts';
import type { Quantity } from '../../model/curveset.ts';
import { parseUnit, type QuantityKind } from '../../units/index.ts';
import { calibrate } from '../../digitize/calibration.ts';
import { parseTakeoff, Takeoff, TAKEOFF_FORMAT, TAKEOFF_VERSION, type Panel, type Trace } from '../../model/takeoff.ts';
import { anchorsWithValues, EMPTY_DRAFT, familyLabels, familyOfTraces, pointsOf, type Draft, type PanelDraft, type SheetRef, type TraceDraft } from './draft.ts';

export interface WrittenTakeoff {
  takeoff: Takeoff;
  /** What was left out, one sentence each. */
  omitted: string[];
}

/** Thrown when the draft cannot yet make a take-off file; the message says what is missing. */
export class DraftIncompleteError extends UserError {
  override name = 'TakeoffError';
}

export function toTakeoffFile(draft: Draft): WrittenTakeoff {
  if (!draft.sheet) throw new DraftIncompleteError('Load a sheet first: the take-off file refers to it.');
  const omitted: string[] = [];
  const panels: Panel[] = [];
  for (const p of draft.panels) {
    const { plots: _view, anchors: all, ...record } = p;
    const anchors = anchorsWithValues(p).map((a) => ({ ...a, at: [a.at[0], a.at[1]] as [number, number] }));
    if (anchors.length === 0) {
      omitted.push(`Panel ${p.id} has no anchor values yet and was left out.`);
      continue;
    }
    try {
      calibrate(anchors, { xScale: p.x_scale, yScale: p.y_scale, panel: p.id });
    } catch (error) {
      omitted.push(`Panel ${p.id} was left out: ${(error as Error).message}`);
      continue;
    }
    if (anchors.length < all.length) omitted.push(`Panel ${p.id}: ${all.length - anchors.length} anchor${all.length - anchors.length === 1 ? '' : 's'} without a value left out.`);
    panels.push(structuredClone({ ...record, anchors }) as Panel);
  }
  const panelIds = new Set(panels.map((p) => p.id));
  const traces: Trace[] = [];
  for (const t of draft.traces) {
    if (!panelIds.has(t.panel)) {
      omitted.push(`Trace ${t.id} lies on a panel that is not calibrated yet and was left out.`);
      continue;
    }
    if (t.guides.length === 0 && pointsOf(t).length === 0) {
      omitted.push(`Trace ${t.id} has neither guides nor points and was left out.`);
      continue;
    }
    const { hidden: _hidden, locked: _locked, edited, guides, ...kept } = t;
    // Hand-edited points are used as they are; the capture they replaced is not written.
    const { captured: _captured, captured_by: _by, ...withoutCapture } = kept;
    const record = edited ? withoutCapture : kept;
    traces.push(structuredClone({ ...record, ...(guides.length ? { guides } : {}) }) as Trace);
  }
  if (panels.length === 0) throw new DraftIncompleteError('Set the axes of at least one panel before saving the take-off file.');
  if (traces.length === 0) throw new DraftIncompleteError('Trace at least one curve before saving the take-off file.');
  const raw = {
    format: TAKEOFF_FORMAT,
    version: TAKEOFF_VERSION,
    sheet: draft.sheet.path,
    page: draft.sheet.page,
    ...(draft.sheet_sha256 ? { sheet_sha256: draft.sheet_sha256 } : {}),
    pump: { ...draft.pump, name: draft.pump.name.trim() || 'Unnamed pump' },
    units: { ...draft.units },
    panels,
    traces,
    ...(draft.min_flow !== undefined ? { min_flow: draft.min_flow } : {}),
    ...(draft.notes ? { notes: [...draft.notes] } : {}),
    ...(draft.labelsGiven && familyLabels(draft).length ? { [draft.family === 'speed' ? 'speeds' : 'diameters']: [...familyLabels(draft)] } : {}),
    ...(draft.iso_levels ? { iso_levels: [...draft.iso_levels] } : {}),
    ...(draft.detected ? { detected: { by: draft.detected.by, questions: [...draft.detected.questions] } } : {}),
  };
  return { takeoff: parseTakeoff(Takeoff.parse(raw)), omitted };
}

/** What a panel plots, judged from the traces on it and then from its y unit. */
function isUnitOf(kind: QuantityKind, token: string): boolean {
  try {
    parseUnit(kind, token);
    return true;
  } catch {
    return false;
  }
}

function guessPlots(panel: Panel, traces: readonly Trace[]): Quantity {
  const counts = new Map<Quantity, number>();
  for (const t of traces) if (t.panel === panel.id && t.iso === undefined) counts.set(t.quantity, (counts.get(t.quantity) ?? 0) + 1);
  const top = [...counts.entries()].sort((a, b) => b[1] - a[1])[0];
  if (top) return top[0];
  // Else by the kind of the panel's y unit in the one unit table (any case, any alias).
  const y = panel.units?.y;
  if (y === undefined) return 'head';
  return isUnitOf('efficiency', y) ? 'efficiency' : isUnitOf('power', y) ? 'power' : 'head';
}

/**
 * The document of a take-off file and the sheet it refers to: the record as it is, with the
 * view-only extras added. `sheet` says what was opened; the record's own `sheet` (its path),
 * `page` and `sheet_sha256` are kept. Throws ZodError or TakeoffError.
 */
export function fromTakeoffFile(raw: unknown, sheet: Omit<SheetRef, 'path'>): Draft {
  const file = parseTakeoff(raw);
  const { format: _format, version: _version, sheet: path, page, panels, traces, diameters: givenDiameters, speeds: givenSpeeds, ...record } = file;
  const draftPanels: PanelDraft[] = panels.map((p) => ({ ...p, plots: guessPlots(p, traces) }));
  const draftTraces: TraceDraft[] = traces.map((t, i) => ({ ...t, id: t.id ?? freshTraceId(traces, i), guides: t.guides ?? [] }));
  const diameters = [...new Set([...(givenDiameters ?? []), ...draftTraces.flatMap((t) => (t.diameter !== undefined ? [t.diameter] : []))])].sort((a, b) => b - a);
  return {
    ...EMPTY_DRAFT,
    ...record,
    sheet: { ...sheet, path, page },
    diameters,
    family: familyOfTraces(draftTraces) ?? 'diameter',
    speeds: [...new Set([...(givenSpeeds ?? []), ...draftTraces.flatMap((t) => (t.speed !== undefined ? [t.speed] : []))])].sort((a, b) => b - a),
    ...(givenDiameters || givenSpeeds ? { labelsGiven: true } : {}),
    speedGiven: true,
    panels: draftPanels,
    traces: draftTraces,
  };
}

/** An id for a trace the file left without one: its position, unless another trace uses that. */
function freshTraceId(traces: readonly Trace[], index: number): string {
  const used = new Set(traces.flatMap((t) => (t.id ? [t.id] : [])));
  for (let n = index + 1; ; n++) if (!used.has(`t${n}`)) return `t${n}`;
}
