/**
 * An ink map of paper (darkness 0) with straight lines of ink 3 px wide, darkness 200, drawn from
 * point to point: the synthetic pictures the scan line finder's tests read.
 */
import type { InkMap } from '../../src/digitize/detect/ink.ts';

export function inkPicture(width: number, height: number, lines: readonly (readonly [number, number, number, number])[]): InkMap {
  const ink = new Uint8Array(width * height);
  for (const [x0, y0, x1, y1] of lines) {
    const n = Math.ceil(Math.hypot(x1 - x0, y1 - y0) * 2);
    for (let k = 0; k <= n; k++) {
      const x = x0 + ((x1 - x0) * k) / n;
      const y = y0 + ((y1 - y0) * k) / n;
      for (let dy = -1; dy <= 1; dy++) for (let dx = -1; dx <= 1; dx++) ink[Math.round(y + dy) * width + Math.round(x + dx)] = 200;
    }
  }
  return { width, height, ink };
}
