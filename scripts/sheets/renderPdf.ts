/**
 * Writes a drawing as a one-page vector PDF with pdf-lib. Lines become stroked paths (dense
 * polylines), text is real text in Helvetica, so the PDF loader finds both.
 */
import { LineCapStyle, PDFDocument, rgb, StandardFonts } from 'pdf-lib';
import type { Drawing } from './drawing.ts';

/** pdf-lib's standard fonts speak WinAnsi; anything outside it becomes a plain stand-in. */
function winAnsi(text: string): string {
  return text.replace(/[^\x20-\x7e\u00a0-\u00ff\u2014]/g, '?');
}

export async function drawingToPdf(drawing: Drawing, title: string): Promise<Uint8Array> {
  const doc = await PDFDocument.create();
  doc.setTitle(title);
  doc.setSubject('Invented sample sheet — not a real product');
  doc.setProducer('Pumpscribe sample generator');
  doc.setCreationDate(new Date(Date.UTC(2024, 0, 1)));
  doc.setModificationDate(new Date(Date.UTC(2024, 0, 1)));
  const page = doc.addPage([drawing.width, drawing.height]);
  const regular = await doc.embedFont(StandardFonts.Helvetica);
  const bold = await doc.embedFont(StandardFonts.HelveticaBold);
  const h = drawing.height;
  for (const item of drawing.items) {
    if (item.kind === 'polyline') {
      const d = item.points.map((p, i) => `${i === 0 ? 'M' : 'L'} ${p[0].toFixed(3)} ${p[1].toFixed(3)}`).join(' ');
      page.drawSvgPath(d, { x: 0, y: h, borderColor: rgb(...item.ink.colour), borderWidth: item.ink.width, borderLineCap: LineCapStyle.Round });
    } else if (item.kind === 'rect') {
      page.drawRectangle({
        x: item.x,
        y: h - item.y - item.h,
        width: item.w,
        height: item.h,
        ...(item.fill ? { color: rgb(...item.fill) } : {}),
        ...(item.stroke ? { borderColor: rgb(...item.stroke.colour), borderWidth: item.stroke.width } : { borderWidth: 0 }),
      });
    } else {
      const font = item.bold ? bold : regular;
      const text = winAnsi(item.text);
      const w = font.widthOfTextAtSize(text, item.size);
      const x = item.align === 'left' ? item.x : item.align === 'center' ? item.x - w / 2 : item.x - w;
      page.drawText(text, { x, y: h - item.y, size: item.size, font, color: rgb(...item.colour) });
    }
  }
  return doc.save({ useObjectStreams: false });
}
