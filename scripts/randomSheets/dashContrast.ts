/**
 * How much of a drawn line shows on a random-bed sheet: for each dashed or dotted curve of a
 * bench dump (all of them, or only the wrong ones), the darkening of the paper along its true
 * course. Tells a broken line that is lost by the follower from one that the scan has all but
 * wiped out (pale dots blurred into tinted paper), which no following can recover.
 *
 *   RANDOM_SHEETS=40 RANDOM_SEED=1 RANDOM_DUMP=/tmp/d.json npx tsx bench/run.ts randomSheets
 *   npx tsx scripts/randomSheets/dashContrast.ts /tmp/d.json [all]
 *
 * Per curve: `ink` is the median, over the true course, of the darkest pixel within the line's
 * half width and a pixel, as a share of the paper's lightness below the paper (0 = nothing
 * drawn, 1 = black on white); `shown` is the share of the course where that darkening is at
 * least a tenth of the paper's lightness.
 */
import { readFileSync } from 'node:fs';
import { applyH } from './camera.ts';
import { bedSheet } from './bedReplay.ts';

interface Row {
  seed: number;
  id: string;
  quantity: string;
  kind: string;
  error: number | null;
  wrong: boolean;
  flags: string[];
  style: { dash: string; width: number; dpi: number; mono: boolean };
}

const [dumpPath, which] = process.argv.slice(2);
if (!dumpPath) {
  console.error('Give the path of a bench dump (RANDOM_DUMP) as the first argument.');
  process.exit(2);
}
const rows = (JSON.parse(readFileSync(dumpPath, 'utf8')) as { rows: Row[] }).rows.filter((r) => r.style.dash !== 'solid' && (which === 'all' || r.wrong));
const seeds = [...new Set(rows.map((r) => r.seed))].sort((a, b) => a - b);
const lum = (d: Uint8Array | Uint8ClampedArray, i: number) => 0.299 * (d[i] as number) + 0.587 * (d[i + 1] as number) + 0.114 * (d[i + 2] as number);

for (const seed of seeds) {
  const { plan, shot, raster } = await bedSheet(seed);
  const { data, width, height } = raster;
  for (const row of rows.filter((r) => r.seed === seed)) {
    const line = plan.lines.find((l) => l.id === row.id);
    if (!line) continue;
    const truth = line.points.map((p) => applyH(shot.h, p));
    const r = Math.max(1, 0.5 * row.style.width + 1);
    const darkest: number[] = [];
    const paper: number[] = [];
    for (const [x, y] of truth) {
      let low = 255;
      for (let dy = -Math.ceil(r); dy <= Math.ceil(r); dy++) {
        for (let dx = -Math.ceil(r); dx <= Math.ceil(r); dx++) {
          if (Math.hypot(dx, dy) > r) continue;
          const px = Math.floor(x + dx);
          const py = Math.floor(y + dy);
          if (px < 0 || py < 0 || px >= width || py >= height) continue;
          low = Math.min(low, lum(data, (py * width + px) * 4));
        }
      }
      darkest.push(low);
      // The paper: the lightest of a ring well clear of the line.
      let high = 0;
      for (let a = 0; a < 16; a++) {
        const px = Math.floor(x + 12 * Math.cos((a * Math.PI) / 8));
        const py = Math.floor(y + 12 * Math.sin((a * Math.PI) / 8));
        if (px < 0 || py < 0 || px >= width || py >= height) continue;
        high = Math.max(high, lum(data, (py * width + px) * 4));
      }
      paper.push(high);
    }
    const median = (v: number[]) => [...v].sort((a, b) => a - b)[Math.floor(v.length / 2)] as number;
    const p = median(paper);
    const depth = darkest.map((d, i) => ((paper[i] as number) - d) / Math.max(1, paper[i] as number));
    const ink = median(depth);
    const shown = depth.filter((d) => d >= 0.1).length / depth.length;
    const err = row.error === null ? 'missing' : row.error.toFixed(2);
    console.log(`${String(seed).padStart(3)} ${row.kind.padEnd(5)} ${row.id.padEnd(22)} ${row.style.dash.padEnd(6)} w${row.style.width.toFixed(2)} ${row.style.dpi}dpi ink ${ink.toFixed(2)} shown ${(100 * shown).toFixed(0).padStart(3)} % paper ${p.toFixed(0)} err ${err} ${row.wrong ? 'WRONG' : 'ok'} ${row.flags.slice(0, 2).join(',')}`);
  }
}
