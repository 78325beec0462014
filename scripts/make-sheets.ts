/**
 * Writes INVENTED sample performance sheets with exact truth and a take-off file each.
 *
 *   npx tsx scripts/make-sheets.ts                       the committed samples, into samples/sheets
 *   npx tsx scripts/make-sheets.ts --set all --out DIR   every layout, ink, unit system and fault, vector and scan
 *   npx tsx scripts/make-sheets.ts --out DIR --name my-sheet --system si --layout panels --ink black \
 *       [--labels-on-lines] [--fault announced-diameter|power-high] \
 *       [--scan [--pdf] --dpi 300 --rotate 1 --noise 6 --blur 0.7 --quality 85] [--seed 3]
 *
 * Each sheet gets <name>.pdf (or .jpg for a scan; .pdf again for a scan put into a PDF),
 * <name>.takeoff.json and <name>.truth.json.
 */
import { Command, InvalidArgumentError } from 'commander';
import { writeSheet, type Variant } from './sheets/makeSheet.ts';
import { ALL_VARIANTS, SAMPLE_VARIANTS } from './sheets/variants.ts';

function number(name: string, min: number, max: number) {
  return (text: string) => {
    const v = Number(text);
    if (!Number.isFinite(v) || v < min || v > max) throw new InvalidArgumentError(`${name} must be a number from ${min} to ${max}.`);
    return v;
  };
}

function oneOf<T extends string>(name: string, values: readonly T[]) {
  return (text: string) => {
    if (!values.includes(text as T)) throw new InvalidArgumentError(`${name} must be one of ${values.join(', ')}.`);
    return text as T;
  };
}

const program = new Command('make-sheets')
  .description('Write invented sample performance sheets with exact truth and take-off files.')
  .option('--out <dir>', 'folder to write into', 'samples/sheets')
  .option('--set <set>', 'a ready set: "samples" (the committed ones) or "all"', oneOf('set', ['samples', 'all'] as const))
  .option('--name <name>', 'file stem of a single sheet')
  .option('--system <system>', 'unit system: us or si', oneOf('system', ['us', 'si'] as const), 'us')
  .option('--layout <layout>', 'iso (efficiency as iso-lines over the head curves) or panels (efficiency in its own panel)', oneOf('layout', ['iso', 'panels'] as const), 'iso')
  .option('--ink <ink>', 'colour or black', oneOf('ink', ['colour', 'black'] as const), 'colour')
  .option('--labels-on-lines', 'put the power curves\u2019 diameter labels on the lines, interrupting them')
  .option('--fault <fault>', 'announced-diameter (the third diameter labelled about 5 % large) or power-high (one power curve 9 % high)', oneOf('fault', ['announced-diameter', 'power-high'] as const))
  .option('--scan', 'write a scan (JPEG) instead of a vector PDF')
  .option('--pdf', 'with --scan: put the scan into a one-page PDF (a raster PDF)')
  .option('--dpi <dpi>', 'scan resolution', number('dpi', 50, 600), 200)
  .option('--rotate <degrees>', 'scan rotation', number('rotate', -10, 10), 1)
  .option('--noise <levels>', 'scan noise, standard deviation in grey levels', number('noise', 0, 60), 6)
  .option('--blur <pixels>', 'scan blur, standard deviation in pixels', number('blur', 0, 5), 0.7)
  .option('--quality <q>', 'JPEG quality', number('quality', 1, 100), 85)
  .option('--seed <n>', 'seed of the noise and the guide clicks', number('seed', 0, 2 ** 31), 1)
  .action(async (o) => {
    let variants: Variant[];
    if (o.name) {
      variants = [
        {
          spec: { name: o.name, system: o.system, layout: o.layout, ink: o.ink, labelsOnLines: Boolean(o.labelsOnLines), seed: o.seed, ...(o.fault ? { fault: o.fault } : {}) },
          ...(o.scan ? { scan: { dpi: o.dpi, rotationDeg: o.rotate, noise: o.noise, blur: o.blur, jpegQuality: o.quality, seed: o.seed }, container: o.pdf ? 'pdf' : 'image' } : {}),
        },
      ];
    } else {
      variants = o.set === 'all' ? ALL_VARIANTS : SAMPLE_VARIANTS;
    }
    for (const v of variants) {
      const t0 = performance.now();
      const made = await writeSheet(o.out, v);
      process.stdout.write(`${o.out}/${made.sheetFile}  (${(made.sheetBytes.byteLength / 1024).toFixed(0)} KB, ${made.takeoff.traces.length} traces, ${((performance.now() - t0) / 1000).toFixed(1)} s)\n`);
    }
  });

program.parseAsync(process.argv).catch((error: unknown) => {
  process.stderr.write(`make-sheets: ${error instanceof Error ? error.message : String(error)}\n`);
  process.exit(2);
});
