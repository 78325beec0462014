/**
 * The plan of one random sheet, before it is drawn: panels (frames and axes), every line with
 * its style and its exact points in flat page pixels, and the labels. One Dice decides it all.
 *
 * Flat page pixels: the sheet as printed at `dpi`, origin top-left, y down. The camera
 * (camera.ts) then maps flat pixels to the pixels of the scan or photo.
 */
import type { Dice } from './dice.ts';
import { drawnRange, endFlow, exact, inventFamily, isoFlows, lowestPeak, UNIT_NAMES, type PumpFamily, type Quantity } from './pumpFamily.ts';

export type Dash = 'solid' | 'dashed' | 'dotted';
export type Pt = [number, number];

export interface Axis {
  min: number;
  max: number;
  step: number;
}

export interface PanelPlan {
  id: string;
  quantity: Quantity;
  /** Frame in flat pixels: left, top, right, bottom. */
  frame: [number, number, number, number];
  x: Axis;
  y: Axis;
  /** Which side the y axis is written on. */
  side: 'left' | 'right';
}

export interface LineStyle {
  colour: string;
  width: number;
  dash: Dash;
  /** SVG dash array in flat pixels (empty for solid). */
  pattern: number[];
}

export interface LinePlan {
  /** The take-off trace id this line becomes. */
  id: string;
  panel: string;
  quantity: Quantity;
  diameter?: number;
  /** Speed in rpm, on a sheet of one impeller at several speeds (speedSheet.ts). */
  speed?: number;
  iso?: number;
  style: LineStyle;
  /** Exact points in flat pixels, dense. */
  points: Pt[];
  /** Flow at each point (data units), for placing guides. */
  flows: number[];
  label?: { text: string; at: number; mode: 'on' | 'beside' };
}

export interface SheetPlan {
  dpi: number;
  width: number;
  height: number;
  family: PumpFamily;
  panels: PanelPlan[];
  lines: LinePlan[];
  efficiencyAs: 'curves' | 'right-axis' | 'iso' | 'none';
  grid: { minor: number; colour: string; width: number };
  fontPx: number;
}

export function niceStep(raw: number): number {
  const p = 10 ** Math.floor(Math.log10(raw));
  for (const m of [1, 2, 2.5, 5, 10]) if (m * p >= raw) return m * p;
  return 10 * p;
}

function axisFor(max: number, divisions: number): Axis {
  const step = niceStep(max / divisions);
  return { min: 0, max: Math.ceil(max / step - 1e-9) * step, step };
}

export function toFlat(panel: PanelPlan, q: number, v: number): Pt {
  const [l, t, r, b] = panel.frame;
  return [l + ((q - panel.x.min) / (panel.x.max - panel.x.min)) * (r - l), b - ((v - panel.y.min) / (panel.y.max - panel.y.min)) * (b - t)];
}

const PALETTE = ['#d62728', '#1f5fbf', '#2ca02c', '#9467bd', '#e07b00', '#8c564b', '#d63ca5', '#0f8f8f', '#6b6b00'];

