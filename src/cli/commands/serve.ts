/**
 * `pumpscribe serve [--port N] [--library FILE] [--host H]` — the library server: JSON API, the
 * plain library page, and the workbench from dist/ when it has been built.
 */
import type { Command } from 'commander';
import { runCommand, EXIT_OK } from '../errors.ts';
import { DEFAULT_HOST, DEFAULT_LIBRARY_FILE, DEFAULT_PORT, startServer, type ServeOptions } from '../../server/start.ts';
import { TOKEN_ENV } from '../../server/security.ts';

export interface ServeFlags {
  port?: string;
  host?: string;
  library?: string;
  seed?: boolean;
  sheetQuota?: string;
}

/** Runs the server until SIGINT or SIGTERM, then closes it and the library cleanly. */
export async function serveUntilStopped(flags: ServeFlags, extra: Partial<ServeOptions> = {}): Promise<number> {
  const server = await startServer({
    ...(flags.port !== undefined ? { port: flags.port } : {}),
    ...(flags.host !== undefined ? { host: flags.host } : {}),
    ...(flags.library !== undefined ? { library: flags.library } : {}),
    seed: flags.seed !== false,
    ...(flags.sheetQuota !== undefined ? { sheetQuota: flags.sheetQuota } : {}),
    ...extra,
  });
  process.stdout.write('Press Ctrl+C to stop.\n');
  await new Promise<void>((resolve) => {
    const stop = () => resolve();
    process.once('SIGINT', stop);
    process.once('SIGTERM', stop);
  });
  await server.close();
  process.stdout.write('Stopped; the library file is closed.\n');
  return EXIT_OK;
}

export function addServeOptions(command: Command): Command {
  return command
    .option('--port <n>', `port to listen on (0 picks a free one)`, String(DEFAULT_PORT))
    .option('--host <address>', `address to bind; anything but loopback needs ${TOKEN_ENV}`, DEFAULT_HOST)
    .option('--library <file>', 'library file (SQLite); created when missing', DEFAULT_LIBRARY_FILE)
    .option('--no-seed', 'do not add the invented demo curve sets to a new library')
    .option('--sheet-quota <size>', 'bytes of source sheets the library may hold, with a unit (e.g. 500MB, 2GiB; default 2GiB)');
}

export function register(program: Command): void {
  addServeOptions(
    program.command('serve').description('Serve the office pump library (JSON API and library page) and the built workbench.'),
  ).action(async (flags: ServeFlags) => runCommand(() => serveUntilStopped(flags)));
}
