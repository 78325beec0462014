import { readdirSync, readFileSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';

const root = join(import.meta.dirname, '..', '..');

describe('the command table', () => {
  it('lists every command file, so a new command is never left out of the prebuilt command line', () => {
    const main = readFileSync(join(root, 'src', 'cli', 'main.ts'), 'utf8');
    const files = readdirSync(join(root, 'src', 'cli', 'commands')).filter((f) => f.endsWith('.ts'));
    expect(files.length).toBeGreaterThan(5);
    for (const f of files) expect(main, `${f} is missing from COMMANDS in src/cli/main.ts`).toContain(`import('./commands/${f}')`);
  });
});
