/**
 * The study drawn on the maker's sheet: for each option the system curves at the low and high
 * static head, the operating points, the duty point, the option's own curve (trimmed impeller or
 * reduced speed) with its POR band on the head panel; on the efficiency, power and NPSHr panels a
 * vertical line at the operating flow with the value read there. Everything is computed in SI,
 * converted to each panel's own axis units and mapped to sheet coordinates through that panel's
 * calibration (`toSheet`), then clipped to the panel's frame.
 *
 * The sheet shows one pump. For an option of n pumps in parallel the system is drawn against the
 * flow of one pump (system head at n·q plotted at q), which is where one pump's curve meets it.
 *
 * Pure: no DOM, no Node. Sheet coordinates: origin top-left, y down (see digitize/points.ts).
 */
import type { Calibration } from '../digitize/calibration.ts';
import { dataPoint, sheetPoint, type SheetPoint } from '../digitize/points.ts';
import { clipPolyline } from '../digitize/polyline.ts';
import { resolveTakeoffUnits, traceUnits } from '../digitize/takeoffUnits.ts';
import type { Takeoff, Trace } from '../model/takeoff.ts';
import type { Quantity } from '../model/curveset.ts';
import { pumpCurveAtSpeed, type PumpCurve } from '../duty/pumpCurve.ts';
import { systemHead, type SystemCurve } from '../duty/systemCurve.ts';
import type { OptionResult } from '../study/evaluate.ts';
import type { StudyResult } from '../study/runStudy.ts';
import { formatValue, fromSI, toSI, type Unit } from '../units/index.ts';

/** Line styles that tell options apart without colour. Dash arrays in sheet-independent points. */
export const LINE_STYLES = [
  { name: 'solid', dash: [] as number[] },
  { name: 'dashed', dash: [6, 3] },
  { name: 'dotted', dash: [1, 2.5] },
  { name: 'dash-dot', dash: [6, 2.5, 1, 2.5] },
  { name: 'long dash', dash: [12, 4] },
  { name: 'dash-dot-dot', dash: [6, 2, 1, 2, 1, 2] },
] as const;

/** Colours that stay apart in print and in grey (dark, of different lightness). */
export const OPTION_COLOURS: readonly (readonly [number, number, number])[] = [
  [0.75, 0.1, 0.1],
  [0.05, 0.25, 0.65],
  [0.1, 0.45, 0.15],
  [0.55, 0.3, 0.0],
  [0.45, 0.1, 0.5],
  [0.2, 0.2, 0.2],
];

export type PanelRole = Quantity;
export type OverlayPathKind = 'system-low' | 'system-high' | 'curve' | 'por' | 'flow-line';
export type OverlayMarkKind = 'operating-low' | 'operating-high' | 'duty' | 'reading';

export interface OverlayPath {
  /** Index of the option in `StudyResult.ranked`. */
  option: number;
  kind: OverlayPathKind;
  /** One or more polylines after clipping, sheet coordinates. */
  lines: SheetPoint[][];
}

export interface OverlayMark {
  option: number;
  kind: OverlayMarkKind;
  at: SheetPoint;
  /** The value drawn, in the panel's axis units [x, y]. */
  data: readonly [number, number];
  /** False when the mark falls outside the frame (it is then not drawn). */
  inside: boolean;
  label: string;
}

export interface OverlayPanel {
  id: string;
  role: PanelRole;
  /** Plot area [left, top, right, bottom], sheet units: the panel's frame, or the anchors' value box mapped to the sheet. */
  frame: readonly [number, number, number, number];
  xUnit: Unit;
  yUnit: Unit;
  paths: OverlayPath[];
  marks: OverlayMark[];
}

export interface OverlayOption {
  index: number;
  name: string;
  style: (typeof LINE_STYLES)[number];
  colour: readonly [number, number, number];
  drawn: boolean;
}

export interface Overlay {
  panels: OverlayPanel[];
  options: OverlayOption[];
  /** Sentences about what could not be drawn. */
  notes: string[];
}

export interface OverlayOptions {
  /** Which options belong on this sheet (the same pump); others are listed but not drawn. Default: all. */
  onSheet?: (r: OptionResult) => boolean;
  /** Points per curve before clipping (default 160). */
  samples?: number;
}

const ROLE_ORDER: readonly Quantity[] = ['head', 'efficiency', 'power', 'npshr'];

