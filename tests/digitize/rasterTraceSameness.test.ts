/**
 * The raster tracer's results held fixed, to the last bit: every traced point (full double
 * precision), the line measured, the stretches lost, the doubts and the pixels read, of every
 * trace of two generated scans of INVENTED sheets (a black one with iso-lines, a coloured one
 * with panels), each trace followed alone and with the other traces' guides. A change meant to
 * make tracing faster must leave these hashes as they are; a change meant to alter what the
 * tracer finds changes them on purpose, and the new hashes are written here with the reason.
 */
import { createHash } from 'node:crypto';
import { describe, expect, it } from 'vitest';
import { loadImageRasterNode } from '../../src/digitize/loaders/imageNode.ts';
import { sheetPoint } from '../../src/digitize/points.ts';
import { traceRaster, type RasterTraceResult } from '../../src/digitize/rasterTrace.ts';
import { siblingGuides } from '../../src/digitize/vectorChoice.ts';
import { makeSheet, type Variant } from '../../scripts/sheets/makeSheet.ts';

/** The first 16 hex digits of a SHA-256 over the points' doubles and the rest of the result as JSON. */
function fingerprint(result: RasterTraceResult): string {
  const doubles = new Float64Array(result.points.length * 2);
  result.points.forEach((p, i) => {
    doubles[2 * i] = p[0];
    doubles[2 * i + 1] = p[1];
  });
  const hash = createHash('sha256');
  hash.update(Buffer.from(doubles.buffer));
  hash.update(JSON.stringify({ line: result.line, lost: result.lost, doubts: result.doubts, reads: result.pixelsRead }));
  return hash.digest('hex').slice(0, 16);
}

async function fingerprints(variant: Variant): Promise<Record<string, string>> {
  const made = await makeSheet(variant);
  const image = await loadImageRasterNode(made.sheetBytes);
  const siblings = siblingGuides(made.takeoff.traces);
  const out: Record<string, string> = {};
  made.takeoff.traces.forEach((t, k) => {
    const guides = (t.guides ?? []).map(([x, y]) => sheetPoint(x, y));
    out[`${t.id} alone`] = fingerprint(traceRaster(image, guides));
    out[`${t.id} among`] = fingerprint(traceRaster(image, guides, { siblings: siblings.filter((_, j) => j !== k) }));
  });
  return out;
}

describe('raster tracer results held fixed', () => {
  it('traces a black scan with iso-lines to the same points, bit for bit', async () => {
    const got = await fingerprints({
      spec: { name: 'same-a', system: 'us', layout: 'iso', ink: 'black', labelsOnLines: true, seed: 41 },
      scan: { dpi: 200, rotationDeg: 1.2, noise: 8, blur: 0.8, jpegQuality: 80, seed: 41 },
    });
    expect(got).toEqual(BLACK_ISO);
  });

  it('traces a coloured scan with panels to the same points, bit for bit', async () => {
    const got = await fingerprints({
      spec: { name: 'same-b', system: 'si', layout: 'panels', ink: 'colour', labelsOnLines: true, seed: 42 },
      scan: { dpi: 200, rotationDeg: -1.5, noise: 8, blur: 0.8, jpegQuality: 80, seed: 42 },
    });
    expect(got).toEqual(COLOUR_PANELS);
  });
});

/** Taken at the tracer as it stood before its speed-ups (commit 683b2f4) and unchanged by them. */
const BLACK_ISO: Record<string, string> = {
  'head-13 alone': '72e058f2799631f1',
  'head-13 among': '72e058f2799631f1',
  'power-13 alone': '07b1b3d36c585796',
  'power-13 among': '07b1b3d36c585796',
  'head-12 alone': 'c4fea00a394f4dc9',
  'head-12 among': 'c4fea00a394f4dc9',
  'power-12 alone': '9b897399219b0972',
  'power-12 among': '9b897399219b0972',
  'head-11 alone': '1192940d5c938138',
  'head-11 among': '1192940d5c938138',
  'power-11 alone': '922050fce0fa7ca1',
  'power-11 among': '922050fce0fa7ca1',
  'head-10 alone': '11a5e40b603ce658',
  'head-10 among': '11a5e40b603ce658',
  'power-10 alone': '7e195ef6598006bc',
  'power-10 among': '7e195ef6598006bc',
  'npshr-13 alone': 'a55a6313285f78eb',
  'npshr-13 among': 'a55a6313285f78eb',
  'iso-70-left alone': '09d6ecbba2a07a7b',
  'iso-70-left among': '09d6ecbba2a07a7b',
  'iso-70-right alone': 'de2441a934791b55',
  'iso-70-right among': 'de2441a934791b55',
  'iso-75-left alone': '8a8d60e0d9e2ffb9',
  'iso-75-left among': '8a8d60e0d9e2ffb9',
  'iso-75-right alone': '28fb6ef34cb938b6',
  'iso-75-right among': '28fb6ef34cb938b6',
  'iso-80-left alone': '465de770b9cf36aa',
  'iso-80-left among': '465de770b9cf36aa',
  'iso-80-right alone': '96c3a0dfdece2cfe',
  'iso-80-right among': '96c3a0dfdece2cfe',
  'iso-82 alone': '24ffa10e7574a157',
  'iso-82 among': '24ffa10e7574a157',
};

const COLOUR_PANELS: Record<string, string> = {
  'head-330 alone': 'e3ace03c096323e9',
  'head-330 among': 'e3ace03c096323e9',
  'power-330 alone': '9380765f053e0397',
  'power-330 among': '9380765f053e0397',
  // A bunch-end doubt since an extension that ends inside a bunch is doubted too (it may end on a neighbour).
  'efficiency-330 alone': '82ddd3ead1305f00',
  'efficiency-330 among': '82ddd3ead1305f00',
  'head-310 alone': '030d0df4906b6245',
  'head-310 among': '030d0df4906b6245',
  'power-310 alone': 'a04d72cf6b17e4bb',
  'power-310 among': 'a04d72cf6b17e4bb',
  'efficiency-310 alone': '7981ae7e07eed96f',
  'efficiency-310 among': '9417ebf69be48bef',
  'head-290 alone': 'a0d046d97b88e5de',
  'head-290 among': 'a0d046d97b88e5de',
  'power-290 alone': 'f45b6507ec64f928',
  'power-290 among': 'f45b6507ec64f928',
  'efficiency-290 alone': '76b2872cf5443930',
  'efficiency-290 among': '7d3088fd501341e1',
  'head-270 alone': '4abea7d86b3a5538',
  'head-270 among': '4abea7d86b3a5538',
  'power-270 alone': '9ca38541ed71a42b',
  'power-270 among': '9ca38541ed71a42b',
  'efficiency-270 alone': 'e23cca2d31905c1b',
  'efficiency-270 among': 'fa245f957437b890',
  'npshr-330 alone': 'cf4c65da1b784483',
  'npshr-330 among': 'cf4c65da1b784483',
};
