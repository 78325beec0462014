/**
 * Lays out an INVENTED performance sheet: panels with frames, grids and tick labels; head,
 * efficiency, power and NPSHr curves of a family; iso-efficiency lines across the head
 * curves or an efficiency panel; labels; and guides on every line for the take-off file.
 * Everything is in sheet units (PDF points on a US-letter page, origin top-left, y down).
 */
import { alongPolyline, clearance, seededRandom, textWidth, type Colour, type Drawing, type Ink, type Item } from './drawing.ts';
import { closingDiameter, efficiency, endFlow, familyOf, head, isoFlows, npshr, power, type Family, type UnitSystemName } from './family.ts';

export type PanelId = 'head' | 'efficiency' | 'power' | 'npsh';
export type CurveQuantity = 'head' | 'efficiency' | 'power' | 'npshr';

export interface SheetSpec {
  name: string;
  system: UnitSystemName;
  /** 'iso': efficiency as iso-lines across the head curves; 'panels': efficiency in its own panel. */
  layout: 'iso' | 'panels';
  ink: 'colour' | 'black';
  /** A deliberately faulty sheet for the checks: one diameter announced wrong, or one power curve drawn 9 % high. */
  fault?: 'announced-diameter' | 'power-high';
  /** Diameter labels of the power curves sit on the lines, on a white patch that interrupts them. */
  labelsOnLines?: boolean;
  seed?: number;
}

export interface Axis {
  min: number;
  max: number;
  step: number;
  unit: string;
}

export interface PanelDef {
  id: PanelId;
  frame: [number, number, number, number];
  x: Axis;
  y: Axis;
}

export interface CurveDef {
  id: string;
  panel: PanelId;
  quantity: CurveQuantity;
  /** Diameter as the sheet and take-off announce it. */
  diameter: number;
  /** Diameter the line is actually drawn for. */
  drawn_diameter: number;
  /** Factor applied to the drawn values (1 except for the power-high fault). */
  factor: number;
  flow_range: [number, number];
  points: Array<[number, number]>;
}

export interface IsoCrossing {
  diameter: number;
  drawn_diameter: number;
  flow: number;
  head: number;
}

export interface IsoDef {
  id: string;
  iso: number;
  branch: 'loop' | 'left' | 'right';
  crossings: IsoCrossing[];
  points: Array<[number, number]>;
}

export interface TraceDef {
  id: string;
  panel: PanelId;
  quantity: CurveQuantity;
  diameter?: number;
  iso?: number;
  guides: Array<[number, number]>;
}

export interface Layout {
  spec: SheetSpec;
  family: Family;
  drawing: Drawing;
  panels: PanelDef[];
  curves: CurveDef[];
  isos: IsoDef[];
  traces: TraceDef[];
  /** Announced diameter for each drawn one (differs only for the announced-diameter fault). */
  announced: Map<number, number>;
}

const PAGE = { width: 612, height: 792 };
const LEFT = 66;
const RIGHT = 576;
const BLACK: Colour = [0, 0, 0];
const GRID: Colour = [0.78, 0.78, 0.78];

const AXES: Record<UnitSystemName, { flow: Axis; headIso: Axis; headPanels: Axis; power: Axis; npsh: Axis; eff: Axis }> = {
  us: {
    flow: { min: 0, max: 1800, step: 200, unit: 'gpm' },
    headIso: { min: 40, max: 240, step: 20, unit: 'ft' },
    headPanels: { min: 0, max: 240, step: 40, unit: 'ft' },
    power: { min: 0, max: 90, step: 10, unit: 'hp' },
    npsh: { min: 0, max: 30, step: 5, unit: 'ft' },
    eff: { min: 20, max: 90, step: 10, unit: '%' },
  },
  si: {
    flow: { min: 0, max: 400, step: 50, unit: 'm3/h' },
    headIso: { min: 10, max: 70, step: 10, unit: 'm' },
    headPanels: { min: 0, max: 70, step: 10, unit: 'm' },
    power: { min: 0, max: 70, step: 10, unit: 'kW' },
    npsh: { min: 0, max: 10, step: 2, unit: 'm' },
    eff: { min: 20, max: 90, step: 10, unit: '%' },
  },
};