/** The overlay of a study on a replayed take-off. */
export function buildOverlay(takeoff: Takeoff, calibrations: ReadonlyMap<string, Calibration>, result: StudyResult, o: OverlayOptions = {}): Overlay {
  const units = resolveTakeoffUnits(takeoff);
  const n = o.samples ?? 160;
  const notes: string[] = [];
  const options: OverlayOption[] = result.ranked.map((r, index) => ({
    index,
    name: r.name,
    style: LINE_STYLES[index % LINE_STYLES.length] as OverlayOption['style'],
    colour: OPTION_COLOURS[index % OPTION_COLOURS.length] as OverlayOption['colour'],
    drawn: o.onSheet ? o.onSheet(r) : true,
  }));
  for (const opt of options) if (!opt.drawn) notes.push(`Option "${opt.name}" uses another pump's curve set, so it is not drawn on this sheet.`);
  const panels: OverlayPanel[] = [];
  for (const panel of takeoff.panels) {
    const cal = calibrations.get(panel.id);
    if (!cal) continue;
    const trace = roleTrace(takeoff.traces, panel.id);
    if (!trace) continue;
    const role = trace.quantity;
    const tu = traceUnits(takeoff, units, trace);
    const box = valueBox(panel.anchors);
    const frame = panel.frame ? normalise(panel.frame) : frameOf(cal, box);
    const out: OverlayPanel = { id: panel.id, role, frame, xUnit: tu.flow, yUnit: tu.value, paths: [], marks: [] };
    const [xLo, xHi] = xRange(cal, frame, box).map((v) => toSI(v, tu.flow)) as [number, number];
    const toSheet = (qSI: number, ySI: number): SheetPoint => {
      const p = cal.toSheet(dataPoint(fromSI(qSI, tu.flow), fromSI(ySI, tu.value)));
      return sheetPoint(p[0], p[1]);
    };
    const qLo = Math.max(0, xLo);
    const line = (f: (q: number) => number, a: number, b: number): SheetPoint[] => {
      const pts: SheetPoint[] = [];
      for (let i = 0; i <= n; i++) {
        const q = a + ((b - a) * i) / n;
        const y = f(q);
        if (Number.isFinite(y)) pts.push(toSheet(q, y));
      }
      return pts;
    };
    const mark = (option: number, kind: OverlayMarkKind, qSI: number, ySI: number, label: string) => {
      const at = toSheet(qSI, ySI);
      out.marks.push({ option, kind, at, data: [fromSI(qSI, tu.flow), fromSI(ySI, tu.value)], inside: insideRect(at, frame), label });
    };
    const fmt = (v: number, u: Unit) => formatValue(fromSI(v, u), u.label, 4);
    for (const opt of options) {
      if (!opt.drawn) continue;
      const r = result.ranked[opt.index] as OptionResult;
      const k = r.pumps;
      const i = opt.index;
      const qd = r.duty ? r.duty.flow_m3s / k : undefined;
      if (role === 'head') {
        const sys = (s: SystemCurve) => (q: number) => systemHead(s, q * k);
        out.paths.push({ option: i, kind: 'system-low', lines: clipPolyline(line(sys(r.systems.low), qLo, xHi), frame) });
        out.paths.push({ option: i, kind: 'system-high', lines: clipPolyline(line(sys(r.systems.high), qLo, xHi), frame) });
        const own = ownCurve(r);
        if (own) {
          out.paths.push({ option: i, kind: 'curve', lines: clipPolyline(line((q) => own.head(q), own.domain[0], own.domain[1]), frame) });
          if (own.por) {
            const a = Math.max(own.domain[0], own.por.min_m3s);
            const b = Math.min(own.domain[1], own.por.max_m3s);
            if (b > a) out.paths.push({ option: i, kind: 'por', lines: clipPolyline(line((q) => own.head(q), a, b), frame) });
          }
        }
        for (const key of ['low', 'high'] as const) {
          const op = r.operating_points[key];
          if (op) mark(i, key === 'low' ? 'operating-low' : 'operating-high', op.flow_m3s / k, op.head_m, `${key} static: ${fmt(op.flow_m3s / k, tu.flow)}, ${fmt(op.head_m, tu.value)}`);
        }
        if (r.duty && qd !== undefined) mark(i, 'duty', qd, r.duty.system_head_m, `duty: ${fmt(qd, tu.flow)}, ${fmt(r.duty.system_head_m, tu.value)}`);
      } else if (qd !== undefined && r.duty) {
        const value = role === 'efficiency' ? r.duty.per_pump.efficiency : role === 'power' ? r.duty.per_pump.power_W : r.npsh?.duty?.npsh3_m;
        const bottom = cal.toData(sheetPoint((frame[0] + frame[2]) / 2, frame[3]));
        const top = cal.toData(sheetPoint((frame[0] + frame[2]) / 2, frame[1]));
        const yLoSI = toSI(bottom[1], tu.value);
        const yHiSI = toSI(top[1], tu.value);
        out.paths.push({ option: i, kind: 'flow-line', lines: clipPolyline([toSheet(qd, yLoSI), toSheet(qd, yHiSI)], frame) });
        if (value !== undefined && Number.isFinite(value)) {
          const shown = role === 'efficiency' ? `${formatValue(fromSI(value, tu.value), tu.value.label, 3)}` : fmt(value, tu.value);
          mark(i, 'reading', qd, value, `${fmt(qd, tu.flow)}: ${shown}`);
        } else notes.push(`Option "${r.name}": no ${role} value at the duty flow to mark on panel "${panel.id}".`);
      }
    }
    panels.push(out);
  }
  panels.sort((a, b) => ROLE_ORDER.indexOf(a.role) - ROLE_ORDER.indexOf(b.role));
  if (!panels.some((p) => p.role === 'head')) notes.push('The take-off has no head panel, so the system curves and operating points cannot be drawn on the sheet.');
  return { panels, options, notes };
}

