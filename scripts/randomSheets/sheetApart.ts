/**
 * One sheet of the random bed made in a child process. Drawing and shooting a sheet runs native
 * code (@napi-rs/canvas); a rare native crash there ends the process it runs in. A browser test
 * that made its sheet in its own process lost the whole test file to such a crash, so the tests
 * make the sheet here instead: the child writes the sheet, and a child ended by a signal is run
 * again (the sheet is a pure function of its seed, so a second run gives the same sheet).
 *
 * As a program: `tsx scripts/randomSheets/sheetApart.ts SEED scan|photo OUT.json` writes the
 * sheet with its JPEG in base64.
 */
import { spawnSync } from 'node:child_process';
import { mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import type { RandomSheet } from './randomSheet.ts';

/** Runs before giving up: a crash that repeats three times is not a rare one. */
const ATTEMPTS = 3;

export function makeRandomSheetApart(seed: number, kind: 'scan' | 'photo'): RandomSheet {
  const dir = mkdtempSync(join(tmpdir(), 'pumpscribe-sheet-'));
  const out = join(dir, 'sheet.json');
  const self = fileURLToPath(import.meta.url);
  const crashes: string[] = [];
  try {
    for (let attempt = 1; attempt <= ATTEMPTS; attempt++) {
      const run = spawnSync(process.execPath, ['--import', 'tsx', self, String(seed), kind, out], { encoding: 'utf8', stdio: ['ignore', 'pipe', 'pipe'] });
      if (run.status === 0) {
        const { jpeg, ...rest } = JSON.parse(readFileSync(out, 'utf8')) as Omit<RandomSheet, 'jpeg'> & { jpeg: string };
        return { ...rest, jpeg: Buffer.from(jpeg, 'base64') };
      }
      const how = run.signal ? `ended by ${run.signal}` : `exit ${run.status}`;
      // Only a native crash is worth another run; an error in the code would repeat.
      if (!run.signal) throw new Error(`Making random sheet ${seed} (${kind}) failed (${how}):\n${run.stderr}`);
      crashes.push(`attempt ${attempt}: ${how}`);
      process.stderr.write(`random sheet ${seed} (${kind}): the drawing process was ${how}; running it again\n`);
    }
    throw new Error(`Making random sheet ${seed} (${kind}) crashed ${ATTEMPTS} times (${crashes.join('; ')}).`);
  } finally {
    rmSync(dir, { recursive: true, force: true });
  }
}

async function main(argv: string[]): Promise<void> {
  const [seedText, kind, out] = argv;
  const seed = Number(seedText);
  if (!Number.isInteger(seed) || (kind !== 'scan' && kind !== 'photo') || !out) throw new Error('Usage: sheetApart.ts SEED scan|photo OUT.json');
  const { makeRandomSheet } = await import('./randomSheet.ts');
  const { jpeg, ...rest } = await makeRandomSheet(seed, kind);
  writeFileSync(out, JSON.stringify({ ...rest, jpeg: jpeg.toString('base64') }));
}

if (process.argv[1] && fileURLToPath(import.meta.url) === process.argv[1]) {
  main(process.argv.slice(2)).catch((error: unknown) => {
    process.stderr.write(`${error instanceof Error ? error.message : String(error)}\n`);
    process.exitCode = 1;
  });
}
