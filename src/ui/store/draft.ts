/**
 * The workbench's document is the take-off record itself (src/model/takeoff.ts: sheet, page,
 * sheet_sha256, pump, units, panels, traces, notes), with the same field names, types and
 * meaning, plus a few typed view-only extras that the file does not carry:
 *   - `sheet`: besides the file's `sheet` (as `sheet.path`) and `page`, what the workbench
 *     knows of the opened file (name, kind, checksum of its bytes, page count and size);
 *   - `family`: which kind of sheet it is, impeller diameters at one speed or one impeller at
 *     several speeds; it decides whether a trace is labelled `diameter` or `speed`;
 *   - `diameters` / `speeds`: the family's impeller diameters or drawn speeds, to offer as targets;
 *   - per panel `plots`: what it plots; anchors may wait for their value while being placed;
 *   - per trace `hidden` and `locked`; every trace has an id and a (possibly empty) list of guides.
 * Every other field of the record is kept as it came, so a take-off file read and written
 * again comes back field for field (`toTakeoffFile(fromTakeoffFile(f))` is `f`).
 *
 * Sheet coordinates: PDF points or image pixels, origin top-left, y down.
 * Values are as read off the sheet, in the units the record names — never SI.
 */
import type { z } from 'zod';
import type { Quantity } from '../../model/curveset.ts';
import type { Panel, SheetXY, TakeoffPump, TakeoffUnits, Trace } from '../../model/takeoff.ts';
import { defaultPowerToken } from '../../units/presets.ts';

export type Frame = readonly [left: number, top: number, right: number, bottom: number];

/** An anchor of the record; while being placed it may still wait for its value. */
export interface AnchorDraft {
  readonly at: SheetXY;
  /** Value on the x axis (flow), in the panel's x unit; absent while not yet typed. */
  readonly x?: number;
  /** Value on the y axis, in the panel's y unit; absent while not yet typed. */
  readonly y?: number;
  readonly label?: string;
}

/** A panel of the record (frame and units optional, as in the file) plus what it plots (view only). */
export type PanelDraft = Readonly<Omit<Panel, 'anchors'>> & {
  readonly anchors: readonly AnchorDraft[];
  /** View only: what the panel plots; decides the default y unit and the quantity to trace. */
  readonly plots: Quantity;
};

export type CaptureMethod = Trace['method'];

/** A trace of the record (extent, captured_by, … kept as they came) plus the view-only switches. */
export type TraceDraft = Readonly<Omit<Trace, 'id' | 'guides'>> & {
  readonly id: string;
  /** Clicks on the drawn line; empty for a trace of explicit points. */
  readonly guides: readonly SheetXY[];
  /** View only. */
  readonly hidden?: boolean;
  /** View only. */
  readonly locked?: boolean;
  /**
   * View only: `points` are hand edits of the capture. The capture is kept for "undo edits" but
   * not written to the file, so that no reader takes it for the points that count.
   */
  readonly edited?: boolean;
};

export interface SheetRef {
  /** The record's `sheet`: the sheet's path as the take-off file refers to it. */
  readonly path: string;
  /** View only: file name of the opened sheet. */
  readonly name: string;
  /** View only: SHA-256 of the opened sheet's bytes (the record's own is `sheet_sha256`). */
  readonly sha256?: string;
  readonly kind: 'pdf' | 'image';
  readonly mime: string;
  /** The record's `page`. */
  readonly page: number;
  readonly pageCount: number;
  /** Size of the chosen page in sheet units. */
  readonly width: number;
  readonly height: number;
}

/** The record's pump: name, speed, specific gravity, and maker, model, size, type, stages, suction when known. */
export type PumpDraft = Readonly<z.output<typeof TakeoffPump>>;

/** The record's units: power and NPSH may be absent, as in the file. */
export type UnitsDraft = Readonly<z.output<typeof TakeoffUnits>>;

export interface Draft {
  readonly sheet: SheetRef | null;
  /** The record's checksum of the sheet the points were captured from. */
  readonly sheet_sha256?: string;
  readonly pump: PumpDraft;
  readonly units: UnitsDraft;
  readonly panels: readonly PanelDraft[];
  readonly traces: readonly TraceDraft[];
  readonly notes?: readonly string[];
  /** The record's provenance of an automatic take-off: what found the parts, and what it asks. */
  readonly detected?: { readonly by: string; readonly questions: readonly string[] };
  /** The record's efficiency levels drawn as iso-lines, as the engineer gave them to the automatic take-off. */
  readonly iso_levels?: readonly number[];
  /** The record's minimum continuous flow, in units.flow. */
  readonly min_flow?: number;
  /**
   * View only: true when the family's diameters (or speeds) were given as the answer to the
   * automatic take-off; the file then carries them as its `diameters` (or `speeds`).
   */
  readonly labelsGiven?: boolean;
  /**
   * View only: the pump's speed was read from the sheet, typed, or loaded with a take-off file.
   * Unset, `pump.speed_rpm` is still the workbench's starting value, which no sheet vouches for.
   */
  readonly speedGiven?: boolean;
  /** View only: the impeller diameters of the family, largest first, in units.diameter. */
  readonly diameters: readonly number[];
  /** View only: the kind of sheet: impeller diameters at one speed, or one impeller at several speeds. */
  readonly family: FamilyKind;
  /** View only: the drawn speeds of a speed family, fastest first, in rpm. */
  readonly speeds: readonly number[];
}

