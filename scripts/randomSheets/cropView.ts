/**
 * A zoomed crop of a random-bed sheet around a point, to look at what a guide sits on:
 * `npx tsx scripts/randomSheets/cropView.ts 10 223 810 /tmp/crop.png [radius] [zoom]`; the point is marked blue.
 */
import { RENDER_VERSION } from './svg.ts';
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import sharp from 'sharp';
import { decode } from './camera.ts';

const [seedArg, xArg, yArg, out = '/tmp/crop.png', rArg = '40', zArg = '8'] = process.argv.slice(2);
const seed = Number(seedArg);
const kind = seed % 3 === 2 ? 'photo' : 'scan';
const decoded = await decode(readFileSync(join(import.meta.dirname, '..', '..', 'artifacts', 'random-sheets', RENDER_VERSION, `${seed}-${kind}.jpg`)));
const cx = Math.floor(Number(xArg));
const cy = Math.floor(Number(yArg));
const r = Number(rArg);
const zoom = Number(zArg);
const w = (2 * r + 1) * zoom;
const buf = Buffer.alloc(w * w * 4);
for (let y = 0; y < w; y++) {
  for (let x = 0; x < w; x++) {
    const sx = cx - r + Math.floor(x / zoom);
    const sy = cy - r + Math.floor(y / zoom);
    const i = (sy * decoded.width + sx) * 4;
    const o = (y * w + x) * 4;
    const mark = sx === cx && sy === cy && (x % zoom === 0 || y % zoom === 0);
    buf[o] = mark ? 0 : (decoded.data[i] as number);
    buf[o + 1] = mark ? 0 : (decoded.data[i + 1] as number);
    buf[o + 2] = mark ? 255 : (decoded.data[i + 2] as number);
    buf[o + 3] = 255;
  }
}
await sharp(buf, { raw: { width: w, height: w, channels: 4 } }).png().toFile(out);
