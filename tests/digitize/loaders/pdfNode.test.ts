import { describe, expect, it } from 'vitest';
import { createCanvas, type SKRSContext2D } from '@napi-rs/canvas';
import { pushGraphicsState, popGraphicsState, concatTransformationMatrix, degrees } from 'pdf-lib';
import { loadPdfSheetNode, sha256Hex } from '../../../src/digitize/loaders/pdfNode.ts';
import { SheetError, type PathSegment } from '../../../src/digitize/sheet.ts';
import { drawPdf, encryptedPdf, PDFDocument, rgb } from '../fixtures/pdfBytes.ts';

const TOL = 1e-3; // sheet units; pdf.js hands coordinates over as 32-bit floats
/** Node's own `Response` before pdf.js is loaded (pdfNode.ts loads pdf.js beside a stand-in and puts this back). */
const responseBefore = Object.getOwnPropertyDescriptor(globalThis, 'Response');

function endpoints(segments: readonly PathSegment[]): [number, number][] {
  return segments.flatMap((s) => (s.kind === 'close' ? [] : [[s.to[0], s.to[1]] as [number, number]]));
}

describe('loading a vector PDF page in Node', () => {
  it('reads stroked paths in sheet coordinates, with colour, width and Béziers kept exact', async () => {
    const bytes = await drawPdf(400, 300, (d) => {
      d.stroke('M 50 250 L 350 250', rgb(0, 0, 0), 1);
      d.stroke('M 60 200 C 100 150 200 100 300 90', rgb(1, 0, 0), 0.75);
    });
    const sheet = await loadPdfSheetNode(bytes);
    expect(sheet.kind).toBe('vector-pdf');
    expect(sheet.width).toBe(400);
    expect(sheet.height).toBe(300);
    expect(sheet.sha256).toBe(sha256Hex(bytes));
    const paths = await sheet.paths();
    const red = paths.find((p) => p.stroke === '#ff0000');
    expect(red).toBeDefined();
    expect(red!.lineWidth).toBeCloseTo(0.75, 6);
    const cubic = red!.segments.find((s) => s.kind === 'cubic');
    expect(cubic && cubic.kind === 'cubic').toBe(true);
    if (cubic?.kind === 'cubic') {
      expect(cubic.c1[0]).toBeCloseTo(100, 3);
      expect(cubic.c1[1]).toBeCloseTo(150, 3);
      expect(cubic.to[0]).toBeCloseTo(300, 3);
      expect(cubic.to[1]).toBeCloseTo(90, 3);
    }
    const black = paths.find((p) => p.stroke === '#000000');
    const ends = endpoints(black!.segments);
    expect(Math.abs(ends.at(-1)![0] - 350)).toBeLessThan(TOL);
    expect(Math.abs(ends.at(-1)![1] - 250)).toBeLessThan(TOL);
    await sheet.close();
  });

  it('follows save, restore and nested transforms (rotation and scale) to page coordinates', async () => {
    const bytes = await drawPdf(400, 400, (d) => {
      const c = Math.cos(Math.PI / 6);
      const s = Math.sin(Math.PI / 6);
      d.page.pushOperators(pushGraphicsState(), concatTransformationMatrix(2 * c, 2 * s, -2 * s, 2 * c, 100, 50));
      // In PDF user space (y up) inside the rotated, doubled frame: a line from (0,0) to (50,0).
      d.page.drawLine({ start: { x: 0, y: 0 }, end: { x: 50, y: 0 }, thickness: 0.5, color: rgb(0, 0, 1) });
      d.page.pushOperators(popGraphicsState());
      d.page.drawLine({ start: { x: 10, y: 10 }, end: { x: 20, y: 10 }, thickness: 1, color: rgb(0, 1, 0) });
    });
    const sheet = await loadPdfSheetNode(bytes);
    const paths = await sheet.paths();
    const blue = paths.find((p) => p.stroke === '#0000ff')!;
    const end = endpoints(blue.segments).at(-1)!;
    // (50,0) → rotated 30°, doubled, moved to (100,50) in PDF space → y flipped on a 400-high page.
    expect(Math.abs(end[0] - (100 + 100 * Math.cos(Math.PI / 6)))).toBeLessThan(TOL);
    expect(Math.abs(end[1] - (400 - (50 + 100 * Math.sin(Math.PI / 6))))).toBeLessThan(TOL);
    expect(blue.lineWidth).toBeCloseTo(1, 5); // 0.5 user units × 2
    const green = paths.find((p) => p.stroke === '#00ff00')!;
    const gEnd = endpoints(green.segments).at(-1)!;
    expect(Math.abs(gEnd[0] - 20)).toBeLessThan(TOL);
    expect(Math.abs(gEnd[1] - 390)).toBeLessThan(TOL); // the restore dropped the rotation
    await sheet.close();
  });

  it('shows a rotated page with an offset media box the way a viewer shows it', async () => {
    const doc = await PDFDocument.create();
    const page = doc.addPage([300, 200]);
    page.setMediaBox(50, 20, 300, 200); // user space x 50…350, y 20…220
    page.setRotation(degrees(90)); // shown 200 wide and 300 high, turned clockwise
    page.drawLine({ start: { x: 60, y: 30 }, end: { x: 160, y: 30 }, thickness: 1, color: rgb(1, 0, 0) });
    const sheet = await loadPdfSheetNode(await doc.save());
    expect(sheet.width).toBeCloseTo(200, 9);
    expect(sheet.height).toBeCloseTo(300, 9);
    const red = (await sheet.paths()).find((p) => p.stroke === '#ff0000')!;
    const [start, end] = endpoints(red.segments).slice(-2);
    // Turned 90° clockwise: user (x, y) → sheet (y − 20, x − 50).
    expect(Math.hypot(start![0] - 10, start![1] - 10)).toBeLessThan(TOL);
    expect(Math.hypot(end![0] - 10, end![1] - 110)).toBeLessThan(TOL);
    await sheet.close();
  });

  it('reads the text layer with baseline origin and size in sheet units', async () => {
    const bytes = await drawPdf(300, 200, (d) => {
      d.text('400', 100, 180, 9);
      d.text('Head', 20, 40, 12);
    });
    const sheet = await loadPdfSheetNode(bytes);
    const text = await sheet.text();
    const label = text.find((t) => t.text === '400')!;
    expect(label.at[0]).toBeCloseTo(100, 4);
    expect(label.at[1]).toBeCloseTo(180, 4);
    expect(label.size).toBeCloseTo(9, 6);
    expect(label.width).toBeCloseTo(3 * 0.556 * 9, 3); // Helvetica digit advance 556/1000 em
    expect(label.angle).toBeCloseTo(0, 9);
    expect(text.some((t) => t.text === 'Head')).toBe(true);
    await sheet.close();
  });

  it('leaves Node\'s own Response in place once pdf.js is loaded', async () => {
    const sheet = await loadPdfSheetNode(await drawPdf(100, 100, (d) => d.stroke('M 10 10 L 90 90')));
    await sheet.close();
    expect(Object.getOwnPropertyDescriptor(globalThis, 'Response')).toEqual(responseBefore);
    expect(typeof new Response('x').text).toBe('function');
  });

  it('renders at any scale into an RGBA raster with dark pixels where lines are drawn', async () => {
    const bytes = await drawPdf(200, 100, (d) => d.stroke('M 20 50 L 180 50', rgb(0, 0, 0), 2));
    const sheet = await loadPdfSheetNode(bytes);
    const image = await sheet.render(3);
    expect(image.width).toBe(600);
    expect(image.height).toBe(300);
    expect(image.scale).toBe(3);
    const px = (x: number, y: number) => image.data[4 * (Math.floor(y) * image.width + Math.floor(x))]!;
    expect(px(100 * 3, 50 * 3)).toBeLessThan(60);
    expect(px(100 * 3, 20 * 3)).toBeGreaterThan(240);
    await sheet.close();
  });

  it('detects a page that is an embedded scan as raster-pdf', async () => {
    const bytes = await scanInPdf([300, 200], [612, 792], { x: 10, y: 10, width: 592, height: 772 }, (ctx) => {
      ctx.beginPath();
      ctx.moveTo(10, 190);
      ctx.lineTo(290, 20);
      ctx.stroke();
    });
    const sheet = await loadPdfSheetNode(bytes);
    expect(sheet.kind).toBe('raster-pdf');
    await sheet.close();
  });

  it('renders a scan inside a PDF at most at the resolution of its picture, and says so in the scale', async () => {
    // A 1500 × 2000 picture on 300 × 400 pt: 5 pixels per pt (360 dpi). Asked for 6 px/pt, the page comes at 5.
    // A bar across the middle: 40 % of the width, 50 px of the 2000.
    const bytes = await scanInPdf([1500, 2000], [300, 400], { x: 0, y: 0, width: 300, height: 400 }, (ctx) => ctx.fillRect(250, 975, 1000, 50));
    const sheet = await loadPdfSheetNode(bytes);
    expect(sheet.kind).toBe('raster-pdf');
    const image = await sheet.render(6);
    expect(image.scale).toBeCloseTo(5, 9);
    expect([image.width, image.height]).toEqual([1500, 2000]);
    const px = (sx: number, sy: number) => image.data[4 * (Math.floor(sy * image.scale) * image.width + Math.floor(sx * image.scale))]!;
    expect(px(150, 200)).toBeLessThan(60); // the bar, found by sheet coordinates through the scale
    expect(px(150, 100)).toBeGreaterThan(240);
    // Below the picture's resolution the asked scale holds; a second rendering still works after the first freed pdf.js's images.
    const coarse = await sheet.render(1);
    expect([coarse.width, coarse.height, coarse.scale]).toEqual([300, 400, 1]);
    await sheet.close();
  });

  it('renders a coarse scan inside a PDF at 200 dpi at least, as asked up to that', async () => {
    // 300 × 400 pixels on 300 × 400 pt: 72 dpi. Asked for 4 px/pt, the page comes at 200 dpi (200/72 px/pt).
    const sheet = await loadPdfSheetNode(await scanInPdf([300, 400], [300, 400], { x: 0, y: 0, width: 300, height: 400 }, (ctx) => ctx.fillRect(50, 190, 200, 20)));
    const image = await sheet.render(4);
    expect(image.scale).toBeCloseTo(200 / 72, 9);
    expect(image.width).toBe(Math.ceil(300 * (200 / 72)));
    await sheet.close();
  });
});

