/**
 * In-process decoding of scans (src/digitize/loaders/imageDecode.ts): PNG pixel for pixel
 * against the canvas library's decoder, the PNG colour types and bit depths scans use, JPEG
 * pixel for pixel against the canvas library's decoder (libjpeg-turbo, as in the browser),
 * also the committed sample scans, and big pages reduced on load to the working limit.
 */
import { deflateSync } from 'node:zlib';
import { createCanvas, loadImage } from '@napi-rs/canvas';
import { describe, expect, it } from 'vitest';
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import sharp from 'sharp';
import { decodeNative, decodePng } from '../../src/digitize/loaders/imageDecode.ts';
import { loadImageRasterNode, loadImageSheetNode, readImageRegionNode, workingSize } from '../../src/digitize/loaders/imageNode.ts';
import { SheetError } from '../../src/digitize/sheet.ts';
import { seededRandom } from '../../src/demo/random.ts';

function drawing(width: number, height: number, seed: number) {
  const rand = seededRandom(seed);
  const canvas = createCanvas(width, height);
  const ctx = canvas.getContext('2d');
  ctx.fillStyle = '#ffffff';
  ctx.fillRect(0, 0, width, height);
  for (let i = 0; i < 40; i++) {
    ctx.strokeStyle = `rgb(${Math.floor(rand() * 256)},${Math.floor(rand() * 256)},${Math.floor(rand() * 256)})`;
    ctx.lineWidth = 1 + rand() * 4;
    ctx.beginPath();
    ctx.moveTo(rand() * width, rand() * height);
    ctx.lineTo(rand() * width, rand() * height);
    ctx.stroke();
  }
  return canvas;
}

async function reference(bytes: Uint8Array): Promise<Uint8ClampedArray> {
  const image = await loadImage(Buffer.from(bytes));
  const c = createCanvas(image.width, image.height);
  const ctx = c.getContext('2d');
  ctx.fillStyle = '#ffffff';
  ctx.fillRect(0, 0, image.width, image.height);
  ctx.drawImage(image, 0, 0);
  return ctx.getImageData(0, 0, image.width, image.height).data;
}

/** A PNG written by hand: `raw` rows (filter byte 0 each) of the given colour type and bit depth. */
function handPng(width: number, height: number, colorType: number, bitDepth: number, rows: Uint8Array[], extra: Array<[string, Uint8Array]> = []): Uint8Array {
  const chunk = (type: string, body: Uint8Array) => {
    const out = Buffer.alloc(12 + body.length);
    out.writeUInt32BE(body.length, 0);
    out.write(type, 4, 'latin1');
    Buffer.from(body).copy(out, 8);
    return out; // CRC left zero: the decoder does not check it
  };
  const ihdr = Buffer.alloc(13);
  ihdr.writeUInt32BE(width, 0);
  ihdr.writeUInt32BE(height, 4);
  ihdr[8] = bitDepth;
  ihdr[9] = colorType;
  const raw = Buffer.concat(rows.map((r) => Buffer.concat([Buffer.from([0]), Buffer.from(r)])));
  return new Uint8Array(Buffer.concat([Buffer.from([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a]), chunk('IHDR', ihdr), ...extra.map(([t, b]) => chunk(t, b)), chunk('IDAT', deflateSync(raw)), chunk('IEND', new Uint8Array())]));
}

