/**
 * One random sheet of the independent bed, from a seed: the plan, the picture (JPEG) and a
 * take-off as a hurried person would make it (four or more anchors a panel on grid
 * crossings, one to three guides a line at random places, some inside bunches and on
 * crossings), with the exact truth to score the replay against.
 */
import { Dice } from './dice.ts';
import { applyH, chooseShot, rasterise, shoot, type Shot } from './camera.ts';
import { planSheet, toFlat, type LinePlan, type PanelPlan, type Pt, type SheetPlan } from './plan.ts';
import { drawnRange, exact, isoFlows, UNIT_NAMES, type PumpFamily, type Quantity } from './pumpFamily.ts';
import { sheetSvg } from './svg.ts';
import type { TakeoffInput } from '../../src/model/takeoff.ts';

export interface TruthCurve {
  quantity: Quantity;
  diameter: number;
  /** Speed in rpm, for a curve of a speed family (speedSheet.ts). */
  speed?: number;
  /** How the sheet gives it: a drawn curve, or iso-lines crossing the head curve. */
  source: 'curve' | 'iso';
  /** Flow range to score over, family flow unit (15–95 % of the drawn range, or the crossings' span for iso). */
  range: [number, number];
  /** Span of the axis it is read on (value unit); 100 for efficiency (points). */
  span: number;
  /** Trace ids that produce it. */
  traces: string[];
}

export interface RandomSheet {
  seed: number;
  plan: SheetPlan;
  shot: Shot;
  jpeg: Buffer;
  takeoff: TakeoffInput;
  truth: TruthCurve[];
}

export function anchorsFor(dice: Dice, panel: PanelPlan, shot: Shot, count: number): NonNullable<TakeoffInput['panels'][number]['anchors']> {
  const xs: number[] = [];
  const ys: number[] = [];
  for (let v = panel.x.min; v <= panel.x.max + 1e-9; v += panel.x.step) xs.push(Number(v.toPrecision(12)));
  for (let v = panel.y.min; v <= panel.y.max + 1e-9; v += panel.y.step) ys.push(Number(v.toPrecision(12)));
  // Near the corners first (as people do), then anywhere on the grid.
  const pickNear = (list: number[], end: 0 | 1) => (end === 0 ? list[dice.whole(0, Math.min(1, list.length - 1))] : list[list.length - 1 - dice.whole(0, Math.min(1, list.length - 1))]) as number;
  const chosen: Array<[number, number]> = [
    [pickNear(xs, 0), pickNear(ys, 0)],
    [pickNear(xs, 1), pickNear(ys, 0)],
    [pickNear(xs, 0), pickNear(ys, 1)],
    [pickNear(xs, 1), pickNear(ys, 1)],
  ];
  while (chosen.length < count) chosen.push([dice.pick(xs), dice.pick(ys)]);
  const seen = new Set<string>();
  return chosen
    .filter(([x, y]) => (seen.has(`${x},${y}`) ? false : (seen.add(`${x},${y}`), true)))
    .map(([x, y]) => {
      const at = applyH(shot.h, toFlat(panel, x, y));
      // Snapped to the grid crossing by the workbench, still a few tenths of a pixel off.
      return { at: [at[0] + 0.2 * dice.normal(), at[1] + 0.2 * dice.normal()] as [number, number], x, y };
    });
}

/** Where a hurried person clicks on a line: 1–3 places, sorted along it, a little off the centre. */
export function guidesFor(dice: Dice, line: LinePlan, crossings: Pt[], shot: Shot): Array<[number, number]> {
  const count = dice.pick([1, 2, 2, 3, 3]);
  const n = line.points.length;
  const at: Pt[] = [];
  const fractions: number[] = [];
  for (let i = 0; i < count; i++) fractions.push(dice.between(0.02, 0.98));
  if (line.quantity !== 'head' && dice.chance(0.35)) fractions[0] = dice.between(0.02, 0.2); // inside the bunch at low flow
  fractions.sort((a, b) => a - b);
  for (const f of fractions) {
    const k = Math.round(f * (n - 1));
    const p = line.points[k] as Pt;
    const q = line.points[Math.min(n - 1, k + 1)] as Pt;
    const r = line.points[Math.max(0, k - 1)] as Pt;
    const tx = q[0] - r[0];
    const ty = q[1] - r[1];
    const len = Math.hypot(tx, ty) || 1;
    const off = Math.max(-2, Math.min(2, (0.3 * line.style.width + 0.4) * dice.normal()));
    at.push([p[0] - (ty / len) * off, p[1] + (tx / len) * off]);
  }
  if (line.iso !== undefined && crossings.length > 0 && dice.chance(0.6)) {
    // The natural place to click an iso-line: where it meets the head curves.
    const pickCount = Math.min(crossings.length, dice.whole(1, 3));
    const chosen = dice.shuffle([...crossings]).slice(0, pickCount);
    at.splice(0, Math.min(at.length, pickCount), ...chosen);
    // Keep them in order along the line.
    const order = (p: Pt) => {
      let best = 0;
      let bestD = Infinity;
      line.points.forEach((q, i) => {
        const d = Math.hypot(q[0] - p[0], q[1] - p[1]);
        if (d < bestD) {
          bestD = d;
          best = i;
        }
      });
      return best;
    };
    at.sort((a, b) => order(a) - order(b));
  }
  return at.map((p) => applyH(shot.h, p));
}

