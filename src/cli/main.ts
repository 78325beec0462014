/**
 * The `pumpscribe` command line. Each file in ./commands exports `register(program)`;
 * they are loaded here so that a new command is one new file.
 */
import { Command, CommanderError } from 'commander';
import { readdirSync } from 'node:fs';
import { dirname, join } from 'node:path';
import { fileURLToPath, pathToFileURL } from 'node:url';
import { EXIT_BAD_INPUT } from './errors.ts';
import { TOOL_VERSION } from '../version.ts';

export interface CommandModule {
  register(program: Command): void;
}

async function main(argv: string[]): Promise<void> {
  const program = new Command('pumpscribe')
    .description('Read centrifugal pump performance sheets into checked, normalised curve sets.')
    .version(TOOL_VERSION)
    .showHelpAfterError()
    .exitOverride();
  program.configureOutput({ outputError: (text, write) => write(text) });

  const here = join(dirname(fileURLToPath(import.meta.url)), 'commands');
  const files = readdirSync(here).filter((f) => f.endsWith('.ts')).sort();
  for (const file of files) {
    const mod = (await import(pathToFileURL(join(here, file)).href)) as Partial<CommandModule>;
    mod.register?.(program);
  }

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

await main(process.argv);