export type FamilyKind = 'diameter' | 'speed';

export const EMPTY_DRAFT: Draft = {
  sheet: null,
  pump: { name: '', speed_rpm: 2900, specific_gravity: 1 },
  units: { flow: 'm3/h', head: 'm', power: 'kW', npsh: 'm', diameter: 'mm' },
  diameters: [],
  family: 'diameter',
  speeds: [],
  panels: [],
  traces: [],
};

/** The power unit numbers are read in: the record's, else what the curve set shows (hp for gpm sheets, kW otherwise). */
export function powerUnit(units: UnitsDraft): string {
  return units.power ?? defaultPowerToken(units.flow);
}

/** The NPSH unit: the record's, else the head unit. */
export function npshUnit(units: UnitsDraft): string {
  return units.npsh ?? units.head;
}

/** The plot area of a panel: its frame, or the box around its anchors when the file gave none. */
export function frameOf(panel: Pick<PanelDraft, 'frame' | 'anchors'>): Frame {
  if (panel.frame) return panel.frame;
  const xs = panel.anchors.map((a) => a.at[0]);
  const ys = panel.anchors.map((a) => a.at[1]);
  if (xs.length === 0) return [0, 0, 1, 1];
  return [Math.min(...xs), Math.min(...ys), Math.max(...xs), Math.max(...ys)];
}

/** Shared area of two rectangles [left, top, right, bottom] over the area of their union, 0 to 1. */
export function frameOverlap(a: readonly number[], b: readonly number[]): number {
  const w = Math.max(0, Math.min(a[2] as number, b[2] as number) - Math.max(a[0] as number, b[0] as number));
  const h = Math.max(0, Math.min(a[3] as number, b[3] as number) - Math.max(a[1] as number, b[1] as number));
  const area = (r: readonly number[]) => Math.max(0, (r[2] as number) - (r[0] as number)) * Math.max(0, (r[3] as number) - (r[1] as number));
  const union = area(a) + area(b) - w * h;
  return union > 0 ? (w * h) / union : 0;
}

/** The units a panel's axes are read in: its own, else the record's by what it plots. */
export function axisUnits(units: UnitsDraft, panel: Pick<PanelDraft, 'units' | 'plots'>): { x: string; y: string } {
  return { x: panel.units?.x ?? units.flow, y: panel.units?.y ?? defaultYUnit(units, panel.plots) };
}

/** The unit a panel's y axis is read in, by what it plots. */
export function defaultYUnit(units: UnitsDraft, plots: Quantity): string {
  switch (plots) {
    case 'head': return units.head;
    case 'npshr': return npshUnit(units);
    case 'power': return powerUnit(units);
    case 'efficiency': return '%';
  }
}

/** The captured points of a trace as they count: hand-edited points win over the capture. */
export function pointsOf(trace: TraceDraft): readonly SheetXY[] {
  return trace.points ?? trace.captured ?? [];
}

/** A fresh id with the prefix that no record of the list uses yet. */
export function freshId(prefix: string, taken: readonly { id: string }[]): string {
  const used = new Set(taken.map((r) => r.id));
  for (let n = 1; ; n++) if (!used.has(`${prefix}${n}`)) return `${prefix}${n}`;
}

/** Anchors with a value on the axis: the ones calibration can use. */
export function anchorsWithValues(panel: PanelDraft): AnchorDraft[] {
  return panel.anchors.filter((a) => a.x !== undefined || a.y !== undefined);
}

/** The axis an anchor reads: the one it has a value for, else the one its label names. */
export function anchorAxis(a: AnchorDraft): 'x' | 'y' {
  if (a.x !== undefined && a.y === undefined) return 'x';
  if (a.y !== undefined && a.x === undefined) return 'y';
  return a.label?.trim().toLowerCase().startsWith('y') ? 'y' : 'x';
}

/** The explicit frame of a trace's panel, as a capture request field (the replay uses the same one, never a guessed one). */
export function frameOfPanel(panels: readonly Pick<PanelDraft, 'id' | 'frame'>[], panel: string | undefined): { frame?: Frame } {
  const frame = panel === undefined ? undefined : panels.find((p) => p.id === panel)?.frame;
  return frame ? { frame } : {};
}

/** The labels a curve of the sheet can carry: the impeller diameters, or the drawn speeds (rpm) of a speed family. */
export function familyLabels(draft: Pick<Draft, 'family' | 'diameters' | 'speeds'>): readonly number[] {
  return draft.family === 'speed' ? draft.speeds : draft.diameters;
}

/** The label of a trace's curve: its diameter, or its speed (rpm); undefined for iso-lines and limit lines. */
export function labelOf(t: Pick<TraceDraft, 'diameter' | 'speed'>): number | undefined {
  return t.diameter ?? t.speed;
}

/** The record's field for a curve label of this sheet: `diameter` (units.diameter) or `speed` (rpm). */
export function labelField(draft: Pick<Draft, 'family'>, value: number): { diameter: number } | { speed: number } {
  return draft.family === 'speed' ? { speed: value } : { diameter: value };
}

/** The family kind a list of traces is labelled by, or undefined when no trace carries a label yet. */
export function familyOfTraces(traces: readonly Pick<TraceDraft, 'diameter' | 'speed'>[]): FamilyKind | undefined {
  if (traces.some((t) => t.speed !== undefined)) return 'speed';
  if (traces.some((t) => t.diameter !== undefined)) return 'diameter';
  return undefined;
}