/** Room a careful guide leaves to every other line of its panel: line widths, plus pixels. */
const CAREFUL_ROOM_WIDTHS = 4;
const CAREFUL_ROOM_PX = 8;

/** Least share of a line's length its stand-alone stretches must span for the careful guides to keep to them. */
const CAREFUL_ALONE_SHARE = 0.25;

/**
 * Where a careful person clicks on a line: `count` places spread evenly over the stretches where
 * no other line of the panel passes within a few line widths (the line stands alone there), on the
 * line's centre. Where those stretches span less than `CAREFUL_ALONE_SHARE` of the line (lines
 * drawn close side by side all along), the person spreads the clicks along the line instead, each
 * where the line has the most room within its share of the line's length. The hurried guides
 * (guidesFor) are kept for a line too short for that. Flat page pixels, mapped through the
 * camera. A second view of the bed: what the tracer does when the person did their part, apart
 * from where a hurried click put it.
 */
export function carefulGuides(plan: SheetPlan, line: LinePlan, shot: Shot, count = 3): Array<[number, number]> | undefined {
  const others = plan.lines.filter((l) => l !== line && l.panel === line.panel);
  const room = CAREFUL_ROOM_WIDTHS * line.style.width + CAREFUL_ROOM_PX;
  const points = line.points;
  if (points.length < 2 * count) return undefined;
  // Room at each point: the distance to the nearest point of another line (as far as `reach` looks).
  const reach = 4 * room;
  const clearance = points.map((p) => {
    let best = reach;
    for (const o of others) for (const q of o.points) if (Math.abs(q[0] - p[0]) < best && Math.abs(q[1] - p[1]) < best) best = Math.min(best, Math.hypot(q[0] - p[0], q[1] - p[1]));
    return best;
  });
  const along = [0];
  for (let k = 1; k < points.length; k++) along.push((along[k - 1] as number) + Math.hypot((points[k] as Pt)[0] - (points[k - 1] as Pt)[0], (points[k] as Pt)[1] - (points[k - 1] as Pt)[1]));
  const length = along[along.length - 1] as number;
  const alone = points.map((_, k) => k).filter((k) => (clearance[k] as number) >= room);
  const spanned = alone.length > 0 ? (along[alone[alone.length - 1] as number] as number) - (along[alone[0] as number] as number) : 0;
  const at = (k: number) => applyH(shot.h, points[k] as Pt);
  if (alone.length >= count && spanned >= CAREFUL_ALONE_SHARE * length) return Array.from({ length: count }, (_, j) => at(alone[Math.floor(((j + 0.5) / count) * alone.length)] as number));
  // Spread along the line: in each share of its length, the point with the most room (the share's middle among equals).
  return Array.from({ length: count }, (_, j) => {
    const from = (j / count) * length;
    const to = ((j + 1) / count) * length;
    const mid = (from + to) / 2;
    let best = -1;
    for (let k = 0; k < points.length; k++) {
      const s = along[k] as number;
      if (s < from || s > to) continue;
      if (best < 0 || (clearance[k] as number) > (clearance[best] as number) + 0.5 || (Math.abs((clearance[k] as number) - (clearance[best] as number)) <= 0.5 && Math.abs(s - mid) < Math.abs((along[best] as number) - mid))) best = k;
    }
    return at(Math.max(0, best));
  });
}

/** The sheet's take-off with every raster trace's guides placed carefully (carefulGuides), where a line stands alone anywhere. */
export function withCarefulGuides(takeoff: TakeoffInput, seed: number, kind: 'scan' | 'photo'): TakeoffInput {
  const { plan, shot } = sheetGeometry(seed, kind);
  return {
    ...takeoff,
    traces: takeoff.traces.map((t) => {
      const line = plan.lines.find((l) => l.id === t.id);
      const guides = line && t.guides ? carefulGuides(plan, line, shot) : undefined;
      return guides ? { ...t, guides } : t;
    }),
  };
}