const ISO_VALUES: Record<UnitSystemName, number[]> = { us: [70, 75, 80, 82], si: [70, 75, 79, 81] };

const STYLE = {
  colour: {
    head: { colour: [0.1, 0.25, 0.75], width: 1.2 },
    iso: { colour: [0.0, 0.55, 0.2], width: 0.7 },
    efficiency: { colour: [0.0, 0.55, 0.2], width: 1.1 },
    power: { colour: [0.8, 0.1, 0.1], width: 1.1 },
    npshr: { colour: [0.5, 0.1, 0.6], width: 1.1 },
  },
  black: {
    head: { colour: BLACK, width: 1.3 },
    iso: { colour: BLACK, width: 0.6 },
    efficiency: { colour: BLACK, width: 1.1 },
    power: { colour: BLACK, width: 1.1 },
    npshr: { colour: BLACK, width: 1.1 },
  },
} satisfies Record<string, Record<string, Ink>>;

const UNIT_LABEL: Record<string, string> = { gpm: 'gpm', ft: 'ft', hp: 'hp', 'm3/h': 'm³/h', m: 'm', kW: 'kW', '%': '%', in: 'in', mm: 'mm' };

export function toSheetXY(panel: PanelDef, q: number, v: number): [number, number] {
  const [l, t, r, b] = panel.frame;
  return [l + ((q - panel.x.min) / (panel.x.max - panel.x.min)) * (r - l), b - ((v - panel.y.min) / (panel.y.max - panel.y.min)) * (b - t)];
}

function ticks(axis: Axis): number[] {
  const out: number[] = [];
  for (let v = axis.min; v <= axis.max + 1e-9; v += axis.step) out.push(Math.round(v * 1e6) / 1e6);
  return out;
}

function panelItems(panel: PanelDef, title: string, items: Item[], xTitle?: string): void {
  const [l, t, r, b] = panel.frame;
  for (const q of ticks(panel.x)) {
    const [x] = toSheetXY(panel, q, panel.y.min);
    if (q !== panel.x.min && q !== panel.x.max) items.push({ kind: 'polyline', id: `${panel.id}-gx-${q}`, points: [[x, t], [x, b]], ink: { colour: GRID, width: 0.4 } });
    items.push({ kind: 'text', id: `${panel.id}-tx-${q}`, text: String(q), x, y: b + 9, size: 7, align: 'center', colour: BLACK });
  }
  for (const v of ticks(panel.y)) {
    const [, y] = toSheetXY(panel, panel.x.min, v);
    if (v !== panel.y.min && v !== panel.y.max) items.push({ kind: 'polyline', id: `${panel.id}-gy-${v}`, points: [[l, y], [r, y]], ink: { colour: GRID, width: 0.4 } });
    items.push({ kind: 'text', id: `${panel.id}-ty-${v}`, text: String(v), x: l - 4, y: y + 2.5, size: 7, align: 'right', colour: BLACK });
  }
  items.push({ kind: 'rect', id: `${panel.id}-frame`, x: l, y: t, w: r - l, h: b - t, stroke: { colour: BLACK, width: 0.8 } });
  items.push({ kind: 'text', id: `${panel.id}-title`, text: title, x: l, y: t - 5, size: 7.5, align: 'left', colour: BLACK, bold: true });
  if (xTitle) items.push({ kind: 'text', id: 'flow-title', text: xTitle, x: (l + r) / 2, y: b + 22, size: 8, align: 'center', colour: BLACK, bold: true });
}

function sample(from: number, to: number, n: number, f: (q: number) => number): Array<[number, number]> {
  const out: Array<[number, number]> = [];
  for (let i = 0; i <= n; i++) {
    const q = from + ((to - from) * i) / n;
    out.push([q, f(q)]);
  }
  return out;
}

