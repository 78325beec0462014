/**
 * Writes one vector sheet of the random bed to a file (for the committed test fixtures):
 *   npx tsx scripts/detectSheets/fixture.ts <seed> <out.pdf>
 */
import { writeFileSync } from 'node:fs';
import { makeVectorSheet, openPrinter } from './vectorSheet.ts';

const [seed, out] = process.argv.slice(2);
if (!seed || !out || !Number.isInteger(Number(seed))) {
  process.stderr.write('Give a whole-number seed and the PDF file to write.\n');
  process.exit(2);
}
const browser = await openPrinter();
try {
  writeFileSync(out, (await makeVectorSheet(browser, Number(seed))).pdf);
} finally {
  await browser.close();
}
