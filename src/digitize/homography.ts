/**
 * Plane homographies for photographed sheets: a sheet taken by a hand-held camera is the
 * printed page seen in perspective, so lines of equal flow converge. A homography
 *   [u·w, v·w, w] = H · [x, y, 1]
 * maps the photo onto the plot's linear cores exactly where an affine map cannot.
 * Fitted by linear least squares on Hartley-normalised coordinates with H[8] = 1
 * (R. Hartley, "In defence of the eight-point algorithm", IEEE PAMI 19(6), 1997: normalising
 * keeps the system well conditioned).
 */
export type H9 = readonly [number, number, number, number, number, number, number, number, number];
type P = readonly [number, number];

export function applyHomography(h: H9, x: number, y: number): [number, number] {
  const w = h[6] * x + h[7] * y + h[8];
  return [(h[0] * x + h[1] * y + h[2]) / w, (h[3] * x + h[4] * y + h[5]) / w];
}

/** The inverse map (adjugate over determinant); exact up to rounding. */
export function invertHomography(h: H9): H9 {
  const [a, b, c, d, e, f, g, k, l] = h;
  const A = e * l - f * k;
  const B = f * g - d * l;
  const C = d * k - e * g;
  const det = a * A + b * B + c * C;
  return [A / det, (c * k - b * l) / det, (b * f - c * e) / det, B / det, (a * l - c * g) / det, (c * d - a * f) / det, C / det, (b * g - a * k) / det, (a * e - b * d) / det];
}

/** The product p · q: the map q, then p. */
export function multiplyHomography(p: H9, q: H9): H9 {
  const out: number[] = [];
  for (let r = 0; r < 3; r++) for (let c = 0; c < 3; c++) out.push((p[r * 3] as number) * (q[c] as number) + (p[r * 3 + 1] as number) * (q[3 + c] as number) + (p[r * 3 + 2] as number) * (q[6 + c] as number));
  return out as unknown as H9;
}

/** Similarity that centres points and scales their mean distance from the centre to √2. */
function normaliser(points: readonly P[]): H9 {
  const n = points.length;
  const mx = points.reduce((s, p) => s + p[0], 0) / n;
  const my = points.reduce((s, p) => s + p[1], 0) / n;
  const mean = points.reduce((s, p) => s + Math.hypot(p[0] - mx, p[1] - my), 0) / n || 1;
  const k = Math.SQRT2 / mean;
  return [k, 0, -k * mx, 0, k, -k * my, 0, 0, 1];
}

/** Solves the square system m·x = b in place by Gaussian elimination with partial pivoting; undefined when singular. */
function solve(m: number[][], b: number[]): number[] | undefined {
  const n = b.length;
  for (let c = 0; c < n; c++) {
    let pivot = c;
    for (let r = c + 1; r < n; r++) if (Math.abs((m[r] as number[])[c] as number) > Math.abs((m[pivot] as number[])[c] as number)) pivot = r;
    if (Math.abs((m[pivot] as number[])[c] as number) < 1e-12) return undefined;
    [m[c], m[pivot]] = [m[pivot] as number[], m[c] as number[]];
    [b[c], b[pivot]] = [b[pivot] as number, b[c] as number];
    const row = m[c] as number[];
    for (let r = c + 1; r < n; r++) {
      const other = m[r] as number[];
      const f = (other[c] as number) / (row[c] as number);
      if (f === 0) continue;
      for (let k = c; k < n; k++) other[k] = (other[k] as number) - f * (row[k] as number);
      b[r] = (b[r] as number) - f * (b[c] as number);
    }
  }
  const x = new Array<number>(n).fill(0);
  for (let r = n - 1; r >= 0; r--) {
    let s = b[r] as number;
    for (let k = r + 1; k < n; k++) s -= ((m[r] as number[])[k] as number) * (x[k] as number);
    x[r] = s / ((m[r] as number[])[r] as number);
  }
  return x;
}

/**
 * Least-squares homography taking `from` onto `to` (4 or more pairs, no three of the first
 * four on a line); undefined when the points cannot determine one.
 */
export function fitHomography(from: readonly P[], to: readonly P[]): H9 | undefined {
  if (from.length < 4 || from.length !== to.length) return undefined;
  const tf = normaliser(from);
  const tt = normaliser(to);
  const ata = Array.from({ length: 8 }, () => new Array<number>(8).fill(0));
  const atb = new Array<number>(8).fill(0);
  const add = (row: number[], rhs: number) => {
    for (let i = 0; i < 8; i++) {
      atb[i] = (atb[i] as number) + (row[i] as number) * rhs;
      const ai = ata[i] as number[];
      for (let j = 0; j < 8; j++) ai[j] = (ai[j] as number) + (row[i] as number) * (row[j] as number);
    }
  };
  from.forEach((p, i) => {
    const [x, y] = applyHomography(tf, p[0], p[1]);
    const q = to[i] as P;
    const [u, v] = applyHomography(tt, q[0], q[1]);
    add([x, y, 1, 0, 0, 0, -u * x, -u * y], u);
    add([0, 0, 0, x, y, 1, -v * x, -v * y], v);
  });
  const h = solve(ata, atb);
  if (!h || !h.every(Number.isFinite)) return undefined;
  const hn = [...h, 1] as unknown as H9;
  const out = multiplyHomography(multiplyHomography(invertHomography(tt), hn), tf);
  const s = out[8];
  if (!Number.isFinite(s) || Math.abs(s) < 1e-300) return undefined;
  return out.map((v) => v / s) as unknown as H9;
}

/** True when some three of the points lie (nearly) on one line: such anchors cannot fix a perspective. */
export function threeOnALine(points: readonly P[]): boolean {
  const size = Math.max(...points.map((p) => Math.max(...points.map((q) => Math.hypot(p[0] - q[0], p[1] - q[1])))));
  for (let i = 0; i < points.length; i++) {
    for (let j = i + 1; j < points.length; j++) {
      for (let k = j + 1; k < points.length; k++) {
        const a = points[i] as P;
        const b = points[j] as P;
        const c = points[k] as P;
        const area = Math.abs((b[0] - a[0]) * (c[1] - a[1]) - (b[1] - a[1]) * (c[0] - a[0]));
        if (area < 0.02 * size * size) return true;
      }
    }
  }
  return false;
}
