/**
 * Child-process measurements for the bench: wall time and peak resident memory of a whole
 * command, as a user runs it (`node bin/pumpscribe.mjs …`). Peak RSS comes from GNU time
 * (/usr/bin/time -f %M) when it is installed; otherwise it is reported as unknown.
 */
import { spawnSync } from 'node:child_process';
import { existsSync, mkdtempSync, readFileSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';

export const ROOT = join(import.meta.dirname, '..');
export const BIN = join(ROOT, 'bin', 'pumpscribe.mjs');
const GNU_TIME = '/usr/bin/time';

export interface ChildRun {
  ms: number;
  /** Peak resident set size, bytes (undefined without GNU time). */
  rss?: number;
  /** CPU time, user plus system, all threads, ms (undefined without GNU time): steadier than wall time on a shared machine. */
  cpu?: number;
  code: number | null;
  stderr: string;
  stdout: string;
}

/** Runs `node …args` once; stdout is discarded. */
export function runNode(args: string[], options: { input?: string; cwd?: string } = {}): ChildRun {
  const dir = mkdtempSync(join(tmpdir(), 'pumpscribe-bench-time-'));
  const report = join(dir, 'time.txt');
  const useTime = existsSync(GNU_TIME);
  const command = useTime ? GNU_TIME : process.execPath;
  const argv = useTime ? ['-f', '%M %U %S', '-o', report, process.execPath, ...args] : args;
  const t0 = performance.now();
  const r = spawnSync(command, argv, { cwd: options.cwd ?? ROOT, input: options.input, encoding: 'utf8', maxBuffer: 1 << 28, env: { ...process.env, CI: '1' } });
  const ms = performance.now() - t0;
  let rss: number | undefined;
  let cpu: number | undefined;
  if (useTime && existsSync(report)) {
    const [kib, user, system] = (readFileSync(report, 'utf8').trim().split('\n').pop() ?? '').split(' ').map(Number);
    if (Number.isFinite(kib)) rss = (kib as number) * 1024;
    if (Number.isFinite(user) && Number.isFinite(system)) cpu = ((user as number) + (system as number)) * 1000;
  }
  rmSync(dir, { recursive: true, force: true });
  return { ms, ...(rss !== undefined ? { rss } : {}), ...(cpu !== undefined ? { cpu } : {}), code: r.status, stderr: r.stderr, stdout: r.stdout };
}

export function median(values: number[]): number {
  const s = [...values].sort((a, b) => a - b);
  const mid = Math.floor(s.length / 2);
  return s.length % 2 ? (s[mid] as number) : ((s[mid - 1] as number) + (s[mid] as number)) / 2;
}

/** "median (min–max)" of a list, with a formatter. */
export function spread(values: number[], fmt: (v: number) => string): string {
  return `${fmt(median(values))} (${fmt(Math.min(...values))}–${fmt(Math.max(...values))})`;
}

export const mib = (bytes: number | undefined) => (bytes === undefined ? 'unknown' : `${(bytes / 2 ** 20).toFixed(0)} MiB`);

/**
 * Interleaves several commands round by round (a, b, c, a, b, c, …), so that a busy moment of a
 * shared machine falls on all of them alike. Returns the runs of each command.
 */
export function interleaved(commands: Record<string, string[]>, rounds: number): Record<string, ChildRun[]> {
  const out: Record<string, ChildRun[]> = Object.fromEntries(Object.keys(commands).map((k) => [k, []]));
  for (let i = 0; i < rounds; i++) for (const [k, args] of Object.entries(commands)) out[k]!.push(runNode(args));
  return out;
}
