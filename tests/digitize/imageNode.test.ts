import { createHash } from 'node:crypto';
import { createCanvas } from '@napi-rs/canvas';
import { describe, expect, it } from 'vitest';
import { loadImageRasterNode, loadImageSheetNode } from '../../src/digitize/loaders/imageNode.ts';
import { readImageHeader } from '../../src/digitize/loaders/imageHeader.ts';
import { SheetError } from '../../src/digitize/sheet.ts';

function picture(width: number, height: number, format: 'png' | 'jpeg', transparent = false): Uint8Array {
  const canvas = createCanvas(width, height);
  const ctx = canvas.getContext('2d');
  if (!transparent) {
    ctx.fillStyle = '#ffffff';
    ctx.fillRect(0, 0, width, height);
  }
  ctx.fillStyle = '#ff0000';
  ctx.fillRect(10, 10, 20, 20);
  return new Uint8Array(format === 'png' ? canvas.toBuffer('image/png') : canvas.toBuffer('image/jpeg', 90));
}

async function refusal(promise: Promise<unknown>): Promise<SheetError> {
  try {
    await promise;
  } catch (error) {
    expect(error).toBeInstanceOf(SheetError);
    return error as SheetError;
  }
  throw new Error('expected a refusal');
}

describe('loading a scan in Node', () => {
  it('decodes a PNG into RGBA pixels at scale 1, pixel for pixel', async () => {
    const image = await loadImageRasterNode(picture(64, 48, 'png'));
    expect([image.width, image.height, image.scale]).toEqual([64, 48, 1]);
    const at = (x: number, y: number) => [...image.data.subarray((y * 64 + x) * 4, (y * 64 + x) * 4 + 4)];
    expect(at(15, 15)).toEqual([255, 0, 0, 255]); // exact: lossless format
    expect(at(40, 40)).toEqual([255, 255, 255, 255]);
  });

  it('decodes a JPEG, within the loss of the compression', async () => {
    const image = await loadImageRasterNode(picture(64, 48, 'jpeg'));
    const i = (15 * 64 + 15) * 4;
    expect(Math.abs((image.data[i] as number) - 255)).toBeLessThanOrEqual(12); // JPEG at quality 90: a few levels
    expect(image.data[i + 1] as number).toBeLessThanOrEqual(12);
  });

  it('shows transparent areas of a PNG as white paper', async () => {
    const image = await loadImageRasterNode(picture(64, 48, 'png', true));
    const i = (40 * 64 + 40) * 4;
    expect([...image.data.subarray(i, i + 4)]).toEqual([255, 255, 255, 255]);
  });

  it('opens an image as a sheet whose units are its pixels, with the file hash, and renders other scales', async () => {
    const bytes = picture(64, 48, 'png');
    const sheet = await loadImageSheetNode(bytes);
    expect(sheet.kind).toBe('image');
    expect([sheet.width, sheet.height, sheet.page]).toEqual([64, 48, 1]);
    expect(sheet.sha256).toBe(createHash('sha256').update(bytes).digest('hex'));
    expect(await sheet.paths()).toEqual([]);
    const half = await sheet.render(0.5);
    expect([half.width, half.height, half.scale]).toEqual([32, 24, 0.5]);
    expect((await sheet.render(1)).width).toBe(64);
  });

  it('refuses a file over 50 MB before reading it, with a sentence naming the limit', async () => {
    const big = new Uint8Array(50 * 1024 * 1024 + 1);
    big.set(picture(8, 8, 'png'));
    const error = await refusal(loadImageRasterNode(big, { name: 'huge.png' }));
    expect(error.message).toMatch(/huge\.png.*50\.0 MB.*50 MB limit/);
  });

  it('refuses a decompression bomb (30000 × 30000 in its header) before decoding, saying what to do', async () => {
    const bytes = picture(8, 8, 'png');
    const view = new DataView(bytes.buffer, bytes.byteOffset);
    view.setUint32(16, 30000); // IHDR width
    view.setUint32(20, 30000); // IHDR height: 900 megapixels
    const before = process.memoryUsage().arrayBuffers;
    const error = await refusal(loadImageRasterNode(bytes));
    expect(error.message).toMatch(/30000 × 30000 pixels \(900\.0 megapixels\), over the 150 megapixel limit; scan the page again at 300 to 600 dpi/);
    expect(process.memoryUsage().arrayBuffers - before).toBeLessThan(16 * 1024 * 1024); // nothing page-sized was allocated
  });

  it('refuses a JPEG bomb (30000 × 30000 in its frame header) before decoding', async () => {
    const bytes = picture(8, 8, 'jpeg');
    for (let i = 2; i + 9 < bytes.length; i++) {
      if (bytes[i] === 0xff && bytes[i + 1] === 0xc0) {
        const view = new DataView(bytes.buffer, bytes.byteOffset + i);
        view.setUint16(5, 30000); // height
        view.setUint16(7, 30000); // width
        break;
      }
    }
    const before = process.memoryUsage();
    const error = await refusal(loadImageRasterNode(bytes, { name: 'bomb.jpg' }));
    expect(error.message).toMatch(/bomb\.jpg.*30000 × 30000 pixels \(900\.0 megapixels\), over the 150 megapixel limit; scan the page again at 300 to 600 dpi, or split it into parts, and load that\.$/);
    const after = process.memoryUsage();
    expect(after.arrayBuffers - before.arrayBuffers).toBeLessThan(16 * 1024 * 1024);
    expect(after.rss - before.rss).toBeLessThan(64 * 1024 * 1024); // a decode would take 3.6 GB
  });

  it('refuses a file that is neither PNG nor JPEG', async () => {
    const error = await refusal(loadImageRasterNode(new TextEncoder().encode('hello, not an image')));
    expect(error.message).toMatch(/neither a PNG nor a JPEG/);
  });

  it('refuses cut-off PNG and JPEG files with a sentence', async () => {
    for (const format of ['png', 'jpeg'] as const) {
      const bytes = picture(200, 100, format);
      const error = await refusal(loadImageRasterNode(bytes.subarray(0, Math.floor(bytes.length * 0.6))));
      expect(error.message).toMatch(/cut-off/);
    }
  });

  it('reads a JPEG with stray bytes between its segments, as browsers do', async () => {
    const bytes = picture(64, 48, 'jpeg');
    let sos = -1;
    for (let i = 2; i + 1 < bytes.length; i++) {
      if (bytes[i] === 0xff && bytes[i + 1] === 0xda) {
        sos = i;
        break;
      }
    }
    const stray = new Uint8Array(bytes.length + 3);
    stray.set(bytes.subarray(0, sos));
    stray.set([0x00, 0x12, 0x34], sos);
    stray.set(bytes.subarray(sos), sos + 3);
    const clean = await loadImageRasterNode(bytes);
    const image = await loadImageRasterNode(stray);
    expect(Buffer.compare(Buffer.from(image.data), Buffer.from(clean.data))).toBe(0);
  });

  it('turns a JPEG with damaged tables into a sentence instead of a crash', async () => {
    const bytes = picture(300, 200, 'jpeg');
    // Overwrite bytes inside the quantisation and Huffman tables, keeping the markers' layout.
    const damaged = bytes.slice();
    for (let i = 0; i + 1 < damaged.length; i++) {
      if (damaged[i] === 0xff && (damaged[i + 1] === 0xc4 || damaged[i + 1] === 0xdb)) {
        for (let k = i + 5; k < i + 20; k++) damaged[k] = 0xff;
      }
    }
    const error = await refusal(loadImageRasterNode(damaged, { name: 'scan.jpg' }));
    expect(error.message).toMatch(/scan\.jpg.*damaged JPEG/);
  });
});
