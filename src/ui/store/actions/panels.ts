/** Edits of panels and their anchors (step 2, "Set the axes"). */
import type { Quantity } from '../../../model/curveset.ts';
import type { AxisScaleType, SheetXY } from '../../../model/takeoff.ts';
import { parseUnit, type QuantityKind } from '../../../units/index.ts';
import { axisUnits, defaultYUnit, freshId, type AnchorDraft, type Draft, type Frame, type PanelDraft } from '../draft.ts';
import { edited, EditError, replaceById, requireFinite, type Action } from './action.ts';
import { QUANTITY_WORDS } from '../../views/words.ts';
import { QUANTITY_KIND } from '../../../units/quantityUnits.ts';

export type Axis = 'x' | 'y';


function normalFrame(a: SheetXY, b: SheetXY): Frame {
  return [Math.min(a[0], b[0]), Math.min(a[1], b[1]), Math.max(a[0], b[0]), Math.max(a[1], b[1])];
}

/**
 * The four anchors a new frame starts with: the left and right ends of the x axis along
 * the bottom edge, the bottom and top ends of the y axis along the left edge. Values
 * come from `values` (prefilled from a panel sharing the flow axis, or proposed from the
 * text layer) or are left for the user to type.
 */
export function frameAnchors(frame: Frame, corners: Partial<FrameCorners> = {}, values: { x0?: number; x1?: number; y0?: number; y1?: number } = {}): AnchorDraft[] {
  const [l, t, r, b] = frame;
  const bl = corners.bottomLeft ?? [l, b];
  const br = corners.bottomRight ?? [r, b];
  const tl = corners.topLeft ?? [l, t];
  return [
    { at: bl, label: 'x left', ...(values.x0 !== undefined ? { x: values.x0 } : {}) },
    { at: br, label: 'x right', ...(values.x1 !== undefined ? { x: values.x1 } : {}) },
    { at: bl, label: 'y bottom', ...(values.y0 !== undefined ? { y: values.y0 } : {}) },
    { at: tl, label: 'y top', ...(values.y1 !== undefined ? { y: values.y1 } : {}) },
  ];
}

/** The corners of a plot area as found on the sheet (a scan may be turned a little). */
export interface FrameCorners {
  bottomLeft: SheetXY;
  bottomRight: SheetXY;
  topLeft: SheetXY;
  topRight: SheetXY;
}

/** Names four corner points by where they lie: the two lowest are the bottom, the left of each pair is left. */
export function nameCorners(points: readonly SheetXY[]): FrameCorners {
  const byY = [...points].sort((a, b) => a[1] - b[1]);
  const [t1, t2, b1, b2] = byY as [SheetXY, SheetXY, SheetXY, SheetXY];
  const [topLeft, topRight] = t1[0] <= t2[0] ? [t1, t2] : [t2, t1];
  const [bottomLeft, bottomRight] = b1[0] <= b2[0] ? [b1, b2] : [b2, b1];
  return { bottomLeft, bottomRight, topLeft, topRight };
}

export interface NewPanel {
  corner1: SheetXY;
  corner2: SheetXY;
  plots: Quantity;
  anchors?: AnchorDraft[];
  x_scale?: AxisScaleType;
  y_scale?: AxisScaleType;
  units?: { x?: string; y?: string };
}

export const addPanel = (spec: NewPanel): Action => (draft) => {
  for (const v of [...spec.corner1, ...spec.corner2]) requireFinite(v, 'A frame corner');
  const frame = normalFrame(spec.corner1, spec.corner2);
  if (frame[2] - frame[0] < 4 || frame[3] - frame[1] < 4) throw new EditError('The frame is too small; drag from one corner of the plot area to the opposite corner.');
  const id = freshId(`${spec.plots}-`, draft.panels);
  const panel: PanelDraft = {
    id,
    plots: spec.plots,
    frame: [...frame],
    anchors: spec.anchors ?? frameAnchors(frame),
    x_scale: spec.x_scale ?? 'linear',
    y_scale: spec.y_scale ?? 'linear',
    units: { x: spec.units?.x ?? draft.units.flow, y: spec.units?.y ?? defaultYUnit(draft.units, spec.plots) },
  };
  return edited({ ...draft, panels: [...draft.panels, panel] }, `draw ${QUANTITY_WORDS[spec.plots]} panel`);
};

export const removePanel = (id: string): Action => (draft) => {
  if (!draft.panels.some((p) => p.id === id)) return null;
  return edited({ ...draft, panels: draft.panels.filter((p) => p.id !== id), traces: draft.traces.filter((t) => t.panel !== id) }, `remove panel ${id}`);
};

