/**
 * Pixel colours of a random-bed sheet around a point, to see what a guide samples there:
 * `npx tsx scripts/randomSheets/pixelDump.ts 10 223 810 [radius]` prints each pixel as hex, and the
 * paper estimate around the point.
 */
import { RENDER_VERSION } from './svg.ts';
import { existsSync, readFileSync } from 'node:fs';
import { join } from 'node:path';
import { decode } from './camera.ts';
import { estimatePaper } from '../../src/digitize/colour.ts';

const [seedArg, xArg, yArg, rArg = '7'] = process.argv.slice(2);
const seed = Number(seedArg);
const kind = seed % 3 === 2 ? 'photo' : 'scan';
const base = join(import.meta.dirname, '..', '..', 'artifacts', 'random-sheets', RENDER_VERSION, `${seed}-${kind}`);
if (!existsSync(`${base}.jpg`)) throw new Error('sheet not in the cache');
const decoded = await decode(readFileSync(`${base}.jpg`));
const image = { width: decoded.width, height: decoded.height, data: decoded.data, scale: 1 };
const cx = Math.floor(Number(xArg));
const cy = Math.floor(Number(yArg));
const r = Number(rArg);
console.log('paper', estimatePaper(image, cx, cy, 20).map((v) => v.toFixed(0)).join(','));
for (let y = cy - r; y <= cy + r; y++) {
  const row: string[] = [];
  for (let x = cx - r; x <= cx + r; x++) {
    const i = (y * image.width + x) * 4;
    row.push([0, 1, 2].map((k) => (image.data[i + k] as number).toString(16).padStart(2, '0')).join(''));
  }
  console.log(String(y).padStart(5), row.join(' '));
}
