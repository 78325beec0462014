/**
 * Paints what the engineer has placed over the sheet: panel frames, anchors, guides, captured
 * points, the fitted curves of the review, and the active tool's preview. Everything is drawn
 * in screen space from sheet coordinates, so line widths and marks stay the same at any zoom.
 */
import type { Quantity } from '../../model/curveset.ts';
import type { SheetXY } from '../../model/takeoff.ts';
import { frameOf, anchorAxis, pointsOf, type Draft, type PanelDraft, type TraceDraft } from '../store/draft.ts';
import type { Session } from '../store/store.ts';
import { toScreen, type View } from './view.ts';
import { clearestPlace, spreadLabels, type LabelBox } from '../geometry/labels.ts';

/** Ink of each quantity on the overlay (chosen to read against black and grey print). */
export const QUANTITY_INK: Record<Quantity, string> = {
  head: '#1f4fa3',
  efficiency: '#1b7f4b',
  power: '#a8321f',
  npshr: '#6a3fa0',
};

/** The fitted curves are drawn in one contrasting style so that a misfit shows against the source. */
export const FIT_INK = '#e0007a';

export type Preview =
  | { kind: 'frame'; a: SheetXY; b: SheetXY; snapped: boolean }
  | { kind: 'snap'; at: SheetXY; what: 'crossing' | 'tick' | 'line' | 'free' }
  | { kind: 'point'; trace: string; index: number }
  | { kind: 'segment'; trace: string; at: SheetXY }
  | { kind: 'drag'; trace: string; index: number; at: SheetXY }
  | { kind: 'drag-guide'; trace: string; index: number; at: SheetXY };

export interface FitLine {
  traceIds: readonly string[];
  quantity: Quantity;
  /** Sheet points along the fitted curve, inside the fitted range. */
  points: readonly SheetXY[];
  /** What the curve is, as the sheet labels it ("250 mm", "1575 rpm (90 %)"), written at its end. */
  label: string;
}

export interface Scene {
  draft: Draft;
  session: Session;
  calibrated: ReadonlySet<string>;
  fits: readonly FitLine[];
  preview: Preview | null;
  /** Guides placed but not yet captured. */
  pendingGuides: readonly SheetXY[];
  /** Anchors proposed from the text layer, not yet taken. */
  proposals: readonly { at: SheetXY; axis: 'x' | 'y'; value: number }[];
  /** Which layers the open step shows. */
  layers: { readonly anchors: boolean; readonly traces: boolean; readonly fits: boolean };
}

const HALO = 'rgba(255,255,255,0.92)';

function line(ctx: CanvasRenderingContext2D, view: View, pts: readonly SheetXY[]): void {
  ctx.beginPath();
  pts.forEach((p, i) => {
    const [x, y] = toScreen(view, p);
    if (i === 0) ctx.moveTo(x, y);
    else ctx.lineTo(x, y);
  });
}

function haloStroke(ctx: CanvasRenderingContext2D, colour: string, width: number, dash: number[] = []): void {
  ctx.setLineDash([]);
  ctx.strokeStyle = HALO;
  ctx.lineWidth = width + 3;
  ctx.stroke();
  ctx.setLineDash(dash);
  ctx.strokeStyle = colour;
  ctx.lineWidth = width;
  ctx.stroke();
  ctx.setLineDash([]);
}

function label(ctx: CanvasRenderingContext2D, text: string, x: number, y: number, colour: string, background = 'rgba(255,255,255,0.9)'): void {
  ctx.font = '600 12px system-ui, sans-serif';
  const w = ctx.measureText(text).width;
  ctx.fillStyle = background;
  ctx.fillRect(x - 3, y - 13, w + 6, 17);
  ctx.fillStyle = colour;
  ctx.fillText(text, x, y);
}

const PANEL_INK = '#0d6b6b';

/**
 * Where a panel's name is drawn: inside the frame, in the corner that the panel's lines (traces
 * and fitted curves) leave clear, top right first (away from the axis labels on the left), then
 * top left, bottom right, bottom left. The box as `label` paints it (3 px of background either
 * side, 13 px above the baseline to 4 below) keeps 10 px inside the frame, clear of the anchor
 * diamonds on its edges (radius up to 6 px).
 */
