/** Where the sample sheets are: the project's samples/sheets, or a folder named by PUMPSCRIBE_SAMPLES. */
import { existsSync, readdirSync } from 'node:fs';
import { join } from 'node:path';
import { ROOT } from './harness.ts';

function find(pattern: RegExp, what: string): string {
  const roots = [process.env.PUMPSCRIBE_SAMPLES, join(ROOT, 'samples', 'sheets')].filter((d): d is string => !!d && existsSync(d));
  for (const root of roots) {
    const stack = [root];
    while (stack.length) {
      const dir = stack.pop() as string;
      for (const entry of readdirSync(dir, { withFileTypes: true })) {
        const path = join(dir, entry.name);
        if (entry.isDirectory()) stack.push(path);
        else if (pattern.test(entry.name)) return path;
      }
    }
  }
  throw new Error(`No ${what} take-off file was found under samples/sheets.`);
}

export const vectorSample = () => find(/vector.*\.takeoff\.json$/, 'vector sample');
export const scanSample = () => find(/scan.*\.takeoff\.json$/, 'scan sample');
