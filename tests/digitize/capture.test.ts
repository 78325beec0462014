import { describe, expect, it } from 'vitest';
import { captureTrace, type CaptureSource } from '../../src/digitize/capture.ts';
import { CaptureError, strokeLines } from '../../src/digitize/vectorCapture.ts';
import { sheetPoint } from '../../src/digitize/points.ts';
import type { RasterImage } from '../../src/digitize/raster.ts';
import type { VectorPath } from '../../src/digitize/sheet.ts';

/** A 300 × 200 picture: a black line 3 px wide from (20, 180) to (280, 20) and a grey grid line at y = 100. */
function picture(): RasterImage {
  const width = 300;
  const height = 200;
  const data = new Uint8ClampedArray(width * height * 4).fill(255);
  const paint = (x: number, y: number, v: number) => {
    const i = 4 * (y * width + x);
    data[i] = data[i + 1] = data[i + 2] = v;
  };
  for (let x = 0; x < width; x++) for (const y of [99, 100]) paint(x, y, 170);
  for (let y = 0; y < height; y++) {
    for (let x = 0; x < width; x++) {
      // Distance from the pixel centre to the line through (20,180) and (280,20).
      const d = Math.abs(160 * (x + 0.5 - 20) + 260 * (y + 0.5 - 180)) / Math.hypot(160, 260);
      const t = ((x + 0.5 - 20) * 260 - (y + 0.5 - 180) * 160) / (260 * 260 + 160 * 160);
      if (d <= 1.5 && t >= 0 && t <= 1) paint(x, y, 0);
    }
  }
  return { width, height, data, scale: 1 };
}

const gridOnly: VectorPath[] = [{ segments: [{ kind: 'move', to: sheetPoint(0, 100) }, { kind: 'line', to: sheetPoint(300, 100) }], stroke: '#aaaaaa', fill: null, lineWidth: 1, dashed: false }];

function source(kind: CaptureSource['kind'], paths: VectorPath[]): CaptureSource {
  return { kind, lines: async () => strokeLines(paths), raster: async () => picture() };
}

describe('capturing a trace on any sheet', () => {
  it('uses explicit points as they are', async () => {
    const points = [sheetPoint(1, 2), sheetPoint(3, 4)];
    const got = await captureTrace({ points, guides: [sheetPoint(9, 9)] }, source('vector-pdf', gridOnly));
    expect(got.how).toBe('points');
    expect(got.points).toEqual(points);
  });

  it('follows the picture when the only drawn path near the guide is a grid line', async () => {
    // Guide on the picture's line, 4 units from the grid line y = 100.
    const got = await captureTrace({ guides: [sheetPoint(156.5, 96.3)] }, source('vector-pdf', gridOnly));
    expect(got.how).toBe('raster');
    const xs = got.points.map((p) => p[0]);
    expect(Math.max(...xs) - Math.min(...xs)).toBeGreaterThan(200);
    // Every point on the drawn line (1 unit: half its width plus the tracer's thinning).
    for (const p of got.points) expect(Math.abs(160 * (p[0] - 20) + 260 * (p[1] - 180)) / Math.hypot(160, 260)).toBeLessThan(1);
  });

  it('captures on the picture of an image sheet, and refuses vector capture there', async () => {
    const got = await captureTrace({ guides: [sheetPoint(60, 155.4), sheetPoint(240, 44.6)] }, source('image', []));
    expect(got.how).toBe('raster');
    await expect(captureTrace({ guides: [sheetPoint(60, 155)], method: 'vector' }, source('image', []))).rejects.toThrow(CaptureError);
  });
});