function panelBadge(ctx: CanvasRenderingContext2D, view: View, panel: PanelDraft, calibrated: boolean, lines: readonly (readonly SheetXY[])[] = []): LabelBox & { text: string } {
  const [l, t, r, b] = frameOf(panel);
  const [x0, y0] = toScreen(view, [l, t]);
  const [x1, y1] = toScreen(view, [r, b]);
  const name = { head: 'Head', efficiency: 'Efficiency', power: 'Power', npshr: 'NPSHr' }[panel.plots];
  const text = `${name} panel${calibrated ? '' : ' · axes not set'}`;
  ctx.font = '600 12px system-ui, sans-serif';
  const w = ctx.measureText(text).width;
  const [left, right] = [Math.min(x0, x1), Math.max(x0, x1)];
  const [top, bottom] = [Math.min(y0, y1), Math.max(y0, y1)];
  // Baselines: the box's top 10 px below the top edge, or its bottom 10 px above the bottom edge.
  const places = [
    { x: right - w - 16, y: top + 23 },
    { x: left + 10, y: top + 23 },
    { x: right - w - 16, y: bottom - 14 },
    { x: left + 10, y: bottom - 14 },
  ];
  const onScreen = lines.map((line) => line.map((p) => toScreen(view, p)));
  const pick = places[clearestPlace(places.map((p) => ({ x: p.x, y: p.y - 13, width: w + 6, height: 17 })), onScreen)] as { x: number; y: number };
  return { text, x: pick.x, y: pick.y, width: w + 6 };
}

function paintPanel(ctx: CanvasRenderingContext2D, view: View, panel: PanelDraft, active: boolean, badge: LabelBox & { text: string }): void {
  const [l, t, r, b] = frameOf(panel);
  const [x0, y0] = toScreen(view, [l, t]);
  const [x1, y1] = toScreen(view, [r, b]);
  ctx.beginPath();
  ctx.rect(x0, y0, x1 - x0, y1 - y0);
  haloStroke(ctx, PANEL_INK, active ? 2 : 1.25, active ? [] : [6, 4]);
  label(ctx, badge.text, badge.x + 3, badge.y, '#ffffff', PANEL_INK);
}

function paintAnchors(ctx: CanvasRenderingContext2D, view: View, panel: PanelDraft, active: boolean): void {
  const r = active ? 6 : 4;
  panel.anchors.forEach((a) => {
    const [x, y] = toScreen(view, a.at);
    const valued = a.x !== undefined || a.y !== undefined;
    const isX = anchorAxis(a) === 'x';
    // A diamond, hollow until it has a value; on the panel being set, its value sits beside it.
    ctx.beginPath();
    ctx.moveTo(x, y - r);
    ctx.lineTo(x + r, y);
    ctx.lineTo(x, y + r);
    ctx.lineTo(x - r, y);
    ctx.closePath();
    ctx.fillStyle = valued ? '#c2410c' : 'rgba(255,255,255,0.85)';
    ctx.fill();
    haloStroke(ctx, '#c2410c', active ? 1.5 : 1);
    if (!active) return;
    const value = isX ? a.x : a.y;
    const text = value === undefined ? `${isX ? 'x' : 'y'} ?` : String(value);
    ctx.font = '600 11px system-ui, sans-serif';
    const w = ctx.measureText(text).width;
    // x values under the axis, y values to the left of it, clear of the plot.
    const lx = isX ? x - w / 2 : x - w - 12;
    const ly = isX ? y + 20 : y + 4;
    label(ctx, text, lx, ly, '#7c2d12');
  });
}

