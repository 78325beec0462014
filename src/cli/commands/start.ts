/**
 * `pumpscribe start` (what `npm start` runs) — builds the workbench with Vite when dist/ is missing
 * or older than its sources, then serves it together with the library, like `serve`.
 */
import type { Command } from 'commander';
import { runCommand } from '../errors.ts';
import { addServeOptions, serveUntilStopped, type ServeFlags } from './serve.ts';

export function register(program: Command): void {
  addServeOptions(
    program.command('start').description('Build the workbench if needed, then serve it with the office pump library.'),
  ).action(async (flags: ServeFlags) => runCommand(() => serveUntilStopped(flags, { buildWorkbench: true })));
}
