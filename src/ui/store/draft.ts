/**
 * The workbench's document: a take-off in progress. It holds the same records as the
 * take-off file (panels, anchors, traces, captured points) plus what only the workbench
 * needs (the sheet's name and page count, the list of diameters, hidden and locked traces,
 * anchors still waiting for their value). `toTakeoffFile` and `fromTakeoffFile` convert
 * to and from the file; each record is validated with the file's own schema on the way.
 *
 * Sheet coordinates: PDF points or image pixels, origin top-left, y down.
 * Values are as read off the sheet, in the units the draft names — never SI.
 */
import type { Quantity } from '../../model/curveset.ts';
import type { AxisScaleType, SheetXY } from '../../model/takeoff.ts';

export type Frame = readonly [left: number, top: number, right: number, bottom: number];

export interface AnchorDraft {
  readonly at: SheetXY;
  /** Value on the x axis (flow), in the panel's x unit; absent while not yet typed. */
  readonly x?: number;
  /** Value on the y axis, in the panel's y unit; absent while not yet typed. */
  readonly y?: number;
  readonly label?: string;
}

export interface PanelDraft {
  readonly id: string;
  /** What the panel plots; decides the y unit and the default quantity to trace. */
  readonly plots: Quantity;
  readonly frame: Frame;
  readonly anchors: readonly AnchorDraft[];
  readonly x_scale: AxisScaleType;
  readonly y_scale: AxisScaleType;
  readonly units: { readonly x: string; readonly y: string };
}

export type CaptureMethod = 'auto' | 'vector' | 'raster';

export interface TraceDraft {
  readonly id: string;
  readonly panel: string;
  readonly quantity: Quantity;
  /** Impeller diameter in the draft's diameter unit. */
  readonly diameter?: number;
  /** The constant of an iso-trace (efficiency in %, power in the power unit). */
  readonly iso?: number;
  readonly guides: readonly SheetXY[];
  readonly method: CaptureMethod;
  /** What the last capture produced from the guides. */
  readonly captured?: readonly SheetXY[];
  /** Points as edited by hand; when present they are used as they are. */
  readonly points?: readonly SheetXY[];
  readonly hidden?: boolean;
  readonly locked?: boolean;
}

export interface SheetRef {
  /** File name of the sheet, as the take-off file will refer to it. */
  readonly name: string;
  readonly sha256?: string;
  readonly kind: 'pdf' | 'image';
  readonly mime: string;
  readonly page: number;
  readonly pageCount: number;
  /** Size of the chosen page in sheet units. */
  readonly width: number;
  readonly height: number;
}

export interface PumpDraft {
  readonly name: string;
  readonly speed_rpm: number;
  readonly specific_gravity: number;
}

export interface UnitsDraft {
  readonly flow: string;
  readonly head: string;
  readonly power: string;
  readonly npsh: string;
  readonly diameter: string;
}

export interface Draft {
  readonly sheet: SheetRef | null;
  readonly pump: PumpDraft;
  readonly units: UnitsDraft;
  /** The impeller diameters of the family, largest first, in units.diameter. */
  readonly diameters: readonly number[];
  readonly panels: readonly PanelDraft[];
  readonly traces: readonly TraceDraft[];
  readonly notes: readonly string[];
}

export const EMPTY_DRAFT: Draft = {
  sheet: null,
  pump: { name: '', speed_rpm: 2900, specific_gravity: 1 },
  units: { flow: 'm3/h', head: 'm', power: 'kW', npsh: 'm', diameter: 'mm' },
  diameters: [],
  panels: [],
  traces: [],
  notes: [],
};

/** The unit a panel's y axis is read in, by what it plots. */
export function defaultYUnit(units: UnitsDraft, plots: Quantity): string {
  switch (plots) {
    case 'head': return units.head;
    case 'npshr': return units.npsh;
    case 'power': return units.power;
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
