/**
 * Between the workbench draft and the take-off file (`*.takeoff.json`). Writing drops what
 * is not yet usable (anchors without a value, traces without points or guides) and says so;
 * reading validates with the file's schema and rebuilds the workbench's extras.
 */
import { UserError } from '../../model/errors.ts';
import type { Quantity } from '../../model/curveset.ts';
import { calibrate } from '../../digitize/calibration.ts';
import { parseTakeoff, Takeoff, TAKEOFF_FORMAT, TAKEOFF_VERSION, type Panel, type Trace } from '../../model/takeoff.ts';
import { anchorsWithValues, EMPTY_DRAFT, pointsOf, type Draft, type Frame, type PanelDraft, type SheetRef, type TraceDraft } from './draft.ts';

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
    const anchors = anchorsWithValues(p).map((a) => ({ at: [a.at[0], a.at[1]] as [number, number], ...(a.x !== undefined ? { x: a.x } : {}), ...(a.y !== undefined ? { y: a.y } : {}), ...(a.label ? { label: a.label } : {}) }));
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
    panels.push({ id: p.id, anchors, x_scale: p.x_scale, y_scale: p.y_scale, frame: [...p.frame] as [number, number, number, number], units: { x: p.units.x, y: p.units.y } });
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
    const trace: Trace = { id: t.id, panel: t.panel, quantity: t.quantity, method: t.method };
    if (t.iso !== undefined) trace.iso = t.iso;
    else if (t.diameter !== undefined) trace.diameter = t.diameter;
    if (t.guides.length) trace.guides = t.guides.map((g) => [g[0], g[1]]);
    // Hand-edited points are used as they are; the capture they replaced is not written, so
    // that no reader can mistake it for the points that count.
    if (t.points) trace.points = t.points.map((g) => [g[0], g[1]]);
    else if (t.captured?.length) trace.captured = t.captured.map((g) => [g[0], g[1]]);
    traces.push(trace);
  }
  if (panels.length === 0) throw new DraftIncompleteError('Set the axes of at least one panel before saving the take-off file.');
  if (traces.length === 0) throw new DraftIncompleteError('Trace at least one curve before saving the take-off file.');
  const raw = {
    format: TAKEOFF_FORMAT,
    version: TAKEOFF_VERSION,
    sheet: draft.sheet.name,
    page: draft.sheet.page,
    ...(draft.sheet.sha256 ? { sheet_sha256: draft.sheet.sha256 } : {}),
    pump: { name: draft.pump.name.trim() || 'Unnamed pump', speed_rpm: draft.pump.speed_rpm, specific_gravity: draft.pump.specific_gravity },
    units: { flow: draft.units.flow, head: draft.units.head, power: draft.units.power, npsh: draft.units.npsh, diameter: draft.units.diameter },
    panels,
    traces,
    ...(draft.notes.length ? { notes: [...draft.notes] } : {}),
  };
  return { takeoff: parseTakeoff(Takeoff.parse(raw)), omitted };
}

/** What a panel plots, judged from the traces on it and then from its y unit. */
function guessPlots(panel: Panel, traces: readonly Trace[]): Quantity {
  const counts = new Map<Quantity, number>();
  for (const t of traces) if (t.panel === panel.id && t.iso === undefined) counts.set(t.quantity, (counts.get(t.quantity) ?? 0) + 1);
  const top = [...counts.entries()].sort((a, b) => b[1] - a[1])[0];
  if (top) return top[0];
  const y = panel.units?.y ?? '';
  if (y === '%') return 'efficiency';
  if (/^(k?W|hp)$/i.test(y)) return 'power';
  return 'head';
}

/** Rebuilds a draft from a take-off file and the sheet it refers to. Throws ZodError or TakeoffError. */
export function fromTakeoffFile(raw: unknown, sheet: SheetRef): Draft {
  const file = parseTakeoff(raw);
  const units = { flow: file.units.flow, head: file.units.head, power: file.units.power ?? 'kW', npsh: file.units.npsh ?? file.units.head, diameter: file.units.diameter };
  const panels: PanelDraft[] = file.panels.map((p) => {
    const plots = guessPlots(p, file.traces);
    const frame: Frame = p.frame ?? frameAround(p.anchors.map((a) => a.at));
    return {
      id: p.id,
      plots,
      frame,
      anchors: p.anchors.map((a) => ({ at: a.at, ...(a.x !== undefined ? { x: a.x } : {}), ...(a.y !== undefined ? { y: a.y } : {}), ...(a.label ? { label: a.label } : {}) })),
      x_scale: p.x_scale,
      y_scale: p.y_scale,
      units: { x: p.units?.x ?? units.flow, y: p.units?.y ?? (plots === 'efficiency' ? '%' : plots === 'power' ? units.power : plots === 'npshr' ? units.npsh : units.head) },
    };
  });
  const traces: TraceDraft[] = file.traces.map((t, i) => ({
    id: t.id ?? `t${i + 1}`,
    panel: t.panel,
    quantity: t.quantity,
    ...(t.diameter !== undefined ? { diameter: t.diameter } : {}),
    ...(t.iso !== undefined ? { iso: t.iso } : {}),
    guides: t.guides ?? [],
    method: t.method,
    ...(t.captured ? { captured: t.captured } : {}),
    ...(t.points ? { points: t.points } : {}),
  }));
  const diameters = [...new Set(traces.flatMap((t) => (t.diameter !== undefined ? [t.diameter] : [])))].sort((a, b) => b - a);
  return {
    ...EMPTY_DRAFT,
    sheet: { ...sheet, page: file.page },
    pump: { name: file.pump.name, speed_rpm: file.pump.speed_rpm, specific_gravity: file.pump.specific_gravity },
    units,
    diameters,
    panels,
    traces,
    notes: file.notes ?? [],
  };
}

function frameAround(points: readonly (readonly [number, number])[]): [number, number, number, number] {
  const xs = points.map((p) => p[0]);
  const ys = points.map((p) => p[1]);
  return [Math.min(...xs), Math.min(...ys), Math.max(...xs), Math.max(...ys)];
}