describe('decoding in this process', () => {
  it('a PNG (all row filters) matches the canvas decoder pixel for pixel', async () => {
    const bytes = new Uint8Array(drawing(301, 177, 3).toBuffer('image/png'));
    const ours = await decodePng(bytes, 301, 177);
    const ref = await reference(bytes);
    expect(Buffer.compare(Buffer.from(ours.data.buffer, ours.data.byteOffset, ours.data.byteLength), Buffer.from(ref.buffer, ref.byteOffset, ref.byteLength))).toBe(0);
  });

  it('1-bit grey and palette PNGs, as bilevel scans are saved', async () => {
    const bilevel = await decodePng(handPng(10, 2, 0, 1, [new Uint8Array([0b10100000, 0b01000000]), new Uint8Array([0xff, 0xc0])]), 10, 2);
    expect([...bilevel.data.subarray(0, 12)]).toEqual([255, 255, 255, 255, 0, 0, 0, 255, 255, 255, 255, 255]);
    expect(bilevel.data[(10 + 9) * 4]).toBe(255);
    const palette = await decodePng(handPng(2, 1, 3, 8, [new Uint8Array([1, 0])], [['PLTE', new Uint8Array([255, 0, 0, 0, 0, 255])]]), 2, 1);
    expect([...palette.data]).toEqual([0, 0, 255, 255, 255, 0, 0, 255]);
  });

  it('a JPEG matches the canvas decoder (the browser\'s libjpeg-turbo) pixel for pixel, colour and grey', async () => {
    const colour = new Uint8Array(drawing(320, 200, 5).toBuffer('image/jpeg', 92));
    const grey = new Uint8Array(await sharp(colour).toColourspace('b-w').jpeg({ quality: 90 }).toBuffer());
    expect((await sharp(grey).metadata()).channels).toBe(1);
    for (const bytes of [colour, grey]) {
      const ours = await decodeNative(bytes, 320, 200, 320, 200);
      const ref = await reference(bytes);
      expect(Buffer.compare(Buffer.from(ours.data.buffer, ours.data.byteOffset, ours.data.byteLength), Buffer.from(ref.buffer, ref.byteOffset, ref.byteLength))).toBe(0);
    }
  });

  it('the committed sample scans decode to the same pixels as with the canvas decoder', async () => {
    for (const name of ['us-iso-black-scan.jpg', 'si-panels-colour-scan.jpg']) {
      const bytes = new Uint8Array(readFileSync(join(import.meta.dirname, '..', '..', 'samples', 'sheets', name)));
      const image = await loadImageRasterNode(bytes);
      const ref = await reference(bytes);
      expect(image.data.length).toBe(ref.length);
      expect(Buffer.compare(Buffer.from(image.data.buffer, image.data.byteOffset, image.data.byteLength), Buffer.from(ref.buffer, ref.byteOffset, ref.byteLength))).toBe(0);
    }
  }, 30_000);

  it('an interlaced PNG with transparency goes to the native decoder and lands on white paper', async () => {
    const rgba = new Uint8Array(40 * 30 * 4); // transparent, with an opaque blue square
    for (let y = 5; y < 15; y++) for (let x = 5; x < 15; x++) rgba.set([0, 0, 255, 255], (y * 40 + x) * 4);
    const png = new Uint8Array(await sharp(rgba, { raw: { width: 40, height: 30, channels: 4 } }).png({ progressive: true }).toBuffer());
    expect(png[28]).toBe(1); // Adam7
    const image = await loadImageRasterNode(png);
    const at = (x: number, y: number) => [...image.data.subarray((y * 40 + x) * 4, (y * 40 + x) * 4 + 4)];
    expect(at(10, 10)).toEqual([0, 0, 255, 255]);
    expect(at(30, 20)).toEqual([255, 255, 255, 255]);
  });

  it('a page over the 40-megapixel working limit is reduced on load; its sheet keeps the file’s pixel units', async () => {
    const [w, h] = [8000, 6000]; // 48 megapixels, grey
    const row = new Uint8Array(w).fill(255);
    const dark = new Uint8Array(w).fill(255);
    dark.fill(0, 4000, 4004); // a dark 4-pixel stub in the middle of one row
    const rows = Array.from({ length: h }, (_, y) => (y === 3000 ? dark : row));
    const bytes = handPng(w, h, 0, 8, rows);
    const size = workingSize(w, h, 40_000_000);
    expect(size.width * size.height).toBeLessThanOrEqual(40_000_000);
    const image = await loadImageRasterNode(bytes);
    expect([image.width, image.height]).toEqual([size.width, size.height]);
    expect(image.scale).toBeCloseTo(size.scale, 12);
    // the stub survives reduction as a grey mark where it was (box average, not dropped)
    const x = Math.floor(4001 * image.scale);
    const y = Math.floor(3000 * image.scale);
    expect(image.data[(y * image.width + x) * 4] as number).toBeLessThan(200);
    const sheet = await loadImageSheetNode(bytes);
    expect([sheet.width, sheet.height]).toEqual([w, h]);
    expect((await sheet.render(1)).scale).toBeCloseTo(size.scale, 12);
  }, 60_000);

  it('the working size divides by the smallest whole factor: A3 at 600 dpi is read at 300 dpi', () => {
    expect(workingSize(3508, 4961, 40e6)).toEqual({ width: 3508, height: 4961, scale: 1, factor: 1 }); // A3 at 300 dpi: as it is
    const a3 = workingSize(7016, 9921, 40e6); // A3 at 600 dpi, 69.6 megapixels
    expect([a3.width, a3.height, a3.factor]).toEqual([3508, 4961, 2]);
    const biggest = workingSize(10000, 15000, 40e6); // 150 megapixels, the largest file accepted
    expect(biggest.factor).toBe(2);
    expect(biggest.width * biggest.height).toBeLessThanOrEqual(40e6);
    expect(workingSize(13000, 13000, 40e6).factor).toBe(3); // 169 Mpx (over the file limit; the rule alone): 1/2 would leave 42.3 Mpx
  });

  it('a JPEG over the working limit is reduced inside the decoder, keeps its thin lines, and the user is told', async () => {
    // The limit is lowered to 1 megapixel so that a small file stands for an archive scan.
    const [w, h] = [2000, 1500];
    const canvas = createCanvas(w, h);
    const ctx = canvas.getContext('2d');
    ctx.fillStyle = '#ffffff';
    ctx.fillRect(0, 0, w, h);
    ctx.fillStyle = '#000000';
    ctx.fillRect(0, 701, w, 2); // a 2-pixel line, as a 0.1 mm line at 600 dpi
    ctx.fillStyle = '#d00000';
    ctx.fillRect(1201, 0, 3, h); // a 3-pixel red curve stand-in
    const bytes = new Uint8Array(canvas.toBuffer('image/jpeg', 92));
    const notes: string[] = [];
    const limits = { maxBytes: 50 * 1024 * 1024, maxPixels: 1_000_000 };
    const image = await loadImageRasterNode(bytes, { limits, name: 'archive.jpg', onNote: (n) => notes.push(n) });
    expect([image.width, image.height, image.scale]).toEqual([1000, 750, 0.5]);
    expect(notes).toHaveLength(1);
    expect(notes[0]).toMatch(/^The image "archive\.jpg" is 2000 × 1500 pixels \(3\.0 megapixels\), over the working limit, so it was read at 1\/2 of its resolution \(1000 × 750, 0\.8 megapixels; a 600-dpi scan is read at 300 dpi\); .*crop the file/);
    expect(notes[0]!.split('. ').length).toBe(1); // one sentence
    const px = (x: number, y: number) => [...image.data.subarray((y * 1000 + x) * 4, (y * 1000 + x) * 4 + 3)];
    // The black line (rows 701–702) straddles working rows 350 and 351: it fades to about half, but stays where it was.
    expect(Math.min(Math.max(...px(300, 350)), Math.max(...px(300, 351)))).toBeLessThan(160);
    expect(Math.max(...px(300, 348))).toBeGreaterThan(230); // paper two rows away
    const red = px(601, 200); // x 1201–1203 → 600.5–601.5
    expect(red[0]! - red[1]!).toBeGreaterThan(60); // still red, not washed out to paper
    expect(px(300, 200)).toEqual([255, 255, 255].map((v) => expect.closeTo(v, -1.5) as unknown as number));
  });

  it('a region re-read at full resolution is the same pixels as the whole file decoded', async () => {
    const bytes = new Uint8Array(drawing(640, 480, 9).toBuffer('image/jpeg', 90));
    const whole = await loadImageRasterNode(bytes);
    const region = await readImageRegionNode(bytes, { left: 101, top: 57, width: 200, height: 120 });
    expect([region.width, region.height, region.scale]).toEqual([200, 120, 1]);
    for (let y = 0; y < 120; y++) {
      const a = region.data.subarray(y * 200 * 4, (y + 1) * 200 * 4);
      const b = whole.data.subarray(((57 + y) * 640 + 101) * 4, ((57 + y) * 640 + 301) * 4);
      expect(Buffer.compare(Buffer.from(a), Buffer.from(b))).toBe(0);
    }
    await expect(readImageRegionNode(bytes, { left: 600, top: 0, width: 100, height: 10 })).rejects.toThrow(SheetError);
    await expect(readImageRegionNode(bytes, { left: 600, top: 0, width: 100, height: 10 })).rejects.toThrow(/not inside the image of 640 × 480 pixels; choose a region on the page\.$/);
  });
});