export const setPanelPlots = (id: string, plots: Quantity): Action => (draft) => {
  const panel = draft.panels.find((p) => p.id === id);
  if (!panel || panel.plots === plots) return null;
  return edited({ ...draft, panels: replaceById(draft.panels, id, (p) => ({ ...p, plots, units: { ...p.units, y: defaultYUnit(draft.units, plots) } }), 'panel') }, `panel ${id} plots ${QUANTITY_WORDS[plots]}`);
};

export const setAxisScale = (id: string, axis: Axis, scale: AxisScaleType): Action => (draft) => {
  const panel = draft.panels.find((p) => p.id === id);
  if (!panel || panel[`${axis}_scale`] === scale) return null;
  return edited({ ...draft, panels: replaceById(draft.panels, id, (p) => ({ ...p, [`${axis}_scale`]: scale }), 'panel') }, `${axis} axis ${scale}`);
};

const AXIS_KIND = {
  x: (): QuantityKind => 'flow',
  y: (plots: Quantity): QuantityKind => QUANTITY_KIND[plots],
};

export const setAxisUnit = (id: string, axis: Axis, token: string): Action => (draft) => {
  const panel = draft.panels.find((p) => p.id === id);
  if (!panel) throw new EditError(`There is no panel "${id}".`);
  let canonical: string;
  try {
    canonical = parseUnit(axis === 'x' ? AXIS_KIND.x() : AXIS_KIND.y(panel.plots), token).token;
  } catch (error) {
    throw new EditError((error as Error).message);
  }
  if (axisUnits(draft.units, panel)[axis] === canonical) return null;
  return edited({ ...draft, panels: replaceById(draft.panels, id, (p) => ({ ...p, units: { ...p.units, [axis]: canonical } }), 'panel') }, `${axis} unit ${canonical}`);
};

function changeAnchors(draft: Draft, id: string, change: (anchors: readonly AnchorDraft[]) => AnchorDraft[]): Draft {
  return { ...draft, panels: replaceById(draft.panels, id, (p) => ({ ...p, anchors: change(p.anchors) }), 'panel') };
}

function requireAnchor(draft: Draft, id: string, index: number): AnchorDraft {
  const a = draft.panels.find((p) => p.id === id)?.anchors[index];
  if (!a) throw new EditError(`Panel ${id} has no anchor ${index + 1}.`);
  return a;
}

/** A new anchor; its label ('x' or 'y') says which axis its value will be read on. */
export const addAnchor = (id: string, at: SheetXY, axis: Axis, values: { x?: number; y?: number } = {}): Action => (draft) => {
  requireFinite(at[0], 'The anchor position');
  requireFinite(at[1], 'The anchor position');
  return edited(changeAnchors(draft, id, (list) => [...list, { at, label: axis, ...values }]), `place ${axis} anchor`);
};

export const moveAnchor = (id: string, index: number, at: SheetXY): Action => (draft) => {
  const a = requireAnchor(draft, id, index);
  if (a.at[0] === at[0] && a.at[1] === at[1]) return null;
  return edited(changeAnchors(draft, id, (list) => list.map((x, i) => (i === index ? { ...x, at } : x))), 'move anchor');
};

/** Sets (or, with undefined, clears) one value of an anchor. */
export const setAnchorValue = (id: string, index: number, axis: Axis, value: number | undefined): Action => (draft) => {
  const a = requireAnchor(draft, id, index);
  if (value !== undefined) requireFinite(value, `The ${axis} value`);
  if (a[axis] === value) return null;
  return edited(
    changeAnchors(draft, id, (list) =>
      list.map((x, i) => {
        if (i !== index) return x;
        const { [axis]: _old, ...rest } = x;
        return value === undefined ? rest : { ...rest, [axis]: value };
      }),
    ),
    `anchor ${axis} = ${value ?? 'blank'}`,
  );
};

export const removeAnchor = (id: string, index: number): Action => (draft) => {
  requireAnchor(draft, id, index);
  return edited(changeAnchors(draft, id, (list) => list.filter((_, i) => i !== index)), 'remove anchor');
};

/** Takes anchors proposed from the sheet's text, with the axis scales they imply, in one step. */
export const useProposal = (id: string, anchors: readonly AnchorDraft[], xScale: AxisScaleType, yScale: AxisScaleType): Action => (draft) => {
  if (anchors.length === 0) throw new EditError('The proposal holds no anchors.');
  for (const a of anchors) {
    requireFinite(a.at[0], 'An anchor position');
    requireFinite(a.at[1], 'An anchor position');
  }
  return edited({ ...draft, panels: replaceById(draft.panels, id, (p) => ({ ...p, anchors: [...anchors], x_scale: xScale, y_scale: yScale }), 'panel') }, 'use proposed anchors');
};