/** Builds the whole sheet for a spec. */
export function layoutSheet(spec: SheetSpec): Layout {
  const family = familyOf(spec.system);
  const axes = AXES[spec.system];
  const style = STYLE[spec.ink];
  const items: Item[] = [];
  const u = family.units;
  const dUnit = UNIT_LABEL[u.diameter] ?? u.diameter;
  const dm = family.diameters[0] as number;

  // The announced-diameter fault: the third diameter is drawn at its own size but labelled ~5.5 % larger.
  const announced = new Map<number, number>(family.diameters.map((d) => [d, d]));
  const faulty = family.diameters[2] as number;
  if (spec.fault === 'announced-diameter') announced.set(faulty, spec.system === 'us' ? 11.6 : 306);
  const powerHigh = spec.fault === 'power-high' ? (family.diameters[1] as number) : undefined;

  const frames: Record<PanelId, [number, number]> =
    spec.layout === 'iso'
      ? { head: [92, 400], power: [440, 580], npsh: [620, 725], efficiency: [0, 0] }
      : { head: [92, 320], efficiency: [352, 470], power: [502, 620], npsh: [652, 735] };
  const ids: PanelId[] = spec.layout === 'iso' ? ['head', 'power', 'npsh'] : ['head', 'efficiency', 'power', 'npsh'];
  const yAxis: Record<PanelId, Axis> = { head: spec.layout === 'iso' ? axes.headIso : axes.headPanels, efficiency: axes.eff, power: axes.power, npsh: axes.npsh };
  const titles: Record<PanelId, string> = {
    head: `Head (${UNIT_LABEL[u.head]})`,
    efficiency: 'Efficiency (%)',
    power: `Shaft power (${UNIT_LABEL[u.power]})`,
    npsh: `NPSHr (${UNIT_LABEL[u.npsh]})`,
  };
  const panels: PanelDef[] = ids.map((id) => ({ id, frame: [LEFT, frames[id][0], RIGHT, frames[id][1]], x: axes.flow, y: yAxis[id] }));
  const panelOf = (id: PanelId) => panels.find((p) => p.id === id) as PanelDef;
  panels.forEach((p, i) => panelItems(p, titles[p.id], items, i === panels.length - 1 ? `Flow (${UNIT_LABEL[u.flow]})` : undefined));

  items.push({ kind: 'text', id: 'title', text: 'Invented demo pump \u2014 not a real product', x: LEFT, y: 42, size: 13, align: 'left', colour: BLACK, bold: true });
  items.push({
    kind: 'text',
    id: 'subtitle',
    text: `${family.name} \u00b7 ${family.speed_rpm} rpm \u00b7 clear water, SG ${family.specific_gravity.toFixed(1)} \u00b7 invented data`,
    x: LEFT,
    y: 60,
    size: 8.5,
    align: 'left',
    colour: BLACK,
  });
  items.push({ kind: 'text', id: 'footer', text: 'Invented sample sheet for testing Pumpscribe. Not a real product; no real data.', x: LEFT, y: 772, size: 7, align: 'left', colour: BLACK });

  const curves: CurveDef[] = [];
  const labels: Item[] = [];
  const addCurve = (quantity: CurveQuantity, panelId: PanelId, d: number, q0: number, q1: number, f: (q: number) => number, factor = 1) => {
    const panel = panelOf(panelId);
    const data = sample(q0, q1, 240, (q) => factor * f(q));
    const points = data.map(([q, v]) => toSheetXY(panel, q, v));
    for (const [q, v] of data) {
      if (q < panel.x.min || q > panel.x.max || v < panel.y.min || v > panel.y.max) throw new Error(`${quantity} at ${d} leaves its panel at Q = ${q}, value ${v}.`);
    }
    const id = `${quantity}-${announced.get(d)}`;
    curves.push({ id, panel: panelId, quantity, diameter: announced.get(d) as number, drawn_diameter: d, factor, flow_range: [q0, q1], points });
    items.push({ kind: 'polyline', id, points, ink: style[quantity] });
    return points;
  };

  for (const d of family.diameters) {
    const q1 = endFlow(family, d);
    const label = `${announced.get(d)} ${dUnit}`;
    const hp = addCurve('head', 'head', d, 0, q1, (q) => head(family, d, q));
    const end = hp[hp.length - 1] as [number, number];
    labels.push({ kind: 'text', id: `label-head-${d}`, text: label, x: end[0] + 4, y: end[1] + 2.5, size: 7, align: 'left', colour: BLACK });

    const pp = addCurve('power', 'power', d, 0, q1, (q) => power(family, d, q), d === powerHigh ? 1.09 : 1);
    if (spec.labelsOnLines) {
      const at = alongPolyline(pp, 0.62);
      const w = textWidth(label, 6.5);
      labels.push({ kind: 'rect', id: `knock-power-${d}`, x: at[0] - w / 2 - 2, y: at[1] - 4.5, w: w + 4, h: 9, fill: [1, 1, 1] });
      labels.push({ kind: 'text', id: `label-power-${d}`, text: label, x: at[0], y: at[1] + 2.3, size: 6.5, align: 'center', colour: BLACK });
    } else {
      const e = pp[pp.length - 1] as [number, number];
      labels.push({ kind: 'text', id: `label-power-${d}`, text: label, x: e[0] + 4, y: e[1] + 2.5, size: 7, align: 'left', colour: BLACK });
    }
    if (spec.layout === 'panels') {
      const ep = addCurve('efficiency', 'efficiency', d, 0.2 * q1, q1, (q) => efficiency(family, d, q));
      const e = ep[ep.length - 1] as [number, number];
      labels.push({ kind: 'text', id: `label-eff-${d}`, text: label, x: e[0] + 4, y: e[1] + 2.5, size: 7, align: 'left', colour: BLACK });
    }
  }
  const np = addCurve('npshr', 'npsh', dm, 0.1 * endFlow(family, dm), endFlow(family, dm), (q) => npshr(family, dm, q));
  const ne = np[np.length - 1] as [number, number];
  labels.push({ kind: 'text', id: 'label-npshr', text: `${announced.get(dm)} ${dUnit}`, x: ne[0] + 4, y: ne[1] + 2.5, size: 7, align: 'left', colour: BLACK });

  const isos = spec.layout === 'iso' ? isoLines(family, panelOf('head'), announced, style.iso, items, labels) : [];
  items.push(...labels);
  const drawing: Drawing = { width: PAGE.width, height: PAGE.height, items };
  const traces = placeGuides(drawing, curves, isos, spec.seed ?? 1);
  return { spec, family, drawing, panels, curves, isos, traces, announced };
}