/** A PDF page of `page` pt holding one PNG picture of `size` pixels (white, drawn on in black) placed at `place`. */
async function scanInPdf(size: [number, number], page: [number, number], place: { x: number; y: number; width: number; height: number }, draw: (ctx: SKRSContext2D) => void): Promise<Uint8Array> {
  const canvas = createCanvas(size[0], size[1]);
  const ctx = canvas.getContext('2d');
  ctx.fillStyle = '#fff';
  ctx.fillRect(0, 0, size[0], size[1]);
  ctx.fillStyle = ctx.strokeStyle = '#000';
  draw(ctx);
  const doc = await PDFDocument.create();
  doc.addPage(page).drawImage(await doc.embedPng(await canvas.encode('png')), place);
  return doc.save();
}

describe('refusing unusable PDFs with one clear sentence', () => {
  it('refuses a file over the size limit before parsing it', async () => {
    const bytes = await drawPdf(100, 100, () => undefined);
    await expect(loadPdfSheetNode(bytes, { limits: { maxBytes: 200, maxPixels: 40e6 } })).rejects.toThrow(/over the 0 MB limit|over the .* limit/);
    await expect(loadPdfSheetNode(bytes, { limits: { maxBytes: 200, maxPixels: 40e6 } })).rejects.toBeInstanceOf(SheetError);
  });

  it('refuses a rendering over the pixel limit', async () => {
    const bytes = await drawPdf(612, 792, () => undefined);
    const sheet = await loadPdfSheetNode(bytes);
    await expect(sheet.render(12)).rejects.toThrow(/megapixel limit/); // 7344 × 9504 = 69.8 MP
    await sheet.close();
  });

  it('calls bytes without a PDF header not a PDF', async () => {
    await expect(loadPdfSheetNode(new TextEncoder().encode('hello, this is text'))).rejects.toThrow(/is not a PDF/);
  });

  it('reports a damaged PDF as damaged instead of crashing', async () => {
    const good = await drawPdf(100, 100, (d) => d.stroke('M 0 0 L 10 10'));
    const damaged = new Uint8Array(good.length);
    damaged.set(good.subarray(0, 20));
    for (let i = 20; i < damaged.length; i++) damaged[i] = (i * 7919) % 251;
    const error = await loadPdfSheetNode(damaged, { name: 'sheet.pdf' }).then(
      () => null,
      (e: unknown) => e,
    );
    expect(error).toBeInstanceOf(SheetError);
    expect((error as Error).message).toMatch(/^The PDF "sheet.pdf" (is damaged|could not be read)/);
    expect((error as Error).message.split('. ').length).toBe(1);
  });

  it('reports a password-protected PDF as encrypted', async () => {
    await expect(loadPdfSheetNode(encryptedPdf())).rejects.toThrow(/encrypted with a password/);
  });

  it('names the page count when the page does not exist', async () => {
    const bytes = await drawPdf(100, 100, () => undefined);
    await expect(loadPdfSheetNode(bytes, { page: 3 })).rejects.toThrow(/has 1 page; page 3 does not exist/);
  });
});