/**
 * The option's own head curve when it differs from a drawn one: a trimmed or given impeller, or the
 * speed at the duty. A speed family is drawn at the duty speed from its nearest drawn speed at or
 * above it (`curve_at_speed`, as the study reads it), not from the rated curve scaled down.
 */
export function ownCurve(r: OptionResult): PumpCurve | undefined {
  if (!r.curve) return undefined;
  if (r.control === 'speed' && r.speed_rpm && Math.abs(r.speed_rpm / r.curve.speed_rpm - 1) > 1e-6) return r.curve_at_speed ?? pumpCurveAtSpeed(r.curve, r.speed_rpm);
  return r.option.impeller.kind === 'drawn' ? undefined : r.curve;
}

/** The trace that says what a panel shows: a non-iso trace, head first. */
function roleTrace(traces: readonly Trace[], panel: string): Trace | undefined {
  const own = traces.filter((t) => t.panel === panel && t.iso === undefined);
  for (const q of ROLE_ORDER) {
    const t = own.find((x) => x.quantity === q);
    if (t) return t;
  }
  return undefined;
}

interface ValueBox {
  x: [number, number];
  y: [number, number];
}

function valueBox(anchors: readonly { x?: number | undefined; y?: number | undefined }[]): ValueBox {
  const xs = anchors.map((a) => a.x).filter((v): v is number => v !== undefined);
  const ys = anchors.map((a) => a.y).filter((v): v is number => v !== undefined);
  return { x: [Math.min(...xs), Math.max(...xs)], y: [Math.min(...ys), Math.max(...ys)] };
}

function normalise(f: readonly [number, number, number, number]): [number, number, number, number] {
  return [Math.min(f[0], f[2]), Math.min(f[1], f[3]), Math.max(f[0], f[2]), Math.max(f[1], f[3])];
}

/** Without a drawn frame: the anchors' value box mapped to the sheet, as the rectangle around it. */
function frameOf(cal: Calibration, box: ValueBox): [number, number, number, number] {
  const corners = [
    [box.x[0], box.y[0]],
    [box.x[1], box.y[0]],
    [box.x[0], box.y[1]],
    [box.x[1], box.y[1]],
  ].map(([x, y]) => cal.toSheet(dataPoint(x as number, y as number)));
  const xs = corners.map((c) => c[0]);
  const ys = corners.map((c) => c[1]);
  return [Math.min(...xs), Math.min(...ys), Math.max(...xs), Math.max(...ys)];
}

/** Flow range covered by the frame, SI, from the frame's corners read back through the calibration. */
function xRange(cal: Calibration, frame: readonly [number, number, number, number], _box: ValueBox): [number, number] {
  const xs = [
    [frame[0], frame[1]],
    [frame[2], frame[1]],
    [frame[0], frame[3]],
    [frame[2], frame[3]],
  ].map(([x, y]) => cal.toData(sheetPoint(x as number, y as number))[0]);
  return [Math.min(...xs), Math.max(...xs)];
}

export function insideRect(p: readonly [number, number], r: readonly [number, number, number, number], slack = 1e-6): boolean {
  return p[0] >= r[0] - slack && p[0] <= r[2] + slack && p[1] >= r[1] - slack && p[1] <= r[3] + slack;
}

