/**
 * One generated sample: the sheet file (vector PDF or scan), its take-off file with anchors at
 * the exact positions of known grid values and guides on every line, and its exact truth.
 */
import { mkdirSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { PDFDocument } from 'pdf-lib';
import { Takeoff, type TakeoffInput } from '../../src/model/takeoff.ts';
import { layoutSheet, toSheetXY, type Layout, type SheetSpec } from './layout.ts';
import { drawingToPdf } from './renderPdf.ts';
import { renderScan, scanGeometry, scanMatrix, type ScanSpec } from './renderRaster.ts';
import { buildTruth, type Truth } from './truth.ts';

export interface Variant {
  spec: SheetSpec;
  /** Absent for a vector PDF. */
  scan?: ScanSpec;
  /** 'pdf' puts the scan into a one-page PDF (a raster PDF, as office scanners write them). */
  container?: 'image' | 'pdf';
}

export interface GeneratedSheet {
  layout: Layout;
  sheetFile: string;
  sheetBytes: Uint8Array;
  takeoff: TakeoffInput;
  truth: Truth;
}

const round = (v: number, digits = 3) => Math.round(v * 10 ** digits) / 10 ** digits;

function takeoffFor(layout: Layout, sheetFile: string, map: (p: readonly [number, number]) => [number, number], digits: number): TakeoffInput {
  const f = layout.family;
  const at = (p: readonly [number, number]): [number, number] => {
    const m = map(p);
    return [round(m[0], digits), round(m[1], digits)];
  };
  const takeoff: TakeoffInput = {
    format: 'pumpscribe.takeoff',
    version: 1,
    sheet: sheetFile,
    page: 1,
    pump: { name: f.name, speed_rpm: f.speed_rpm, specific_gravity: f.specific_gravity },
    units: { ...f.units },
    panels: layout.panels.map((p) => {
      const corners: Array<[number, number]> = [
        [p.x.min, p.y.min],
        [p.x.max, p.y.min],
        [p.x.min, p.y.max],
        [p.x.max, p.y.max],
      ];
      return {
        id: p.id,
        anchors: corners.map(([x, y]) => ({ at: at(toSheetXY(p, x, y)), x, y })),
      };
    }),
    traces: layout.traces.map((t) => ({
      id: t.id,
      panel: t.panel,
      quantity: t.quantity,
      ...(t.iso !== undefined ? { iso: t.iso } : { diameter: t.diameter }),
      guides: t.guides.map(at),
    })),
    notes: ['Invented sample sheet for testing; not a real product.'],
  };
  Takeoff.parse(takeoff);
  return takeoff;
}

/** A one-page PDF whose page is the scanned picture, edge to edge. */
async function scanToPdf(bytes: Uint8Array, format: 'jpeg' | 'png', width: number, height: number): Promise<Uint8Array> {
  const doc = await PDFDocument.create();
  doc.setTitle('Invented demo pump \u2014 not a real product (scan)');
  doc.setProducer('Pumpscribe sample generator');
  doc.setCreationDate(new Date(Date.UTC(2024, 0, 1)));
  doc.setModificationDate(new Date(Date.UTC(2024, 0, 1)));
  const page = doc.addPage([width, height]);
  const picture = format === 'jpeg' ? await doc.embedJpg(bytes) : await doc.embedPng(bytes);
  page.drawImage(picture, { x: 0, y: 0, width, height });
  return doc.save({ useObjectStreams: false });
}

/** Generates one sample in memory. */
export async function makeSheet(variant: Variant): Promise<GeneratedSheet> {
  const layout = layoutSheet(variant.spec);
  const name = variant.spec.name;
  if (!variant.scan) {
    const sheetFile = `${name}.pdf`;
    const sheetBytes = await drawingToPdf(layout.drawing, 'Invented demo pump \u2014 not a real product');
    const identity: Truth['matrix'] = [1, 0, 0, 1, 0, 0];
    return {
      layout,
      sheetFile,
      sheetBytes,
      takeoff: takeoffFor(layout, sheetFile, (p) => [p[0], p[1]], 3),
      truth: buildTruth(layout, sheetFile, 'vector-pdf', identity, null),
    };
  }
  const scan = renderScan(layout.drawing, variant.scan);
  const geometry = scanGeometry(layout.drawing, variant.scan);
  if (variant.container === 'pdf') {
    // The scan fills a page of the drawing's size: sheet units are points again, pixel / scale.
    const sheetFile = `${name}.pdf`;
    const [a, b, c, d, e, f] = scanMatrix(geometry);
    const k = 1 / geometry.scale;
    const matrix: Truth['matrix'] = [a * k, b * k, c * k, d * k, e * k, f * k];
    const map = (p: readonly [number, number]): [number, number] => [matrix[0] * p[0] + matrix[2] * p[1] + matrix[4], matrix[1] * p[0] + matrix[3] * p[1] + matrix[5]];
    return {
      layout,
      sheetFile,
      sheetBytes: await scanToPdf(scan.bytes, scan.format, geometry.width / geometry.scale, geometry.height / geometry.scale),
      takeoff: takeoffFor(layout, sheetFile, map, 3),
      truth: buildTruth(layout, sheetFile, 'raster-pdf', matrix, variant.scan),
    };
  }
  const sheetFile = `${name}.${scan.format === 'jpeg' ? 'jpg' : 'png'}`;
  const matrix = scanMatrix(geometry);
  const map = (p: readonly [number, number]): [number, number] => [matrix[0] * p[0] + matrix[2] * p[1] + matrix[4], matrix[1] * p[0] + matrix[3] * p[1] + matrix[5]];
  return {
    layout,
    sheetFile,
    sheetBytes: scan.bytes,
    takeoff: takeoffFor(layout, sheetFile, map, 2),
    truth: buildTruth(layout, sheetFile, 'image', matrix, variant.scan),
  };
}

/** Writes sheet, `<name>.takeoff.json` and `<name>.truth.json` into `dir`. */
export async function writeSheet(dir: string, variant: Variant): Promise<GeneratedSheet> {
  const made = await makeSheet(variant);
  mkdirSync(dir, { recursive: true });
  writeFileSync(join(dir, made.sheetFile), made.sheetBytes);
  writeFileSync(join(dir, `${variant.spec.name}.takeoff.json`), `${JSON.stringify(made.takeoff, null, 1)}\n`);
  writeFileSync(join(dir, `${variant.spec.name}.truth.json`), `${JSON.stringify(made.truth, null, 1)}\n`);
  return made;
}