function paintTrace(ctx: CanvasRenderingContext2D, view: View, trace: TraceDraft, session: Session, preview: Preview | null): void {
  const dragged = preview?.kind === 'drag' && preview.trace === trace.id ? preview : null;
  const pts = dragged ? pointsOf(trace).map((p, i) => (i === dragged.index ? dragged.at : p)) : pointsOf(trace);
  const movedGuide = preview?.kind === 'drag-guide' && preview.trace === trace.id ? preview : null;
  const guides = movedGuide ? trace.guides.map((g, i) => (i === movedGuide.index ? movedGuide.at : g)) : trace.guides;
  const ink = QUANTITY_INK[trace.quantity];
  const selected = session.selectedTrace === trace.id;
  const highlighted = session.highlightedTrace === trace.id;
  if (highlighted && pts.length > 1) {
    line(ctx, view, pts);
    ctx.strokeStyle = 'rgba(255, 196, 0, 0.55)';
    ctx.lineWidth = 14;
    ctx.lineCap = 'round';
    ctx.lineJoin = 'round';
    ctx.stroke();
  }
  if (pts.length > 1) {
    line(ctx, view, pts);
    haloStroke(ctx, ink, selected ? 2.5 : 1.5, trace.locked ? [2, 3] : []);
  }
  // Points: small squares, larger when the trace is selected for editing.
  const size = selected ? 6 : 3;
  ctx.fillStyle = ink;
  pts.forEach((p, i) => {
    const [x, y] = toScreen(view, p);
    const hot = preview?.kind === 'point' && preview.trace === trace.id && preview.index === i;
    const chosen = selected && session.selectedPoint === i;
    if (hot || chosen) {
      ctx.fillStyle = '#ffffff';
      ctx.fillRect(x - size - 2, y - size - 2, 2 * size + 4, 2 * size + 4);
      ctx.strokeStyle = ink;
      ctx.lineWidth = 2;
      ctx.strokeRect(x - size - 2, y - size - 2, 2 * size + 4, 2 * size + 4);
      ctx.fillStyle = ink;
    } else if (selected || pts.length < 60 || i % Math.ceil(pts.length / 60) === 0) {
      ctx.fillRect(x - size / 2, y - size / 2, size, size);
    }
  });
  guides.forEach((g) => paintGuide(ctx, view, g, ink));
}

/** Starts a path of a cross at (x, y): four arms reaching `reach` px, leaving `hole` px open at the centre. */
function crossPath(ctx: CanvasRenderingContext2D, x: number, y: number, reach: number, hole = 0): void {
  ctx.beginPath();
  for (const [dx, dy] of [[-1, 0], [1, 0], [0, -1], [0, 1]] as const) {
    ctx.moveTo(x + dx * hole, y + dy * hole);
    ctx.lineTo(x + dx * reach, y + dy * reach);
  }
}

function paintGuide(ctx: CanvasRenderingContext2D, view: View, g: SheetXY, ink: string): void {
  const [x, y] = toScreen(view, g);
  ctx.beginPath();
  ctx.arc(x, y, 6, 0, 2 * Math.PI);
  haloStroke(ctx, ink, 1.5);
  crossPath(ctx, x, y, 9, 3);
  ctx.strokeStyle = ink;
  ctx.lineWidth = 1.5;
  ctx.stroke();
}

function paintFits(ctx: CanvasRenderingContext2D, view: View, fits: readonly FitLine[], session: Session, badges: readonly LabelBox[]): void {
  for (const fit of fits) {
    if (fit.points.length < 2) continue;
    line(ctx, view, fit.points);
    const emphasised = session.highlightedTrace !== null && fit.traceIds.includes(session.highlightedTrace);
    haloStroke(ctx, FIT_INK, emphasised ? 3 : 1.75, [7, 4]);
  }
  // Each fitted curve says what it is at its end, so that a curve filed under the wrong diameter
  // or speed shows on the sheet beside the sheet's own label.
  // Ends that bunch (efficiency curves of a speed family end side by side) are spread apart.
  ctx.font = '600 12px system-ui, sans-serif';
  const ends = fits.flatMap((fit) => {
    const end = fit.points[fit.points.length - 1];
    if (fit.points.length < 2 || !end || !fit.label) return [];
    const [x, y] = toScreen(view, end);
    return [{ x: x + 6, y: y - 4, text: fit.label, width: ctx.measureText(fit.label).width + 8 }];
  });
  // They keep clear of the panels' names too, which curves often end beside.
  for (const l of spreadLabels(ends, 17, undefined, badges)) label(ctx, l.text, l.x, l.y, FIT_INK);
}

