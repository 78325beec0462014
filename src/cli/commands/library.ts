/**
 * `pumpscribe library …` — the office pump library from the command line, on the same store,
 * search and export code as the server. Works while the server runs (SQLite WAL, one writer at a time).
 */
import type { Command } from 'commander';
import { createReadStream, createWriteStream, existsSync, renameSync, statSync, unlinkSync } from 'node:fs';
import { basename, dirname, join, resolve } from 'node:path';
import { once } from 'node:events';
import { LibraryError } from '../../library/errors.ts';
import { LibraryStore } from '../../library/store.ts';
import { searchByDuty } from '../../library/dutySearch.ts';
import { libraryMatcher } from '../../library/matcher.ts';
import { dutyFromDisplay, dutySearchView, matchSentence, unitSystemNamed, type DutySearchView } from '../../library/dutyView.ts';
import { exportLines, importLines } from '../../library/transfer.ts';
import { linesOf } from '../../library/lines.ts';
import type { EntryInfo } from '../../library/types.ts';
import { DEFAULT_LIBRARY_FILE } from '../../server/start.ts';
import { fromSI, presetNamed, resolveUnits, roundSignificant, type PresetName } from '../../units/index.ts';
import { EXIT_OK, runCommand } from '../errors.ts';
import { positiveOption, readCurveSet, writeTextAtomic } from '../io.ts';

interface LibraryFlag {
  library: string;
}

const out = (line = '') => process.stdout.write(`${line}\n`);

/** Opens the library; only `add` and `import` may create a new file. */
function openLibrary(file: string, create = false): LibraryStore {
  const path = resolve(file);
  if (!create && !existsSync(path)) {
    throw new LibraryError(`There is no library file "${path}"; give --library FILE, or create one with "library add" or "library import".`, 'not-found');
  }
  return LibraryStore.open(path);
}

async function withLibrary<T>(file: string, create: boolean, body: (store: LibraryStore) => T | Promise<T>): Promise<T> {
  const store = openLibrary(file, create);
  try {
    return await body(store);
  } finally {
    store.close();
  }
}

function num(value: number | null | undefined, digits = 4): string {
  return value === null || value === undefined || !Number.isFinite(value) ? '—' : String(roundSignificant(value, digits));
}

function table(rows: string[][]): string {
  const widths = rows[0]?.map((_, i) => Math.max(...rows.map((r) => (r[i] ?? '').length))) ?? [];
  return rows.map((r) => r.map((c, i) => c.padEnd(widths[i] ?? 0)).join('  ').trimEnd()).join('\n');
}

function entryTable(entries: EntryInfo[], system: PresetName): string {
  const u = resolveUnits(presetNamed(system));
  const rows = [['id', 'rev', 'name', 'maker', 'rpm', `diameters ${u.diameter.label}`, `flow ${u.flow.label}`, `head ${u.head.label}`, 'BEP η %']];
  for (const e of entries) {
    rows.push([
      e.id,
      String(e.revision),
      e.name,
      e.maker ?? '',
      num(e.speed_rpm, 5),
      e.diameters_m.map((d) => num(fromSI(d, u.diameter))).join(', '),
      `${num(fromSI(e.flow_range_m3s[0], u.flow), 3)}–${num(fromSI(e.flow_range_m3s[1], u.flow), 3)}`,
      `${num(fromSI(e.head_range_m[0], u.head), 3)}–${num(fromSI(e.head_range_m[1], u.head), 3)}`,
      e.bep ? num(e.bep.efficiency * 100, 3) : '—',
    ]);
  }
  return table(rows);
}

function searchTable(view: DutySearchView): string {
  const u = view.units;
  const rows = [['#', 'name', 'id', `diameter ${u.diameter}`, 'η %', `power ${u.power}`, `NPSHr ${u.npshr}`, 'POR', 'annual cost', 'cautions']];
  view.candidates.forEach((c, i) => {
    rows.push([
      String(i + 1),
      c.name,
      c.id,
      `${num(c.diameter)}${c.trimmed ? ' trim' : ''}`,
      num(c.efficiency, 3),
      num(c.power, 3),
      num(c.npshr, 3),
      c.por.flow_to_bep_percent === null ? c.por.position : `${c.por.position} (${num(c.por.flow_to_bep_percent, 3)} % BEP)`,
      num(c.annual_cost, 4),
      c.warnings.join('; '),
    ]);
  });
  return table(rows);
}

function entryId(value: string): string {
  return value.trim().toLowerCase();
}