export function planSheet(dice: Dice): SheetPlan {
  const family = inventFamily(dice);
  const dpi = dice.pick([150, 200, 240, 300, dice.whole(150, 300)]);
  const inch = (v: number) => v * dpi;
  const drawn = new Set<Quantity>(['head']);
  const efficiencyAs = dice.pick(['curves', 'right-axis', 'iso', 'iso', 'none'] as const);
  if (efficiencyAs === 'curves' || efficiencyAs === 'right-axis') drawn.add('efficiency');
  if (dice.chance(0.7)) drawn.add('power');
  if (dice.chance(0.6)) drawn.add('npshr');
  const frames: Quantity[] = ['head'];
  if (efficiencyAs === 'curves') frames.push('efficiency');
  if (drawn.has('power')) frames.push('power');
  if (drawn.has('npshr')) frames.push('npshr');
  while (frames.length > 4) frames.pop();

  const left = inch(dice.between(0.7, 1));
  const right = inch(6.8) - inch(efficiencyAs === 'right-axis' ? 0.8 : dice.between(0.3, 0.6));
  let top = inch(dice.between(0.6, 0.9));
  const maxEnd = endFlow(family, family.dMax);
  const xAxis = axisFor(maxEnd * dice.between(1.03, 1.2), dice.whole(5, 10));
  const panels: PanelPlan[] = [];
  const valueMax = (q: Quantity) => {
    let m = 0;
    for (const d of family.diameters) {
      const [a, b] = drawnRange(family, q, d);
      for (let i = 0; i <= 100; i++) m = Math.max(m, exact(family, q, d, a + ((b - a) * i) / 100));
    }
    return m;
  };
  for (const q of frames) {
    const h = inch(q === 'head' ? (frames.length === 1 ? dice.between(3.5, 4.5) : dice.between(2.6, 3.4)) : dice.between(1.5, 2.1));
    const frame: [number, number, number, number] = [left, top, right, top + h];
    const divisions = q === 'head' ? dice.whole(5, 10) : dice.whole(3, 6);
    const y = q === 'efficiency' ? { min: 0, max: 100, step: dice.pick([10, 20]) } : axisFor(valueMax(q) * dice.between(1.05, 1.25), divisions);
    panels.push({ id: q, quantity: q, frame, x: xAxis, y, side: 'left' });
    if (q === 'head' && efficiencyAs === 'right-axis') {
      const count = Math.round((y.max - y.min) / y.step);
      const step = niceStep(100 / count);
      panels.push({ id: 'efficiency', quantity: 'efficiency', frame, x: xAxis, y: { min: 0, max: step * count, step }, side: 'right' });
    }
    top += h + inch(dice.between(0.45, 0.7));
  }
  const height = top + inch(0.3);

  const mono = dice.chance(0.35);
  const colours = dice.shuffle([...PALETTE]);
  const baseWidth = dice.between(0.5, 3);
  const widthOf = (q: Quantity) => Math.max(0.5, Math.min(3, baseWidth * dice.between(0.7, 1.2) * (q === 'head' ? 1.1 : 1)));
  const dashOf = (q: Quantity): Dash => (q === 'head' ? 'solid' : q === 'efficiency' ? dice.pick(['solid', 'solid', 'dashed'] as const) : dice.pick(['solid', 'dashed', 'dotted'] as const));
  const labelMode = dice.pick(['on', 'beside', 'none'] as const);
  const lines: LinePlan[] = [];
  const unitDia = UNIT_NAMES[family.units].diameter;
  const styles = new Map<Quantity, { width: number; dash: Dash }>();
  for (const q of drawn) styles.set(q, { width: widthOf(q), dash: dashOf(q) });
  family.diameters.forEach((d, k) => {
    for (const q of drawn) {
      const panel = panels.find((p) => p.quantity === q) as PanelPlan;
      const { width, dash } = styles.get(q) as { width: number; dash: Dash };
      const [a, b] = drawnRange(family, q, d);
      const flows: number[] = [];
      const points: Pt[] = [];
      for (let i = 0; i <= 300; i++) {
        const f = a + ((b - a) * i) / 300;
        flows.push(f);
        points.push(toFlat(panel, f, exact(family, q, d, f)));
      }
      const pattern = dash === 'dashed' ? [dice.between(4, 9) * Math.max(1, width / 1.5), dice.between(2, 4) * Math.max(1, width / 1.5)] : dash === 'dotted' ? [0.01, dice.between(2, 4) + width] : [];
      const text = family.units === 'si' ? `${d} ${unitDia}` : `${d}"`;
      lines.push({
        id: `${q}-${d}`,
        panel: panel.id,
        quantity: q,
        diameter: d,
        style: { colour: mono ? '#111111' : (colours[k % colours.length] as string), width, dash, pattern },
        points,
        flows,
        ...(labelMode !== 'none' && (q === 'head' || dice.chance(0.5)) ? { label: { text, at: dice.between(0.45, 0.85), mode: labelMode } } : {}),
      });
    }
  });

  if (efficiencyAs === 'iso') {
    const panel = panels[0] as PanelPlan;
    const peak = lowestPeak(family);
    const count = dice.whole(2, 5);
    const stepLevel = dice.pick([2, 3, 4, 5]);
    const topLevel = Math.floor((peak - 0.8) / stepLevel) * stepLevel;
    const isoWidth = Math.max(0.5, Math.min(1.8, dice.between(0.5, 1.6)));
    const isoColour = mono || dice.chance(0.5) ? '#222222' : (colours[(family.diameters.length + 1) % colours.length] as string);
    const dMin = Math.min(...family.diameters);
    const stretch = dice.pick([0, 0, 0.01, -0.005]);
    for (let i = 0; i < count; i++) {
      const level = topLevel - i * stepLevel;
      if (level < 20) break;
      for (const branch of [0, 1]) {
        const points: Pt[] = [];
        const flows: number[] = [];
        const lo = dMin * (1 - stretch);
        const hi = family.dMax * (1 + stretch);
        for (let j = 0; j <= 120; j++) {
          const d = lo + ((hi - lo) * j) / 120;
          const roots = isoFlows(family, d, level);
          if (roots.length < branch + 1) continue;
          const q = roots[branch] as number;
          if (q > endFlow(family, d)) continue;
          flows.push(q);
          points.push(toFlat(panel, q, exact(family, 'head', d, q)));
        }
        if (points.length < 10) continue;
        lines.push({
          id: `iso-${level}-${branch === 0 ? 'left' : 'right'}`,
          panel: panel.id,
          quantity: 'efficiency',
          iso: level,
          style: { colour: isoColour, width: isoWidth, dash: 'solid', pattern: [] },
          points,
          flows,
          ...(dice.chance(0.6) ? { label: { text: `${level}%`, at: dice.between(0.3, 0.7), mode: 'on' as const } } : {}),
        });
      }
    }
  }
  const gridShade = dice.whole(150, 215);
  const hex = gridShade.toString(16).padStart(2, '0');
  return {
    dpi,
    width: Math.round(inch(6.8)),
    height: Math.round(height),
    family,
    panels,
    lines,
    efficiencyAs,
    grid: { minor: dice.pick([0, 0, 2, 5]), colour: `#${hex}${hex}${hex}`, width: dice.between(0.4, 1) * Math.max(1, dpi / 200) },
    fontPx: (dice.between(7, 9.5) / 72) * dpi,
  };
}