export async function makeRandomSheet(seed: number, kind: 'scan' | 'photo'): Promise<RandomSheet> {
  const dice = new Dice(seed);
  const plan = planSheet(dice);
  const flat = await rasterise(sheetSvg(plan), plan.width, plan.height);
  const shot = chooseShot(dice, kind, plan.width, plan.height);
  const jpeg = await shoot(dice, flat, plan.width, plan.height, shot);
  const family = plan.family;
  const u = UNIT_NAMES[family.units];
  const headPanel = plan.panels.find((p) => p.quantity === 'head') as PanelPlan;

  const panels: TakeoffInput['panels'] = plan.panels.map((p) => {
    const corners = [toFlat(p, p.x.min, p.y.min), toFlat(p, p.x.max, p.y.min), toFlat(p, p.x.max, p.y.max), toFlat(p, p.x.min, p.y.max)].map((c) => applyH(shot.h, c));
    const frame: [number, number, number, number] = [Math.min(...corners.map((c) => c[0])), Math.min(...corners.map((c) => c[1])), Math.max(...corners.map((c) => c[0])), Math.max(...corners.map((c) => c[1]))];
    return { id: p.id, anchors: anchorsFor(dice, p, shot, dice.chance(0.3) ? 5 : 4), frame, units: { y: p.quantity === 'efficiency' ? '%' : p.quantity === 'power' ? u.power : p.quantity === 'npshr' ? u.npsh : u.head } };
  });

  const traces: TakeoffInput['traces'] = [];
  for (const line of plan.lines) {
    const crossings: Pt[] = [];
    if (line.iso !== undefined) {
      for (const d of family.diameters) for (const q of isoFlows(family, d, line.iso)) crossings.push(toFlat(headPanel, q, exact(family, 'head', d, q)));
    }
    const near = crossings.filter((c) => line.points.some((p) => Math.hypot(p[0] - c[0], p[1] - c[1]) < 2));
    traces.push({
      id: line.id,
      panel: line.panel,
      quantity: line.quantity,
      ...(line.iso !== undefined ? { iso: line.iso } : { diameter: line.diameter as number }),
      guides: guidesFor(dice, line, near, shot),
    });
  }

  const truth = truthOf(plan);

  const takeoff: TakeoffInput = {
    sheet: `random-${seed}.jpg`,
    pump: { name: `Invented random family ${seed} (not a real product)`, speed_rpm: family.speed },
    units: { flow: u.flow, head: u.head, power: u.power, npsh: u.npsh, diameter: u.diameter },
    panels,
    traces,
  };
  return { seed, plan, shot, jpeg, takeoff, truth };
}

export function familyOf(sheet: RandomSheet): PumpFamily {
  return sheet.plan.family;
}

/** The plan and the camera of a sheet without drawing it (the dice are cast in the same order). */
export function sheetGeometry(seed: number, kind: 'scan' | 'photo'): { plan: SheetPlan; shot: Shot } {
  const dice = new Dice(seed);
  const plan = planSheet(dice);
  return { plan, shot: chooseShot(dice, kind, plan.width, plan.height) };
}

/**
 * The real error of a panel's calibration, % of span: data read through `toData` at a 9 × 9
 * grid of points over the panel, against the values they were drawn at.
 */
export function calibrationError(plan: SheetPlan, shot: Shot, panelId: string, toData: (p: readonly [number, number]) => readonly [number, number]): number {
  const panel = plan.panels.find((p) => p.id === panelId) as PanelPlan;
  let worst = 0;
  for (let i = 0; i <= 8; i++) {
    for (let j = 0; j <= 8; j++) {
      const q = panel.x.min + ((panel.x.max - panel.x.min) * i) / 8;
      const v = panel.y.min + ((panel.y.max - panel.y.min) * j) / 8;
      const d = toData(applyH(shot.h, toFlat(panel, q, v)));
      worst = Math.max(worst, (100 * Math.abs(d[0] - q)) / (panel.x.max - panel.x.min), (100 * Math.abs(d[1] - v)) / (panel.y.max - panel.y.min));
    }
  }
  return worst;
}

/** The exact truth of a plan as the bed scores it: 15–95 % of each drawn curve's flow range, and efficiency from the iso-lines over the flows where they cross each head curve. */
export function truthOf(plan: SheetPlan): TruthCurve[] {
  const family = plan.family;
  const truth: TruthCurve[] = [];
  for (const line of plan.lines) {
    if (line.iso !== undefined || line.diameter === undefined) continue;
    const panel = plan.panels.find((p) => p.id === line.panel) as PanelPlan;
    const [a, b] = drawnRange(family, line.quantity, line.diameter);
    truth.push({
      quantity: line.quantity,
      diameter: line.diameter,
      source: 'curve',
      range: [a + 0.15 * (b - a), a + 0.95 * (b - a)],
      span: line.quantity === 'efficiency' ? 100 : panel.y.max - panel.y.min,
      traces: [line.id],
    });
  }
  const isoLines = plan.lines.filter((l) => l.iso !== undefined);
  if (isoLines.length > 0) {
    for (const d of family.diameters) {
      const flows = isoLines.flatMap((l) => isoFlows(family, d, l.iso as number));
      if (flows.length < 2) continue;
      const [a, b] = drawnRange(family, 'head', d);
      const lo = Math.max(Math.min(...flows), a + 0.15 * (b - a));
      const hi = Math.min(Math.max(...flows), a + 0.95 * (b - a));
      if (!(hi > lo)) continue;
      truth.push({ quantity: 'efficiency', diameter: d, source: 'iso', range: [lo, hi], span: 100, traces: [...isoLines.map((l) => l.id), `head-${d}`] });
    }
  }
  return truth;
}
