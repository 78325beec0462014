/**
 * Replay time of the random bed's take-offs alone (no scoring), per sheet, as CPU time of this
 * process (steadier than the wall clock on a busy machine): for comparing the tracer's speed
 * between two versions, run it alternately with each.
 *
 *   npx tsx scripts/randomSheets/replayTime.ts 1 20     # seeds 1 to 20
 */
import { createHash } from 'node:crypto';
import { sheetFor } from '../../bench/randomSheets.bench.ts';
import { imageSheet } from '../../src/digitize/loaders/imageSheet.ts';
import { replayTakeoff } from '../../src/digitize/takeoff.ts';
import { parseTakeoff } from '../../src/model/takeoff.ts';
import { decode } from './camera.ts';

const from = Number(process.argv[2] ?? 1);
const to = Number(process.argv[3] ?? 20);
const times: number[] = [];
for (let seed = from; seed <= to; seed++) {
  const kind = seed % 3 === 2 ? 'photo' : 'scan';
  const { jpeg, meta } = await sheetFor(seed, kind);
  const decoded = await decode(jpeg);
  const raster = { width: decoded.width, height: decoded.height, data: decoded.data, scale: 1 };
  const sheet = imageSheet(raster, createHash('sha256').update(jpeg).digest('hex'), () => raster);
  const c0 = process.cpuUsage();
  try {
    await replayTakeoff(parseTakeoff(meta.takeoff), sheet);
  } catch {
    // A refused take-off counts with the time it took.
  }
  const c = process.cpuUsage(c0);
  times.push((c.user + c.system) / 1000);
}
const sorted = [...times].sort((a, b) => a - b);
process.stdout.write(`sheets ${times.length}: CPU total ${times.reduce((a, b) => a + b, 0).toFixed(0)} ms, p50 ${(sorted[Math.floor(sorted.length / 2)] as number).toFixed(0)} ms\n`);
