/**
 * A sheet as a list of things to draw, in sheet units (PDF points, origin top-left, y down).
 * The same list is written as a vector PDF and rendered as a scan, so both show the same lines.
 */
export type Colour = readonly [number, number, number]; // 0…1 each

export interface Ink {
  colour: Colour;
  width: number;
}

export type Item =
  | { kind: 'polyline'; id: string; points: Array<[number, number]>; ink: Ink }
  | { kind: 'rect'; id: string; x: number; y: number; w: number; h: number; stroke?: Ink; fill?: Colour }
  | { kind: 'text'; id: string; text: string; x: number; y: number; size: number; align: 'left' | 'center' | 'right'; colour: Colour; bold?: boolean };

export interface Drawing {
  width: number;
  height: number;
  items: Item[];
}

/** Width of Helvetica-like text, approximately (for boxes and clearances, not for layout finesse). */
export function textWidth(text: string, size: number): number {
  return 0.54 * size * text.length;
}

/** Box of a text item [x0, y0, x1, y1], with a small margin. */
export function textBox(t: Extract<Item, { kind: 'text' }>, margin = 0): [number, number, number, number] {
  const w = textWidth(t.text, t.size);
  const x0 = t.align === 'left' ? t.x : t.align === 'center' ? t.x - w / 2 : t.x - w;
  return [x0 - margin, t.y - 0.75 * t.size - margin, x0 + w + margin, t.y + 0.22 * t.size + margin];
}

function segmentDistance(px: number, py: number, ax: number, ay: number, bx: number, by: number): number {
  const vx = bx - ax;
  const vy = by - ay;
  const len2 = vx * vx + vy * vy;
  const t = len2 > 0 ? Math.max(0, Math.min(1, ((px - ax) * vx + (py - ay) * vy) / len2)) : 0;
  return Math.hypot(px - (ax + t * vx), py - (ay + t * vy));
}

export function polylineDistance(p: readonly [number, number], points: ReadonlyArray<readonly [number, number]>): number {
  let best = Infinity;
  for (let i = 0; i + 1 < points.length; i++) {
    const a = points[i] as readonly [number, number];
    const b = points[i + 1] as readonly [number, number];
    best = Math.min(best, segmentDistance(p[0], p[1], a[0], a[1], b[0], b[1]));
  }
  return best;
}

/** Distance from p to the nearest ink of the drawing other than the item `except` (text as its box). */
export function clearance(drawing: Drawing, p: readonly [number, number], except: string): number {
  let best = Infinity;
  for (const item of drawing.items) {
    if (item.id === except) continue;
    if (item.kind === 'polyline') best = Math.min(best, polylineDistance(p, item.points) - item.ink.width / 2);
    else if (item.kind === 'text') {
      const [x0, y0, x1, y1] = textBox(item);
      const dx = Math.max(x0 - p[0], 0, p[0] - x1);
      const dy = Math.max(y0 - p[1], 0, p[1] - y1);
      best = Math.min(best, Math.hypot(dx, dy));
    } else if (item.stroke) {
      const corners: Array<[number, number]> = [
        [item.x, item.y],
        [item.x + item.w, item.y],
        [item.x + item.w, item.y + item.h],
        [item.x, item.y + item.h],
        [item.x, item.y],
      ];
      best = Math.min(best, polylineDistance(p, corners));
    } else if (item.fill && p[0] >= item.x && p[0] <= item.x + item.w && p[1] >= item.y && p[1] <= item.y + item.h) {
      best = 0;
    }
  }
  return best;
}

/** Point at arc-length fraction f along a polyline. */
export function alongPolyline(points: ReadonlyArray<readonly [number, number]>, f: number): [number, number] {
  const lengths = [0];
  for (let i = 1; i < points.length; i++) {
    const a = points[i - 1] as readonly [number, number];
    const b = points[i] as readonly [number, number];
    lengths.push((lengths[i - 1] as number) + Math.hypot(b[0] - a[0], b[1] - a[1]));
  }
  const total = lengths[lengths.length - 1] as number;
  const want = Math.max(0, Math.min(1, f)) * total;
  for (let i = 1; i < points.length; i++) {
    if ((lengths[i] as number) >= want) {
      const a = points[i - 1] as readonly [number, number];
      const b = points[i] as readonly [number, number];
      const seg = (lengths[i] as number) - (lengths[i - 1] as number);
      const t = seg > 0 ? (want - (lengths[i - 1] as number)) / seg : 0;
      return [a[0] + t * (b[0] - a[0]), a[1] + t * (b[1] - a[1])];
    }
  }
  const last = points[points.length - 1] as readonly [number, number];
  return [last[0], last[1]];
}

/** Deterministic pseudo-random numbers, so that generated sheets are reproducible. */
export { seededRandom } from '../../src/demo/random.ts';

/** Standard normal deviate from a uniform source (Box–Muller). */
export function gaussian(random: () => number): number {
  const u = Math.max(random(), 1e-12);
  const v = random();
  return Math.sqrt(-2 * Math.log(u)) * Math.cos(2 * Math.PI * v);
}
