/**
 * Runs the `pumpscribe` command line inside the test process: the same command modules the
 * binary loads (src/cli/commands/*.ts), with process.exit and the output streams caught.
 * Far cheaper than a child process per run on a small machine; a handful of child runs in
 * the fuzz test confirm that the real binary behaves the same.
 */
import { Command, CommanderError } from 'commander';
import { readdirSync } from 'node:fs';
import { join } from 'node:path';
import { pathToFileURL } from 'node:url';
import { vi } from 'vitest';
import { captureOutput } from '../../src/cli/io.ts';

export interface Run {
  code: number;
  out: string;
  err: string;
  ms: number;
}

class Exit extends Error {
  constructor(readonly code: number) {
    super(`exit ${code}`);
  }
}

const COMMANDS = join(import.meta.dirname, '..', '..', 'src', 'cli', 'commands');
let modules: { register(program: Command): void }[] | undefined;

async function commandModules() {
  if (!modules) {
    const files = readdirSync(COMMANDS).filter((f) => f.endsWith('.ts')).sort();
    modules = [];
    for (const f of files) {
      const mod = (await import(pathToFileURL(join(COMMANDS, f)).href)) as { register?: (p: Command) => void };
      if (mod.register) modules.push({ register: mod.register });
    }
  }
  return modules;
}

/** One run of `pumpscribe ...args`; never throws for what the command does. */
export async function runCli(args: readonly string[]): Promise<Run> {
  const program = new Command('pumpscribe').exitOverride();
  let out = '';
  let err = '';
  program.configureOutput({ writeOut: (t) => (out += t), writeErr: (t) => (err += t), outputError: (t, write) => write(t) });
  for (const mod of await commandModules()) mod.register(program);
  // Commander keeps parsed options on the command objects; a fresh program per run keeps runs apart.
  const exit = vi.spyOn(process, 'exit').mockImplementation(((code?: number) => {
    throw new Exit(code ?? 0);
  }) as never);
  const stdout = vi.spyOn(process.stdout, 'write').mockImplementation(((chunk: string | Uint8Array) => {
    out += typeof chunk === 'string' ? chunk : Buffer.from(chunk).toString('utf8');
    return true;
  }) as never);
  const stderr = vi.spyOn(process.stderr, 'write').mockImplementation(((chunk: string | Uint8Array) => {
    err += typeof chunk === 'string' ? chunk : Buffer.from(chunk).toString('utf8');
    return true;
  }) as never);
  captureOutput((fd, text) => {
    if (fd === 1) out += text;
    else err += text;
  });
  const started = performance.now();
  let code: number;
  try {
    await program.parseAsync(['node', 'pumpscribe', ...args]);
    code = 0;
  } catch (error) {
    if (error instanceof Exit) code = error.code;
    else if (error instanceof CommanderError) code = error.exitCode === 0 ? 0 : 2;
    else {
      // Something escaped the command's own error handling: that is a crash (exit 3).
      code = 3;
      err += `escaped: ${error instanceof Error ? (error.stack ?? error.message) : String(error)}\n`;
    }
  } finally {
    captureOutput(null);
    exit.mockRestore();
    stdout.mockRestore();
    stderr.mockRestore();
  }
  return { code, out, err, ms: performance.now() - started };
}
