/**
 * Two dumps of the random bed compared curve by curve (`RANDOM_DUMP=file.json` of two versions,
 * same seeds): per group (kind, quantity), how many curves one version got right that the other
 * got wrong, which curves lost or gained a flag, and every curve that is wrong and unflagged in
 * either. For telling whether a change that lowers the wrong share broke other curves on the way.
 *
 *   npx tsx scripts/randomSheets/compareDumps.ts before.json after.json [--list]
 */
import { readFileSync } from 'node:fs';

interface Row {
  seed: number;
  kind: string;
  id: string;
  quantity: string;
  source: string;
  error: number | null;
  wrong: boolean;
  flagged: boolean;
}

const [beforeFile, afterFile] = process.argv.slice(2).filter((a) => !a.startsWith('--'));
if (!beforeFile || !afterFile) {
  process.stderr.write('Give two dumps: compareDumps.ts before.json after.json [--list]\n');
  process.exit(2);
}
const list = process.argv.includes('--list');
const read = (f: string) => (JSON.parse(readFileSync(f, 'utf8')) as { rows: Row[] }).rows;
const key = (r: Row) => `${r.seed}/${r.kind} ${r.id}`;
const before = new Map(read(beforeFile).map((r) => [key(r), r]));
const after = read(afterFile);
const group = (r: Row) => `${r.kind} ${r.quantity}${r.quantity === 'efficiency' ? ` (${r.source})` : ''}`;
const err = (r: Row) => (r.error === null || !Number.isFinite(r.error) ? 'missing' : r.error.toFixed(2));

const groups = new Map<string, { n: number; fixed: string[]; broke: string[]; wrongBefore: number; wrongAfter: number }>();
const unflagged: string[] = [];
let unmatched = 0;
for (const a of after) {
  const b = before.get(key(a));
  if (!b) {
    unmatched++;
    continue;
  }
  const g = groups.get(group(a)) ?? { n: 0, fixed: [], broke: [], wrongBefore: 0, wrongAfter: 0 };
  groups.set(group(a), g);
  g.n++;
  if (b.wrong) g.wrongBefore++;
  if (a.wrong) g.wrongAfter++;
  if (b.wrong && !a.wrong) g.fixed.push(`${key(a)} ${err(b)} → ${err(a)}`);
  if (!b.wrong && a.wrong) g.broke.push(`${key(a)} ${err(b)} → ${err(a)}${a.flagged ? '' : ' UNFLAGGED'}`);
  if (a.wrong && !a.flagged) unflagged.push(`after: ${key(a)} ${err(a)}`);
  if (b.wrong && !b.flagged) unflagged.push(`before: ${key(a)} ${err(b)}`);
}
process.stdout.write('group                        curves  wrong before → after   fixed  broke\n');
let fixed = 0;
let broke = 0;
for (const [name, g] of [...groups.entries()].sort()) {
  fixed += g.fixed.length;
  broke += g.broke.length;
  process.stdout.write(`${name.padEnd(28)} ${String(g.n).padStart(6)}  ${String(g.wrongBefore).padStart(6)} → ${String(g.wrongAfter).padEnd(10)} ${String(g.fixed.length).padStart(5)}  ${String(g.broke.length).padStart(5)}\n`);
  if (list) for (const line of [...g.fixed.map((f) => `    fixed ${f}`), ...g.broke.map((f) => `    broke ${f}`)]) process.stdout.write(`${line}\n`);
}
process.stdout.write(`all: fixed ${fixed}, broke ${broke}${unmatched ? `; ${unmatched} curves of the second dump not in the first` : ''}\n`);
for (const u of unflagged) process.stdout.write(`wrong and unflagged ${u}\n`);
