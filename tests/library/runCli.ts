/** Runs `pumpscribe library …` in this process, capturing stdout, stderr and the exit code. */
import { runCli } from '../fuzz/cliInProcess.ts';

export async function runLibrary(...args: string[]): Promise<{ code: number; out: string; err: string }> {
  const { code, out, err } = await runCli(['library', ...args]);
  return { code, out, err };
}
