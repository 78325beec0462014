/**
 * One sheet of the random bed, loaded and replayed as the bench does it: the diagnostic scripts
 * beside this file share it instead of each loading the sheet their own way.
 */
import { createHash } from 'node:crypto';
import { sheetFor } from '../../bench/randomSheets.bench.ts';
import { imageSheet } from '../../src/digitize/loaders/imageSheet.ts';
import { replayTakeoff } from '../../src/digitize/takeoff.ts';
import { parseTakeoff, type TakeoffInput } from '../../src/model/takeoff.ts';
import { decode } from './camera.ts';
import { sheetGeometry, withCarefulGuides } from './randomSheet.ts';

/** Every third sheet of the bed is a photo, the others are scans. */
export const bedKind = (seed: number): 'scan' | 'photo' => (seed % 3 === 2 ? 'photo' : 'scan');

export async function bedSheet(seed: number) {
  const kind = bedKind(seed);
  const { jpeg, meta } = await sheetFor(seed, kind);
  const { plan, shot } = sheetGeometry(seed, kind);
  const decoded = await decode(jpeg);
  const raster = { width: decoded.width, height: decoded.height, data: decoded.data, scale: 1 };
  const sheet = imageSheet(raster, createHash('sha256').update(jpeg).digest('hex'), () => raster);
  return { kind, jpeg, meta, plan, shot, raster, sheet, takeoff: parseTakeoff(process.env.RANDOM_GUIDES === 'careful' ? withCarefulGuides(meta.takeoff as TakeoffInput, seed, kind) : meta.takeoff) };
}

/** The sheet and its replay. */
export async function bedReplay(seed: number) {
  const bed = await bedSheet(seed);
  return { ...bed, replay: await replayTakeoff(bed.takeoff, bed.sheet) };
}
