import { createCanvas } from '@napi-rs/canvas';
import { describe, expect, it } from 'vitest';
import { captureTrace } from '../../src/digitize/capture.ts';
import { closeRetrace, regionBox, type RegionReader } from '../../src/digitize/closeTrace.ts';
import { loadImageSheetNode } from '../../src/digitize/loaders/imageNode.ts';
import { sheetPoint, type SheetPoint } from '../../src/digitize/points.ts';
import type { RasterImage } from '../../src/digitize/raster.ts';
import { traceRaster } from '../../src/digitize/rasterTrace.ts';

// A falling curve on a 1200 × 800 page (sheet units = the file's pixels), drawn 3 px wide.
const f = (x: number) => 150 + 0.0004 * (x - 100) ** 2;
const [W, H] = [1200, 800];

/** The page's part from (ox, oy), `w` × `h` sheet units, drawn at `scale` pixels per sheet unit; `lift` moves the line up. */
function drawn(ox: number, oy: number, w: number, h: number, scale: number, lift = 0): RasterImage {
  const [pw, ph] = [Math.round(w * scale), Math.round(h * scale)];
  const canvas = createCanvas(pw, ph);
  const ctx = canvas.getContext('2d');
  ctx.fillStyle = '#ffffff';
  ctx.fillRect(0, 0, pw, ph);
  ctx.strokeStyle = '#1f4fb4';
  ctx.lineWidth = 3 * scale;
  ctx.beginPath();
  for (let x = 100; x <= 1100; x += 2) {
    const [px, py] = [(x - ox) * scale, (f(x) - lift - oy) * scale];
    if (x === 100) ctx.moveTo(px, py);
    else ctx.lineTo(px, py);
  }
  ctx.stroke();
  return { width: pw, height: ph, data: new Uint8ClampedArray(ctx.getImageData(0, 0, pw, ph).data), scale };
}

const guides: SheetPoint[] = [sheetPoint(300, f(300)), sheetPoint(700, f(700)), sheetPoint(1000, f(1000))];
const worstOff = (points: readonly SheetPoint[]) => Math.max(...points.filter((p) => p[0] > 120 && p[0] < 1080).map((p) => Math.abs(p[1] - f(p[0]))));
const cropReader =
  (lift = 0): RegionReader =>
  async (box) => {
    const [l, t] = [Math.max(0, Math.floor(box[0])), Math.max(0, Math.floor(box[1]))];
    const [r, b] = [Math.min(W, Math.ceil(box[2])), Math.min(H, Math.ceil(box[3]))];
    return { image: drawn(l, t, r - l, b - t, 1, lift), origin: sheetPoint(l, t) };
  };

describe('close re-trace at the file resolution', () => {
  const working = drawn(0, 0, W, H, 0.25); // the page read at a quarter of its resolution
  const first = traceRaster(working, guides, { extent: 'line' });

  it('re-traces a line on the file pixels of its part of the page, and keeps the working trace’s line and doubts', async () => {
    const close = await closeRetrace(first, working.scale, guides, { extent: 'line' }, cropReader());
    expect(close.kind).toBe('close');
    if (close.kind !== 'close') return;
    expect(close.note).toMatch(/^Re-traced at the file's full resolution/);
    expect(close.scale).toBe(1);
    expect(close.traced.doubts).toEqual(first.doubts);
    // The close trace reads the centre of the line to a fraction of a file pixel; the working trace only to about a working pixel (4 file pixels).
    expect(worstOff(close.traced.points)).toBeLessThan(0.5);
    expect(worstOff(close.traced.points)).toBeLessThan(worstOff(first.points));
  });

  it('keeps the working trace, and says so, when the close re-trace follows another line', async () => {
    // The file's part holds the line 12 px (3 working pixels) higher than the working raster: a different line.
    const moved = await closeRetrace(first, working.scale, guides.map((g) => sheetPoint(g[0], g[1] - 12)), { extent: 'line' }, cropReader(12));
    expect(moved.kind).toBe('kept');
    expect(moved.note).toMatch(/runs up to [\d.]+ working pixels .* working trace is kept, so check this trace on the sheet\.$/);
  });

  it('keeps the working trace when the part of the page cannot be read, with the reader’s reason', async () => {
    const refused = await closeRetrace(first, working.scale, guides, { extent: 'line' }, async () => 'its panel spans 52.0 megapixels at the file\'s resolution, over the 40 megapixel working limit');
    expect(refused).toEqual({ kind: 'kept', note: "The trace was not re-traced at full resolution: its panel spans 52.0 megapixels at the file's resolution, over the 40 megapixel working limit." });
  });

  it('keeps the working trace when reading the file again fails', async () => {
    const failed = await closeRetrace(first, working.scale, guides, { extent: 'line' }, async () => {
      throw new Error('The image is a damaged JPEG file and cannot be decoded; scan or export it again.');
    });
    expect(failed).toEqual({ kind: 'kept', note: 'The trace was not re-traced at full resolution: the image is a damaged JPEG file and cannot be decoded; scan or export it again.' });
  });

  it('reads the panel frame with a margin, so all traces of a panel share one read', () => {
    expect(regionBox([sheetPoint(10, 10)], [], [100, 50, 1100, 650])).toEqual([70, 32, 1130, 668]);
  });

  it('works through a reduced image sheet: the loader offers the file’s parts, and capture uses them', async () => {
    const full = drawn(0, 0, W, H, 1);
    const canvas = createCanvas(W, H);
    const ctx = canvas.getContext('2d');
    const pixels = ctx.createImageData(W, H);
    pixels.data.set(full.data);
    ctx.putImageData(pixels, 0, 0);
    const png = new Uint8Array(canvas.toBuffer('image/png'));
    const sheet = await loadImageSheetNode(png, { limits: { maxBytes: 50 * 2 ** 20, maxPixels: 900_000 } });
    const reduced = await sheet.render(1);
    expect(reduced.scale).toBe(0.5);
    expect(sheet.region).toBeTypeOf('function');
    const source = { kind: sheet.kind, lines: async () => [], raster: async () => reduced };
    const plain = await captureTrace({ guides, method: 'raster' }, source);
    const close = await captureTrace({ guides, method: 'raster', frame: [50, 50, 1150, 750] }, { ...source, closeRaster: sheet.region });
    expect(close.notes).toEqual([expect.stringMatching(/^Re-traced at the file's full resolution/)]);
    expect(worstOff(close.points)).toBeLessThan(0.5);
    expect(worstOff(close.points)).toBeLessThanOrEqual(worstOff(plain.points));
    // A box past the page is clamped; one outside it is refused with a sentence.
    expect(await sheet.region?.([-50, -50, 10, 10])).toMatchObject({ origin: [0, 0] });
    expect(await sheet.region?.([2000, 2000, 2100, 2100])).toBe('the part of the page asked for lies outside the image');
  });
});
