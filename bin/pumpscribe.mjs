#!/usr/bin/env node
// Runs the TypeScript command line through tsx, so that no build step is needed.
import { spawnSync } from 'node:child_process';
import { fileURLToPath } from 'node:url';
import { dirname, join } from 'node:path';

const root = join(dirname(fileURLToPath(import.meta.url)), '..');
const tsx = join(root, 'node_modules', 'tsx', 'dist', 'cli.mjs');
const main = join(root, 'src', 'cli', 'main.ts');
const result = spawnSync(process.execPath, [tsx, main, ...process.argv.slice(2)], { stdio: 'inherit' });
process.exit(result.status ?? 2);
