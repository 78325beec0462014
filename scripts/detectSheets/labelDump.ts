/**
 * The head-curve labels of bed scans: what each sheet prints (the plan's labels, at their place
 * in level pixels), the words the detector found and read there, and how the curves were named.
 * With CROPS=DIR it writes, per printed label, a zoomed crop of the level picture (ink dark on
 * white, the found word boxes outlined grey) as DIR/SEED-LABEL.png; with READER_SHOTS=DIR (an
 * existing folder) every picture given to the reader as words, DIR/NNN.png, and what it read.
 * Iso labels' readings are listed too. A tool for reading the label reader, not a score.
 *
 *   [CROPS=/tmp/label-crops] [READER_SHOTS=/tmp/shots] [DETECT_KIND=photo] npx tsx scripts/detectSheets/labelDump.ts 2 3 36
 */
import { mkdirSync } from 'node:fs';
import sharp from 'sharp';
import { loadImageSheetNode } from '../../src/digitize/loaders/imageNode.ts';
import { closeTextReaderNode, textReaderNode } from '../../src/digitize/loaders/ocrNode.ts';
import { findRasterPanels } from '../../src/digitize/detect/rasterPanels.ts';
import { findRasterCurves } from '../../src/digitize/detect/rasterCurves.ts';
import { applyH } from '../randomSheets/camera.ts';
import { sheetGeometry } from '../randomSheets/randomSheet.ts';
import { scanFor } from './scanBed.ts';

const seeds = process.argv.slice(2).map(Number);
/** DETECT_KIND=photo reads the bed's hand-held photos of the same sheets. */
const kind = process.env.DETECT_KIND === 'photo' ? 'photo' : 'scan';
const cropDir = process.env.CROPS;
if (cropDir) mkdirSync(cropDir, { recursive: true });
const base = textReaderNode();
let shots = 0;
const reader: typeof base = {
  async read(image, what) {
    const words = await base.read(image, what);
    if (process.env.READER_SHOTS && what === 'words') {
      await sharp(Buffer.from(image.grey), { raw: { width: image.width, height: image.height, channels: 1 } }).png().toFile(`${process.env.READER_SHOTS}/${String(shots++).padStart(3, '0')}.png`);
      process.stdout.write(`  shot ${shots - 1}: ${image.width}x${image.height} → ${JSON.stringify(words.map((w) => w.text))}\n`);
    }
    return words;
  },
};
for (const seed of seeds) {
  const { plan, shot } = sheetGeometry(seed, kind);
  const { jpeg } = await scanFor(seed, kind);
  const sheet = await loadImageSheetNode(jpeg, { name: `${seed}.jpg` });
  const image = await sheet.render(1);
  const found = await findRasterPanels(image, reader);
  const page = found.page!;
  const fs = 0.9 * plan.fontPx;
  process.stdout.write(`seed ${seed}: ${plan.dpi} dpi, text ${fs.toFixed(1)} px on the plan\n`);
  const boxes: [number, number, number, number][] = [];
  const notes: string[] = [];
  const t0 = performance.now();
  const curves = await findRasterCurves(image, found, reader, {
    note: (l) => {
      notes.push(l);
      const m = /word at \[(\d+), (\d+), (\d+), (\d+)\]/.exec(l);
      if (m) boxes.push([Number(m[1]), Number(m[2]), Number(m[3]), Number(m[4])]);
    },
  });
  const ms = performance.now() - t0;
  for (const line of plan.lines.filter((l) => l.quantity === 'head' && l.label)) {
    const label = line.label!;
    const k = Math.round(label.at * (line.points.length - 1));
    const p = label.mode === 'on' ? (line.points[k] as [number, number]) : (line.points[line.points.length - 1] as [number, number]);
    const w = 0.55 * fs * label.text.length;
    // The label's box on the plan: centred on the line ("on"), or up and right of the end ("beside").
    const [x0, y0, x1, y1] = label.mode === 'on' ? [p[0] - w / 2, p[1] - 0.6 * fs, p[0] + w / 2, p[1] + 0.6 * fs] : [p[0] + 0.3 * fs, p[1] - 1.1 * fs, p[0] + 0.3 * fs + w, p[1] - 0.1 * fs];
    const corners = [[x0, y0], [x1, y0], [x0, y1], [x1, y1]].map(([x, y]) => page.level.toLevel(...applyH(shot.h, [x!, y!])));
    const l = Math.min(...corners.map((c) => c[0])), r = Math.max(...corners.map((c) => c[0]));
    const t = Math.min(...corners.map((c) => c[1])), b = Math.max(...corners.map((c) => c[1]));
    process.stdout.write(`  ${line.id} ${label.mode} "${label.text}" (${line.style.colour}, w ${line.style.width.toFixed(1)}) at level [${l.toFixed(0)}, ${t.toFixed(0)}, ${r.toFixed(0)}, ${b.toFixed(0)}]\n`);
    if (!cropDir) continue;
    const pad = Math.round(fs);
    const cl = Math.max(0, Math.floor(l - pad)), ct = Math.max(0, Math.floor(t - pad));
    const cw = Math.min(page.map.width - cl, Math.ceil(r - l + 2 * pad)), ch = Math.min(page.map.height - ct, Math.ceil(b - t + 2 * pad));
    const zoom = 6;
    const out = new Uint8Array(cw * zoom * ch * zoom * 3);
    for (let y = 0; y < ch * zoom; y++) {
      for (let x = 0; x < cw * zoom; x++) {
        const u = cl + Math.floor(x / zoom), v = ct + Math.floor(y / zoom);
        const g = 255 - (page.map.ink[v * page.map.width + u] as number);
        const onBox = boxes.some(([bl, bt, br, bb]) => ((u === bl || u === br) && v >= bt && v <= bb) || ((v === bt || v === bb) && u >= bl && u <= br));
        const i = 3 * (y * cw * zoom + x);
        out[i] = onBox ? 255 : g;
        out[i + 1] = onBox ? 0 : g;
        out[i + 2] = onBox ? 0 : g;
      }
    }
    await sharp(out, { raw: { width: cw * zoom, height: ch * zoom, channels: 3 } }).png().toFile(`${cropDir}/${seed}-${line.id}.png`);
  }
  for (const n of notes) if (/word at|nearest head|one label|head curve|iso label/.test(n)) process.stdout.write(`  | ${n}\n`);
  for (const c of curves.curves.filter((k) => k.quantity === 'head' && k.kind === 'curve')) process.stdout.write(`  curve head ${c.value} (${c.named}) conf ${c.confidence.toFixed(2)}\n`);
  for (const q of curves.questions) if (/head curves/.test(q)) process.stdout.write(`  ? ${q.slice(0, 200)}\n`);
  process.stdout.write(`  curves in ${ms.toFixed(0)} ms\n`);
}
await closeTextReaderNode();