export function register(program: Command): void {
  const library = program.command('library').description('the office pump library: add, list, find by duty, show, export, import, back up');
  const withFile = (c: Command) => c.option('--library <file>', 'library file (SQLite)', DEFAULT_LIBRARY_FILE);

  withFile(library.command('add').description('add curve sets as new entries (all files are checked before any is added)').argument('<files...>', '*.curveset.json files'))
    .action((files: string[], o: LibraryFlag) =>
      runCommand(() => {
        const sets = files.map((f) => ({ file: f, set: readCurveSet(f) }));
        return withLibrary(o.library, true, (store) => {
          for (const { file, set } of sets) {
            const saved = store.create(set);
            out(`added ${saved.id} revision ${saved.revision}: ${set.pump.name} (${basename(file)})`);
          }
          out(`Library file: ${store.file}`);
          return EXIT_OK;
        });
      }),
    );

  withFile(library.command('update').description('add a new revision to an entry').argument('<id>').argument('<file>', '*.curveset.json file'))
    .option('--expect-revision <n>', 'refuse if the entry is no longer at this revision')
    .action((id: string, file: string, o: LibraryFlag & { expectRevision?: string }) =>
      runCommand(() => {
        const set = readCurveSet(file);
        const expected = positiveOption(o.expectRevision, '--expect-revision');
        return withLibrary(o.library, false, (store) => {
          const saved = store.addRevision(entryId(id), set, expected === undefined ? {} : { expectedRevision: expected });
          out(`saved ${saved.id} revision ${saved.revision}: ${set.pump.name}`);
          return EXIT_OK;
        });
      }),
    );

  withFile(library.command('list').description('list entries, optionally those whose names contain words'))
    .option('--q <text>', 'words the name, maker or model must contain')
    .option('--archived', 'list archived entries instead')
    .option('--units <system>', 'display units: si or us', 'si')
    .option('--json', 'print JSON')
    .action((o: LibraryFlag & { q?: string; archived?: boolean; units: string; json?: boolean }) =>
      runCommand(() =>
        withLibrary(o.library, false, (store) => {
          const system = unitSystemNamed(o.units);
          const result = store.list({ q: o.q ?? '', archived: o.archived === true, limit: 1000 });
          if (o.json) out(JSON.stringify(result, null, 2));
          else {
            out(result.entries.length ? entryTable(result.entries, system) : 'No entries match.');
            out(`${result.entries.length} of ${result.total} shown.`);
          }
          return EXIT_OK;
        }),
      ),
    );

  withFile(library.command('find').description('rank the pumps that can meet a duty point (a captured diameter or a trim between them)'))
    .requiredOption('--flow <Q>', 'duty flow (m³/h for si, gpm for us)')
    .requiredOption('--head <H>', 'duty head (m for si, ft for us)')
    .requiredOption('--units <system>', 'si or us')
    .option('--static <H0>', 'static head of the system, same unit as --head')
    .option('--hours <n>', 'operating hours per year (with --tariff: rank by annual energy cost)')
    .option('--tariff <price>', 'energy price per kWh')
    .option('--limit <n>', 'most candidates to show', '10')
    .option('--json', 'print JSON')
    .action((o: LibraryFlag & { flow: string; head: string; units: string; static?: string; hours?: string; tariff?: string; limit: string; json?: boolean }) =>
      runCommand(() =>
        withLibrary(o.library, false, (store) => {
          const system = unitSystemNamed(o.units);
          const flow = positiveOption(o.flow, '--flow') as number;
          const head = positiveOption(o.head, '--head') as number;
          const staticHead = o.static === undefined ? undefined : Number(o.static);
          if (staticHead !== undefined && !Number.isFinite(staticHead)) throw new LibraryError(`The option --static must be a number, not "${o.static}".`, 'invalid');
          const hours = positiveOption(o.hours, '--hours');
          const tariff = o.tariff === undefined ? undefined : Number(o.tariff);
          if (tariff !== undefined && !Number.isFinite(tariff)) throw new LibraryError(`The option --tariff must be a number, not "${o.tariff}".`, 'invalid');
          const limit = positiveOption(o.limit, '--limit') as number;
          const result = searchByDuty(store, dutyFromDisplay(system, flow, head, staticHead), libraryMatcher, {
            ...(hours === undefined ? {} : { hoursPerYear: hours }),
            ...(tariff === undefined ? {} : { tariffPerKWh: tariff }),
            limit: Math.trunc(limit),
          });
          const view = dutySearchView(result, system);
          if (o.json) {
            out(JSON.stringify(view, null, 2));
            return EXIT_OK;
          }
          const u = view.units;
          out(`Duty ${num(view.duty.flow)} ${u.flow} at ${num(view.duty.head)} ${u.head}: ${matchSentence(view)}`);
          if (view.candidates.length) out(searchTable(view));
          out(view.notice);
          return EXIT_OK;
        }),
      ),
    );

  withFile(library.command('show').description('print an entry’s curve set (latest revision unless --revision)').argument('<id>'))
    .option('--revision <n>', 'which revision')
    .option('--raw', 'print the stored text exactly, without indentation')
    .option('-o, --output <file>', 'write to a file instead')
    .action((id: string, o: LibraryFlag & { revision?: string; raw?: boolean; output?: string }) =>
      runCommand(() =>
        withLibrary(o.library, false, (store) => {
          const rev = positiveOption(o.revision, '--revision');
          const stored = store.get(entryId(id), rev === undefined ? undefined : Math.trunc(rev));
          const text = o.raw ? `${stored.body}\n` : `${JSON.stringify(JSON.parse(stored.body), null, 2)}\n`;
          if (o.output) {
            writeTextAtomic(o.output, text);
            out(`wrote ${o.output} (entry ${stored.id} revision ${stored.revision})`);
          } else process.stdout.write(text);
          return EXIT_OK;
        }),
      ),
    );

  withFile(library.command('revisions').description('list the revisions of an entry').argument('<id>')).action((id: string, o: LibraryFlag) =>
    runCommand(() =>
      withLibrary(o.library, false, (store) => {
        const info = store.info(entryId(id));
        out(`${info.id}: ${info.name}${info.archived_at ? ` (archived ${info.archived_at})` : ''}`);
        out(table([['revision', 'saved at', 'bytes', 'sha256'], ...store.revisions(info.id).map((r) => [String(r.revision), r.saved_at, String(r.bytes), r.sha256])]));
        return EXIT_OK;
      }),
    ),
  );

  for (const [name, what] of [['archive', 'archive an entry (it stays in the file and can be restored)'], ['restore', 'bring an archived entry back']] as const) {
    withFile(library.command(name).description(what).argument('<id>')).action((id: string, o: LibraryFlag) =>
      runCommand(() =>
        withLibrary(o.library, false, (store) => {
          const info = name === 'archive' ? store.archive(entryId(id)) : store.restore(entryId(id));
          out(`${info.id} ${info.archived_at ? `archived at ${info.archived_at}` : 'is active'}: ${info.name}`);
          return EXIT_OK;
        }),
      ),
    );
  }

  withFile(library.command('export').description('write the whole library as JSON Lines'))
    .option('-o, --output <file>', 'file to write (default: standard output)')
    .action((o: LibraryFlag & { output?: string }) =>
      runCommand(() =>
        withLibrary(o.library, false, async (store) => {
          if (!o.output) {
            for (const line of exportLines(store)) {
              if (!process.stdout.write(`${line}\n`)) await once(process.stdout, 'drain');
            }
            return EXIT_OK;
          }
          const target = resolve(o.output);
          if (!existsSync(dirname(target))) throw new LibraryError(`Cannot write "${o.output}": the folder does not exist.`, 'invalid');
          const tmp = join(dirname(target), `.${basename(target)}.${process.pid}.tmp`);
          const stream = createWriteStream(tmp);
          try {
            for (const line of exportLines(store)) {
              if (!stream.write(`${line}\n`)) await once(stream, 'drain');
            }
            stream.end();
            await once(stream, 'finish');
            renameSync(tmp, target);
          } catch (error) {
            stream.destroy();
            if (existsSync(tmp)) unlinkSync(tmp);
            throw error;
          }
          out(`wrote ${o.output} (${statSync(target).size} bytes)`);
          return EXIT_OK;
        }),
      ),
    );

  withFile(library.command('import').description('add a JSON Lines export to the library, all or nothing').argument('<file>', 'file written by "library export"'))
    .action((file: string, o: LibraryFlag) =>
      runCommand(() => {
        if (!existsSync(file) || statSync(file).isDirectory()) throw new LibraryError(`The import file "${file}" does not exist.`, 'not-found');
        return withLibrary(o.library, true, async (store) => {
          const report = await importLines(store, linesOf(createReadStream(file)));
          out(
            `imported: ${report.entries_created} new entries, ${report.entries_extended} entries with new revisions, ${report.revisions_added} revisions added, ` +
              `${report.revisions_already_present} already present, ${report.sheets_added} sheets, ${report.takeoffs_added} take-off files.`,
          );
          return EXIT_OK;
        });
      }),
    );

  withFile(library.command('backup').description('copy the library to a new file while it stays in use (online backup)').argument('<file>', 'backup file to create'))
    .action((file: string, o: LibraryFlag) =>
      runCommand(() =>
        withLibrary(o.library, false, async (store) => {
          const { pages } = await store.backup(resolve(file));
          out(`backed up ${store.file} to ${resolve(file)} (${pages} pages).`);
          return EXIT_OK;
        }),
      ),
    );
}
