/**
 * Reading what a vector sheet says about itself from its text layer: the speed ("1480 rpm"),
 * the impeller diameters written on the curves ("330 mm"), the units of the axis titles, and
 * what a panel plots from the title just above or beside its frame. These only prefill fields
 * the engineer can see and change; nothing is taken without being shown.
 */
import type { Quantity } from '../../model/curveset.ts';
import { curveLabel, quantityOfTitle } from '../../digitize/detect/words.ts';
import { speedInText } from '../../digitize/detect/sheetSpeed.ts';

export { quantityOfTitle }; // the title rules live in the core, shared with the automatic take-off

export interface TextItem {
  text: string;
  /** Baseline origin, sheet units. */
  at: readonly [number, number];
  size: number;
  width: number;
  /** Baseline direction, radians (0 = left to right). */
  angle: number;
}

export interface SheetHints {
  speed_rpm?: number;
  diameters?: number[];
  diameterUnit?: 'mm' | 'in';
  units?: { flow?: string; head?: string; power?: string; npsh?: string };
}

export function readHints(items: readonly TextItem[]): SheetHints {
  const all = items.map((t) => t.text).join(' \n ');
  const hints: SheetHints = {};
  const speed = speedInText(all);
  if (speed !== undefined) hints.speed_rpm = speed;
  const diameters = new Map<string, number[]>();
  for (const t of items) {
    const label = curveLabel(t.text);
    if (label?.kind === 'diameter') diameters.set(label.unit, [...(diameters.get(label.unit) ?? []), label.value]);
  }
  const best = [...diameters.entries()].map(([u, vs]) => [u, [...new Set(vs)].sort((a, b) => b - a)] as const).sort((a, b) => b[1].length - a[1].length)[0];
  if (best && best[1].length >= 2 && best[1].length <= 10) {
    hints.diameters = best[1];
    hints.diameterUnit = best[0] as 'mm' | 'in';
  }
  const units: NonNullable<SheetHints['units']> = {};
  if (/m³\/h|m3\/h|m\^3\/h/i.test(all)) units.flow = 'm3/h';
  else if (/\bUS\s*gpm\b|\bgpm\b|gal\/min/i.test(all)) units.flow = 'gpm';
  else if (/\bl\/s\b/i.test(all)) units.flow = 'L/s';
  const titled = (words: RegExp, unit: RegExp) => items.some((t) => words.test(t.text) && unit.test(t.text));
  if (titled(/head/i, /\(\s*ft\s*\)|\[\s*ft\s*\]|\bfeet\b/i)) units.head = 'ft';
  else if (titled(/head/i, /\(\s*m\s*\)|\[\s*m\s*\]/i)) units.head = 'm';
  if (titled(/npsh/i, /\(\s*ft\s*\)|\[\s*ft\s*\]/i)) units.npsh = 'ft';
  else if (titled(/npsh/i, /\(\s*m\s*\)|\[\s*m\s*\]/i)) units.npsh = 'm';
  if (titled(/power|bhp/i, /\bhp\b|bhp/i)) units.power = 'hp';
  else if (titled(/power/i, /\bkW\b/i)) units.power = 'kW';
  if (Object.keys(units).length) hints.units = units;
  return hints;
}

/**
 * The quantity a frame [left, top, right, bottom] plots, from a title written just above it
 * (within three text heights) or upright just left of it.
 */
export function plotsOfFrame(items: readonly TextItem[], frame: readonly [number, number, number, number]): Quantity | null {
  const [l, t, r, b] = frame;
  const width = r - l;
  let best: { q: Quantity; d: number } | null = null;
  for (const item of items) {
    const q = quantityOfTitle(item.text);
    if (!q) continue;
    const [x, y] = item.at;
    const upright = Math.abs(Math.abs(item.angle) - Math.PI / 2) < 0.2;
    let d: number | null = null;
    if (!upright && y <= t + item.size && y >= t - 3 * item.size - 4 && x >= l - 0.1 * width && x <= r) d = t - y;
    else if (upright && x <= l && x >= l - 6 * item.size && y >= t && y <= b + item.size) d = l - x;
    if (d !== null && (!best || d < best.d)) best = { q, d };
  }
  return best?.q ?? null;
}