function paintPreview(ctx: CanvasRenderingContext2D, view: View, preview: Preview): void {
  if (preview.kind === 'frame') {
    const [x0, y0] = toScreen(view, preview.a);
    const [x1, y1] = toScreen(view, preview.b);
    ctx.beginPath();
    ctx.rect(Math.min(x0, x1), Math.min(y0, y1), Math.abs(x1 - x0), Math.abs(y1 - y0));
    haloStroke(ctx, PANEL_INK, 1.5, [4, 3]);
    paintSnap(ctx, view, preview.b, preview.snapped ? 'crossing' : 'free');
  } else if (preview.kind === 'snap') {
    paintSnap(ctx, view, preview.at, preview.what);
  } else if (preview.kind === 'segment') {
    const [x, y] = toScreen(view, preview.at);
    ctx.beginPath();
    ctx.arc(x, y, 5, 0, 2 * Math.PI);
    ctx.fillStyle = 'rgba(255,255,255,0.9)';
    ctx.fill();
    haloStroke(ctx, '#111827', 1.5);
    crossPath(ctx, x, y, 3);
    ctx.stroke();
  }
}

function paintSnap(ctx: CanvasRenderingContext2D, view: View, at: SheetXY, what: string): void {
  const [x, y] = toScreen(view, at);
  ctx.beginPath();
  if (what === 'free') {
    ctx.arc(x, y, 4, 0, 2 * Math.PI);
    haloStroke(ctx, '#374151', 1);
    return;
  }
  // A square reticle marks a point the click will snap to.
  ctx.rect(x - 6, y - 6, 12, 12);
  haloStroke(ctx, '#c2410c', 1.75);
  crossPath(ctx, x, y, 11);
  ctx.strokeStyle = '#c2410c';
  ctx.lineWidth = 1;
  ctx.stroke();
}

function paintProposals(ctx: CanvasRenderingContext2D, view: View, proposals: Scene['proposals']): void {
  for (const p of proposals) {
    const [x, y] = toScreen(view, p.at);
    ctx.beginPath();
    ctx.arc(x, y, 5, 0, 2 * Math.PI);
    haloStroke(ctx, '#c2410c', 1.25, [2, 2]);
    label(ctx, `${p.axis} ${p.value}?`, x + (p.axis === 'x' ? -8 : 8), y + (p.axis === 'x' ? 22 : -8), '#9a3412');
  }
}

export function paintScene(ctx: CanvasRenderingContext2D, view: View, scene: Scene): void {
  const { draft, session } = scene;
  ctx.lineCap = 'round';
  ctx.lineJoin = 'round';
  const showAnchors = scene.layers.anchors;
  // Each panel's name goes where the lines drawn over that panel leave room.
  const badges = draft.panels.map((panel) => {
    const lines = [
      ...(scene.layers.traces ? draft.traces.filter((t) => t.panel === panel.id && !t.hidden).map((t) => pointsOf(t)) : []),
      ...(scene.layers.fits ? scene.fits.filter((f) => f.traceIds.some((id) => draft.traces.find((t) => t.id === id)?.panel === panel.id)).map((f) => f.points) : []),
    ];
    return panelBadge(ctx, view, panel, scene.calibrated.has(panel.id), lines);
  });
  draft.panels.forEach((panel, i) => {
    paintPanel(ctx, view, panel, session.activePanel === panel.id && showAnchors, badges[i] as LabelBox & { text: string });
    if (showAnchors) paintAnchors(ctx, view, panel, session.activePanel === panel.id);
  });
  if (showAnchors) paintProposals(ctx, view, scene.proposals);
  if (scene.layers.traces) {
    for (const trace of draft.traces) if (!trace.hidden) paintTrace(ctx, view, trace, session, scene.preview);
  }
  if (scene.layers.fits) paintFits(ctx, view, scene.fits, session, badges);
  for (const g of scene.pendingGuides) paintGuide(ctx, view, g, '#111827');
  if (scene.preview) paintPreview(ctx, view, scene.preview);
}
