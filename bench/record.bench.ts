/**
 * The selection record of the INVENTED four-panel sample sheets (samples/sheets: head,
 * efficiency, shaft power and NPSHr panels), with the invented four-option study of the record
 * tests (target: under 3 s, browser and command line alike):
 *
 * 1. the record itself, in this process and warm: `makeRecord` (overlay, study view, PDF), the
 *    code the workbench runs in the page, median of 5 with the spread, A4 and US Letter;
 * 2. the whole `pumpscribe report` command as a user runs it (child process: start-up, load the
 *    sheet, replay the take-off, run the study, make and write the record), median of 3 with the
 *    spread, peak RSS and CPU time (user + system, which a busy shared machine inflates less
 *    than the wall time), interleaved round by round with a bare `node -e 0` as the yardstick of
 *    how busy the machine is; the load average is printed beside. It runs the prebuilt bundle
 *    (built first when it is missing or older than src/, as `npm install` would), and says so.
 *
 * The browser side (click to saved file in Chromium) is measured by tests/e2e/record.test.ts.
 * The machines are shared: medians and spreads, not single runs.
 */
import { spawnSync } from 'node:child_process';
import { existsSync, mkdtempSync, readdirSync, readFileSync, rmSync, statSync, writeFileSync } from 'node:fs';
import { loadavg, tmpdir } from 'node:os';
import { join } from 'node:path';
import { stringifyCurveSet } from '../src/model/curvesetIO.ts';
import { makeRecord } from '../src/record/makeRecord.ts';
import type { Paper } from '../src/record/recordPdf.ts';
import { recordInput, sample, SHEETS, SI_STUDY } from '../tests/record/samples.ts';
import { BIN, interleaved, median, mib, ROOT, spread } from './processes.ts';

const TARGET_MS = 3000;
const ms = (v: number) => `${v.toFixed(v < 10 ? 1 : 0)} ms`;
const verdict = (v: number) => (v < TARGET_MS ? `under ${TARGET_MS / 1000} s ok` : `OVER ${TARGET_MS / 1000} s`);

/** Newest .ts under src/ outside the browser code (what bin/pumpscribe.mjs compares with the bundle's stamp). */
function newestSource(dir: string): number {
  let newest = 0;
  for (const e of readdirSync(dir, { withFileTypes: true })) {
    const path = join(dir, e.name);
    if (e.isDirectory()) newest = path === join(ROOT, 'src', 'ui') ? newest : Math.max(newest, newestSource(path));
    else if (e.name.endsWith('.ts')) newest = Math.max(newest, statSync(path).mtimeMs);
  }
  return newest;
}

function bundleCurrent(): boolean {
  try {
    const { builtMs } = JSON.parse(readFileSync(join(ROOT, 'build', 'cli', 'stamp.json'), 'utf8')) as { builtMs?: number };
    return typeof builtMs === 'number' && existsSync(join(ROOT, 'build', 'cli', 'main.mjs')) && newestSource(join(ROOT, 'src')) <= builtMs;
  } catch {
    return false;
  }
}

/** User plus system CPU seconds of one run of `node …args` (GNU time); undefined without it. */
function cpuSeconds(args: string[]): number | undefined {
  if (!existsSync('/usr/bin/time')) return undefined;
  const dir = mkdtempSync(join(tmpdir(), 'pumpscribe-bench-cpu-'));
  try {
    spawnSync('/usr/bin/time', ['-f', '%U %S', '-o', join(dir, 't'), process.execPath, ...args], { cwd: ROOT, encoding: 'utf8' });
    const [u, sys] = readFileSync(join(dir, 't'), 'utf8').trim().split('\n').pop()?.split(' ').map(Number) ?? [];
    return u !== undefined && sys !== undefined && Number.isFinite(u + sys) ? u + sys : undefined;
  } finally {
    rmSync(dir, { recursive: true, force: true });
  }
}

async function inProcess(name: string, paper: Paper): Promise<number[]> {
  const s = await sample(name);
  const input = recordInput(name, s, paper, 'record.bench.study.json');
  const times: number[] = [];
  for (let i = 0; i < 6; i++) {
    const t0 = performance.now();
    await makeRecord(input);
    if (i > 0) times.push(performance.now() - t0); // the first run loads modules and fonts
  }
  return times;
}

export default async function bench(): Promise<void> {
  process.stdout.write(`selection record of the invented four-panel samples, invented study of ${SI_STUDY.options.length} options (target under ${TARGET_MS / 1000} s)\n`);
  process.stdout.write('1. makeRecord in this process, warm (the code the workbench runs), median of 5 (spread)\n');
  for (const name of ['si-panels-black', 'si-panels-colour-scan']) {
    for (const paper of ['a4', 'letter'] as const) {
      const t = await inProcess(name, paper);
      process.stdout.write(`  ${`${name} ${paper}`.padEnd(30)} ${spread(t, ms)}  [${verdict(median(t))}]\n`);
    }
  }

  const scratch = mkdtempSync(join(tmpdir(), 'pumpscribe-bench-record-'));
  try {
    let how = 'the prebuilt bundle';
    if (!bundleCurrent()) {
      const b = spawnSync(process.execPath, [join(ROOT, 'scripts', 'build-cli.mjs')], { cwd: ROOT, encoding: 'utf8' });
      how = b.status === 0 && bundleCurrent() ? 'the prebuilt bundle (built just now: it was missing or older than src/)' : `the TypeScript sources (the bundle could not be built: ${(b.stderr || b.stdout).trim().split('\n')[0]})`;
    }
    process.stdout.write(`2. the whole \`pumpscribe report\` command (child process, ${how}), median of 3 (spread)\n`);
    process.stdout.write(`   load average ${loadavg().map((l) => l.toFixed(1)).join(', ')} on this machine's cores\n`);
    for (const name of ['si-panels-black', 'si-panels-colour-scan']) {
      const s = await sample(name);
      writeFileSync(join(scratch, 'sheet.curveset.json'), stringifyCurveSet(s.replay.curveSet));
      writeFileSync(join(scratch, 'record.study.json'), JSON.stringify(SI_STUDY));
      const out = join(scratch, `${name}.record.pdf`);
      const report = [BIN, 'report', '--takeoff', join(SHEETS, `${name}.takeoff.json`), '--study', join(scratch, 'record.study.json'), '-o', out, '-q'];
      const runs = interleaved({ node: ['-e', '0'], report }, 3);
      const r = runs.report ?? [];
      const bad = r.find((c) => c.code !== 0 && c.code !== 1);
      const wall = median(r.map((c) => c.ms));
      const size = existsSync(out) ? statSync(out).size : 0;
      const cpu = cpuSeconds(report);
      process.stdout.write(
        `  ${name.padEnd(30)} ${spread(r.map((c) => c.ms), ms)} wall, CPU ${cpu === undefined ? 'unknown' : `${cpu.toFixed(2)} s`}, peak RSS ${mib(Math.max(...r.map((c) => c.rss ?? 0)) || undefined)}, ${(size / 1024).toFixed(0)} KiB; \`node -e 0\` ${spread((runs.node ?? []).map((c) => c.ms), ms)}  [${verdict(wall)}]${bad ? `  ← exit ${bad.code}: ${bad.stderr.trim().split('\n')[0]}` : ''}\n`,
      );
    }
  } finally {
    rmSync(scratch, { recursive: true, force: true });
  }
}