/** Iso-efficiency lines: the exact locus η_D(Q) = iso over a continuum of diameters. */
function isoLines(family: Family, panel: PanelDef, announced: Map<number, number>, ink: Ink, items: Item[], labels: Item[]): IsoDef[] {
  const dm = family.diameters[0] as number;
  const dmin = family.diameters[family.diameters.length - 1] as number;
  const dHi = 1.02 * dm;
  const dLo = 0.97 * dmin;
  const out: IsoDef[] = [];
  for (const iso of ISO_VALUES[family.system]) {
    const dc = closingDiameter(family, iso);
    const closed = dc > dLo;
    const from = closed ? dc : dLo;
    const n = 90;
    const branch = (side: 0 | 1): Array<[number, number]> => {
      const pts: Array<[number, number]> = [];
      for (let i = 0; i <= n; i++) {
        const s = i / n;
        const d = closed ? from + (dHi - from) * s * s : from + (dHi - from) * s;
        const flows = isoFlows(family, d, iso);
        const q = flows.length === 2 ? (flows[side] as number) : (flows[0] ?? (d / dm) * family.efficiency.q_bep);
        pts.push(toSheetXY(panel, q, head(family, d, q)));
      }
      return pts;
    };
    const crossings = (side: 0 | 1 | 'both'): IsoCrossing[] =>
      family.diameters.flatMap((d) => {
        const flows = isoFlows(family, d, iso).filter((q) => q <= endFlow(family, d));
        const chosen = side === 'both' ? flows : flows.length === 2 ? [flows[side] as number] : [];
        return chosen.map((q) => ({ diameter: announced.get(d) as number, drawn_diameter: d, flow: q, head: head(family, d, q) }));
      });
    const left = branch(0);
    const right = branch(1);
    const defs: IsoDef[] = closed
      ? [{ id: `iso-${iso}`, iso, branch: 'loop', crossings: crossings('both'), points: [...left.reverse(), ...right.slice(1)] }]
      : [
          { id: `iso-${iso}-left`, iso, branch: 'left', crossings: crossings(0), points: left },
          { id: `iso-${iso}-right`, iso, branch: 'right', crossings: crossings(1), points: right },
        ];
    for (const def of defs) {
      items.push({ kind: 'polyline', id: def.id, points: def.points, ink });
      const top = def.branch === 'loop' ? (def.points[0] as [number, number]) : (def.points[def.points.length - 1] as [number, number]);
      labels.push({ kind: 'text', id: `label-${def.id}`, text: `${iso}%`, x: top[0], y: top[1] - 3, size: 6.5, align: 'center', colour: BLACK });
      out.push(def);
    }
  }
  return out;
}

