/**
 * The `pumpscribe` command line. Each command lives in ./commands and exports
 * `register(program)`. Commands are imported lazily: only the one named on the command line
 * is loaded, so `check` never loads the web server and a CSV `build` never loads pdf.js.
 * A new command is one new file plus one line in COMMANDS below.
 *
 * Exit codes (every command):
 *   0 — done, and the checks found no `fail`;
 *   1 — done, but the checks found a `fail` (or the duty cannot be met);
 *   2 — unusable input or options: one sentence on stderr says what to fix;
 *   3 — internal error (a defect): one sentence on stderr; please report it.
 */
import { existsSync } from 'node:fs';
import { dirname, resolve } from 'node:path';
import { fileURLToPath } from 'node:url';
import type { Command } from 'commander';
import { TOOL_VERSION } from '../version.ts';

/** Unusable input (the same as EXIT_BAD_INPUT in errors.ts, which is not loaded up front to start fast). */
const EXIT_BAD_INPUT = 2;

/** The repository (or installed package) root: this file sits two folders below it, in src/cli or build/cli. */
const PACKAGE_ROOT = resolve(dirname(fileURLToPath(import.meta.url)), '..', '..');

/**
 * `npm run pumpscribe -- …` runs in the package root whatever folder it was typed in; npm keeps
 * that folder in INIT_CWD. Going back there makes relative paths mean what the user typed.
 * Only for our own script: under `npm test` or `npm start` the working folder stays as npm set it.
 */
export function adoptInvocationFolder(env: NodeJS.ProcessEnv = process.env): void {
  const from = env.INIT_CWD;
  if (!from || env.npm_lifecycle_event !== 'pumpscribe') return;
  if (resolve(process.cwd()) !== PACKAGE_ROOT || resolve(from) === PACKAGE_ROOT || !existsSync(from)) return;
  process.chdir(from);
}

export interface CommandModule {
  register(program: Command): void;
}

/** Command name → its module, loaded on demand. Sorted by name, as `--help` lists them. */
const COMMANDS: Record<string, () => Promise<Partial<CommandModule>>> = {
  build: () => import('./commands/build.ts'),
  check: () => import('./commands/check.ts'),
  duty: () => import('./commands/duty.ts'),
  export: () => import('./commands/export.ts'),
  library: () => import('./commands/library.ts'),
  panels: () => import('./commands/panels.ts'),
  report: () => import('./commands/report.ts'),
  scale: () => import('./commands/scale.ts'),
  study: () => import('./commands/study.ts'),
  serve: () => import('./commands/serve.ts'),
  start: () => import('./commands/start.ts'),
  takeoff: () => import('./commands/takeoff.ts'),
};

/** The first word that is not an option: the command the user asked for, if any. */
function commandNamed(args: readonly string[]): string | undefined {
  for (const a of args) {
    if (a === '--') return undefined;
    if (!a.startsWith('-')) return a;
  }
  return undefined;
}

export async function main(argv: string[]): Promise<void> {
  const args = argv.slice(2);
  if (args.length === 1 && (args[0] === '--version' || args[0] === '-V')) {
    process.stdout.write(`${TOOL_VERSION}\n`);
    return;
  }
  adoptInvocationFolder();
  const { Command, CommanderError } = await import('commander'); // after the --version fast path
  const program = new Command('pumpscribe')
    .description('Read centrifugal pump performance sheets into checked, normalised curve sets.')
    .version(TOOL_VERSION)
    .showHelpAfterError()
    .exitOverride()
    .addHelpText(
      'after',
      '\nA file argument or -o of "-" means standard input or standard output.\n' +
        'Exit codes: 0 ok; 1 the checks found a fail; 2 unusable input (one sentence on stderr); 3 internal error (please report it).',
    );
  program.configureOutput({ outputError: (text, write) => write(text) });

  // Each command parses a file or two once: zod's compiled fast path costs more to build (about
  // 50 ms of start-up) than it saves on a single parse, so the command line parses without it.
  (await import('zod')).config({ jitless: true });

  const named = commandNamed(args);
  const wanted = named && named !== 'help' && COMMANDS[named] ? [named] : Object.keys(COMMANDS);
  const modules = await Promise.all(wanted.map((name) => COMMANDS[name]!()));
  for (const mod of modules) mod.register?.(program);

  try {
    await program.parseAsync(argv);
  } catch (error) {
    if (error instanceof CommanderError) {
      if (error.code === 'commander.helpDisplayed' || error.code === 'commander.version' || error.code === 'commander.help') process.exit(0);
      process.exit(EXIT_BAD_INPUT);
    }
    throw error;
  }
}

// Not a top-level await: the prebuilt command line is one CommonJS script (scripts/build-cli.mjs).
// A defect that escapes the command's own handling (runCommand) still ends in exit 3 with one sentence.
main(process.argv).catch((error: unknown) => {
  process.stderr.write(`pumpscribe: Unexpected internal error: ${error instanceof Error ? error.message : String(error)}. Please report it with the input that caused it.\n`);
  if (process.env.PUMPSCRIBE_DEBUG && error instanceof Error) process.stderr.write(`${error.stack}\n`);
  process.exit(3);
});
