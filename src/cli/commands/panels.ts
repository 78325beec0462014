/**
 * `pumpscribe panels <sheet> [--page n]`: proposes the panels of a vector sheet with their axis
 * anchors, found from numeric tick labels that line up with tick marks or grid lines. Prints
 * JSON ready to confirm, name and paste into a take-off file's "panels".
 */
import type { Command } from 'commander';
import { proposePanels } from '../../digitize/autoCalibrate.ts';
import { loadSheetFileNode } from '../../digitize/loaders/sheetNode.ts';
import { EXIT_OK, InputError, runCommand } from '../errors.ts';
import { positiveOption } from '../io.ts';

export function register(program: Command): void {
  program
    .command('panels')
    .description('propose panels and axis anchors of a vector PDF sheet from its tick labels (JSON for a take-off file)')
    .argument('<sheet>', 'PDF sheet')
    .option('--page <n>', 'page number', '1')
    .action((file: string, options: { page: string }) => runCommand(() => panels(file, options)));
}

async function panels(file: string, o: { page: string }): Promise<number> {
  const page = positiveOption(o.page, '--page') as number;
  if (!Number.isInteger(page)) throw new InputError(`The option --page must be a whole number, not "${o.page}".`);
  const sheet = await loadSheetFileNode(file, { page });
  try {
    if (sheet.kind !== 'vector-pdf') {
      throw new InputError(`The sheet "${file}" is ${sheet.kind === 'image' ? 'an image' : 'a scanned PDF page'} without a text layer to read tick labels from; place the anchors by hand.`);
    }
    const proposals = proposePanels(await sheet.text(), await sheet.paths());
    if (proposals.length === 0) {
      throw new InputError(`No numeric tick labels lined up with tick marks or grid lines on page ${page} of "${file}"; place the anchors by hand.`);
    }
    const round = (v: number) => Math.round(v * 1e4) / 1e4;
    const out = proposals.map((p, i) => ({
      id: `panel${i + 1}`,
      x_scale: p.xScale,
      y_scale: p.yScale,
      frame: p.frame.map(round),
      anchors: p.anchors.map((a) => ({ at: [round(a.at[0]), round(a.at[1])], ...(a.x !== undefined ? { x: a.x } : {}), ...(a.y !== undefined ? { y: a.y } : {}) })),
    }));
    process.stdout.write(`${JSON.stringify({ panels: out }, null, 2)}\n`);
    process.stderr.write(`Found ${out.length} panel${out.length === 1 ? '' : 's'}; check each proposal, name the panels and copy them into the take-off file.\n`);
    return EXIT_OK;
  } finally {
    await sheet.close();
  }
}
