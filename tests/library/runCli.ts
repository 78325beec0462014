/** Runs `pumpscribe library …` in this process, capturing stdout, stderr and the exit code. */
import { vi } from 'vitest';
import { Command } from 'commander';
import { register } from '../../src/cli/commands/library.ts';

class Exit {
  constructor(readonly code: number) {}
}

export async function runLibrary(...args: string[]): Promise<{ code: number; out: string; err: string }> {
  const program = new Command('pumpscribe').exitOverride();
  register(program);
  let out = '';
  let err = '';
  const o = vi.spyOn(process.stdout, 'write').mockImplementation((c: string | Uint8Array) => ((out += String(c)), true));
  const e = vi.spyOn(process.stderr, 'write').mockImplementation((c: string | Uint8Array) => ((err += String(c)), true));
  const x = vi.spyOn(process, 'exit').mockImplementation(((code?: number) => {
    throw new Exit(code ?? 0);
  }) as never);
  let code = -1;
  try {
    await program.parseAsync(['node', 'pumpscribe', 'library', ...args]);
  } catch (error) {
    if (!(error instanceof Exit)) throw error;
    code = error.code;
  } finally {
    o.mockRestore();
    e.mockRestore();
    x.mockRestore();
  }
  return { code, out, err };
}