/**
 * Guides as an engineer would click them: near both ends of each line and, for most, one in
 * between; each moved along its line until it stands clear of other ink, then nudged a
 * fraction of a point off the line like a real click.
 */
function placeGuides(drawing: Drawing, curves: CurveDef[], isos: IsoDef[], seed: number): TraceDef[] {
  const random = seededRandom(seed);
  // Curves are sampled evenly in flow, so a fraction of their points is a fraction of their
  // flow range; iso-lines are placed by arc length.
  const byIndex = (points: Array<[number, number]>, f: number): [number, number] => {
    const at = f * (points.length - 1);
    const i = Math.min(points.length - 2, Math.floor(at));
    const a = points[i] as [number, number];
    const b = points[i + 1] as [number, number];
    const t = at - i;
    return [a[0] + t * (b[0] - a[0]), a[1] + t * (b[1] - a[1])];
  };
  const place = (id: string, points: Array<[number, number]>, fractions: number[], locate: (points: Array<[number, number]>, f: number) => [number, number]) =>
    fractions.map((f0, index): [number, number] => {
      // End guides may only move outwards (the reading must cover 15–95 % of the range);
      // a middle guide may move either way.
      const isFirst = index === 0;
      const isLast = index === fractions.length - 1;
      const range: [number, number] = isFirst ? [0.005, f0] : isLast ? [f0, 0.995] : [f0 - 0.12, f0 + 0.12];
      let best = locate(points, f0);
      let bestClear = clearance(drawing, best, id);
      for (let k = 1; k <= 24 && bestClear < 4; k++) {
        for (const f of [f0 + 0.005 * k, f0 - 0.005 * k]) {
          if (f < range[0] || f > range[1]) continue;
          const p = locate(points, f);
          const c = clearance(drawing, p, id);
          if (c > bestClear) {
            best = p;
            bestClear = c;
          }
        }
      }
      const a = locate(points, Math.max(0, f0 - 0.01));
      const b = locate(points, Math.min(1, f0 + 0.01));
      const len = Math.hypot(b[0] - a[0], b[1] - a[1]) || 1;
      const off = (random() - 0.5) * 0.6;
      return [best[0] - ((b[1] - a[1]) / len) * off, best[1] + ((b[0] - a[0]) / len) * off];
    });
  const traces: TraceDef[] = curves.map((c) => ({
    id: c.id,
    panel: c.panel,
    quantity: c.quantity,
    diameter: c.diameter,
    guides: place(c.id, c.points, c.quantity === 'head' || c.quantity === 'efficiency' ? [0.03, 0.5, 0.97] : [0.03, 0.97], byIndex),
  }));
  for (const iso of isos) {
    traces.push({ id: iso.id, panel: 'head', quantity: 'efficiency', iso: iso.iso, guides: place(iso.id, iso.points, iso.branch === 'loop' ? [0.03, 0.5, 0.97] : [0.04, 0.96], alongPolyline) });
  }
  return traces;
}
