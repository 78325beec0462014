/**
 * One 8-connected piece of pixels, visited from a pixel already taken: the one flood fill that
 * the ink blots of the page reader (`detect/rasterText.ts`) and the letters of a label over a line
 * (`rasterLabels.ts`) share. Pure: works on pixel indexes (y · width + x) only.
 */

/**
 * Visits the piece holding `start` (already taken by the caller), depth first. `take(n)` says
 * whether neighbour `n` belongs to the piece and marks it so (true once only); `visit(k, x, y)` is
 * called for each pixel of the piece and may return false to stop at once. Returns false when
 * stopped so, true when the whole piece was visited.
 */
export function floodPiece(start: number, width: number, height: number, take: (n: number) => boolean, visit: (k: number, x: number, y: number) => boolean | void): boolean {
  const stack = [start];
  while (stack.length > 0) {
    const k = stack.pop() as number;
    const x = k % width;
    const y = (k - x) / width;
    if (visit(k, x, y) === false) return false;
    for (let dy = -1; dy <= 1; dy++) {
      const yy = y + dy;
      if (yy < 0 || yy >= height) continue;
      for (let dx = -1; dx <= 1; dx++) {
        const xx = x + dx;
        if (xx < 0 || xx >= width) continue;
        const n = yy * width + xx;
        if (take(n)) stack.push(n);
      }
    }
  }
  return true;
}
