/**
 * `pumpscribe library …` — the office pump library from the command line, on the same store,
 * search and export code as the server. Works while the server runs (SQLite WAL, one writer at a time).
 * Only opening (and removing a library file a failed command created) knows the store is SQLite;
 * every command works through LibraryBackend.
 */
import type { Command } from 'commander';
import { createReadStream, createWriteStream, existsSync, renameSync, statSync, unlinkSync } from 'node:fs';
import { basename, dirname, join, resolve } from 'node:path';
import { once } from 'node:events';
import { LibraryError } from '../../library/errors.ts';
import { LibraryStore } from '../../library/store.ts';
import type { LibraryBackend } from '../../library/backend.ts';
import { searchByDuty } from '../../library/dutySearch.ts';
import { libraryMatcher } from '../../library/matcher.ts';
import { dutyFromDisplay, dutySearchView, matchSentence, unitSystemNamed, type DutySearchView } from '../../library/dutyView.ts';
import { exportLines, importLines } from '../../library/transfer.ts';
import { linesOf } from '../../library/lines.ts';
import { removeLibraryFiles, restoreLibrary } from '../../library/restore.ts';
import type { DamagedRow } from '../../library/dutySearch.ts';
import type { EntryInfo } from '../../library/types.ts';
import { DEFAULT_LIBRARY_FILE } from '../../library/defaultFile.ts'; // not the server's module: it would load the web server
import { fromSI, parseUnit, presetNamed, resolveUnits, showNumber, toSI, type PresetName, type Unit } from '../../units/index.ts';
import { EXIT_FAILED_CHECKS, EXIT_OK, runCommand } from '../errors.ts';
import { checkRevision } from '../../library/validate.ts';
import { storageFault } from '../../library/storage.ts';
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
  const store = LibraryStore.open(path);
  for (const notice of store.importNotices) process.stderr.write(`pumpscribe: ${notice}\n`);
  return store;
}

/** Runs `body` on the library; a library file this command created is removed again when it fails. */
async function withLibrary<T>(file: string, create: boolean, body: (store: LibraryBackend) => T | Promise<T>): Promise<T> {
  const store = openLibrary(file, create);
  let ok = false;
  try {
    const result = await body(store);
    ok = true;
    return result;
  } finally {
    store.close();
    if (!ok && store.isNew && store.file !== ':memory:') removeLibraryFiles(store.file);
  }
}

/**
 * Runs a command on an existing library: opens it, runs `body`, closes it; exits 0 unless `body`
 * returns another code.
 */
function onLibrary(file: string, body: (store: LibraryBackend) => void | number | Promise<void | number>): Promise<never> {
  return runCommand(() => withLibrary(file, false, async (store) => (await body(store)) ?? EXIT_OK));
}

/** A table cell: the figure by the one formatter, or a dash where there is none. */
function num(value: number | null | undefined, digits = 4): string {
  const shown = showNumber(value, digits);
  return shown.ok ? shown.text : '—';
}

function table(rows: string[][]): string {
  const widths = rows[0]?.map((_, i) => Math.max(...rows.map((r) => (r[i] ?? '').length))) ?? [];
  return rows.map((r) => r.map((c, i) => c.padEnd(widths[i] ?? 0)).join('  ').trimEnd()).join('\n');
}

/** A unit of the entry's own display units, or the SI preset's when the entry names none Pumpscribe knows. */
function ownUnit(e: EntryInfo, kind: 'flow' | 'head' | 'diameter'): Unit {
  try {
    return parseUnit(kind, e.display_units[kind] ?? '');
  } catch {
    return resolveUnits(presetNamed('si'))[kind];
  }
}

/** Entries with their figures in `system`, or each in its own units (the default), units beside every number. */
function entryTable(entries: EntryInfo[], system: PresetName | 'own'): string {
  const fixed = system === 'own' ? null : resolveUnits(presetNamed(system));
  const rows = [['id', 'rev', 'name', 'maker', 'rpm', 'diameters', 'flow', 'head', 'BEP η %', 'checks']];
  for (const e of entries) {
    const d = fixed?.diameter ?? ownUnit(e, 'diameter');
    const f = fixed?.flow ?? ownUnit(e, 'flow');
    const h = fixed?.head ?? ownUnit(e, 'head');
    rows.push([
      e.id,
      String(e.revision),
      e.name,
      e.maker ?? '',
      num(e.speed_rpm, 5),
      e.diameters_m.length ? `${e.diameters_m.map((x) => num(fromSI(x, d))).join(', ')} ${d.label}` : '—',
      `${num(fromSI(e.flow_range_m3s[0], f), 3)}–${num(fromSI(e.flow_range_m3s[1], f), 3)} ${f.label}`,
      `${num(fromSI(e.head_range_m[0], h), 3)}–${num(fromSI(e.head_range_m[1], h), 3)} ${h.label}`,
      e.bep ? num(e.bep.efficiency * 100, 3) : '—',
      e.findings.fail_count ? `FAILING (${e.findings.fail_codes.join(', ')})` : e.findings.warn_count ? `${e.findings.warn_count} warn` : 'ok',
    ]);
  }
  return table(rows);
}

/**
 * A duty figure: a plain number in the unit system given by --units, or a number with its unit
 * beside it ("120 m3/h", "500gpm", "40 m") when --units is not given. Returns SI.
 */
function dutyFigure(value: string, flag: string, kind: 'flow' | 'head', system: PresetName | null): number {
  const m = /^\s*([+]?(?:\d+\.?\d*|\.\d+)(?:[eE][-+]?\d+)?)\s*(.*?)\s*$/.exec(value);
  const x = m ? Number(m[1]) : Number.NaN;
  if (!m || !Number.isFinite(x) || (x <= 0 && flag !== '--static') || x < 0) {
    throw new LibraryError(`The option ${flag} must be a positive number${system ? '' : ' with its unit'}, not "${value.slice(0, 40)}".`, 'invalid');
  }
  const token = m[2] ?? '';
  if (token) return toSI(x, parseUnit(kind, token));
  if (!system) {
    throw new LibraryError(`Say which unit ${flag} is in: write it beside the number (${flag} "${x} ${kind === 'flow' ? 'm3/h' : 'm'}") or give --units si|us.`, 'invalid');
  }
  return toSI(x, resolveUnits(presetNamed(system))[kind]);
}

function searchTable(view: DutySearchView): string {
  const rows = [['#', 'name', 'id', 'diameter', 'η %', 'power', 'NPSHr', 'POR', 'annual cost', 'cautions']];
  view.candidates.forEach((c, i) => {
    const u = c.units;
    const cautions = c.failing ? [`FAILING checks (${c.fail_codes.join(', ')}), ranked after sound pumps`, ...c.warnings] : c.warnings;
    rows.push([
      String(i + 1),
      c.name,
      c.id,
      c.diameter === null ? '—' : `${num(c.diameter)} ${u.diameter}${c.trimmed ? ' trim' : ''}`,
      num(c.efficiency, 3),
      c.power === null ? '—' : `${num(c.power, 3)} ${u.power}`,
      c.npshr === null ? '—' : `${num(c.npshr, 3)} ${u.npshr}`,
      c.por.flow_to_bep_percent === null ? c.por.position : `${c.por.position} (${num(c.por.flow_to_bep_percent, 3)} % BEP)`,
      num(c.annual_cost, 4),
      cautions.join('; '),
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
    .option('--accept-failing', 'keep curve sets whose checks found a fail (they are marked, and ranked last by find)')
    .option('--as-new-revision-of <id>', 'add the one file as the next revision of this entry, even if it names another pump')
    .action((files: string[], o: LibraryFlag & { acceptFailing?: boolean; asNewRevisionOf?: string }) =>
      runCommand(() => {
        const sets = files.map((f) => ({ file: f, set: readCurveSet(f) }));
        const acceptFailing = o.acceptFailing === true;
        if (o.asNewRevisionOf !== undefined) {
          if (sets.length !== 1) throw new LibraryError('--as-new-revision-of takes exactly one curve-set file.', 'invalid');
          const { set } = sets[0]!;
          return withLibrary(o.library, false, (store) => {
            const saved = store.addRevision(entryId(o.asNewRevisionOf as string), set, { asNewRevision: true, acceptFailing });
            out(`saved ${saved.id} revision ${saved.revision}: ${set.pump.name}`);
            return EXIT_OK;
          });
        }
        return withLibrary(o.library, true, (store) => {
          // Every file passes the library's gates before the first is added.
          for (const { file, set } of sets) checkRevision(set, { what: `The curve set ${basename(file)}`, acceptFailing });
          for (const { file, set } of sets) {
            const saved = store.create(set, { acceptFailing });
            out(`added ${saved.id} revision ${saved.revision}: ${set.pump.name} (${basename(file)})`);
          }
          out(`Library file: ${resolve(o.library)}`);
          return EXIT_OK;
        });
      }),
    );

  withFile(library.command('update').description('add a new revision to an entry (the same pump: maker, model, size and name)').argument('<id>').argument('<file>', '*.curveset.json file'))
    .option('--expect-revision <n>', 'refuse if the entry is no longer at this revision')
    .option('--accept-failing', 'keep the curve set even if its checks found a fail (it is marked)')
    .action((id: string, file: string, o: LibraryFlag & { expectRevision?: string; acceptFailing?: boolean }) =>
      runCommand(() => {
        const set = readCurveSet(file);
        const expected = positiveOption(o.expectRevision, '--expect-revision');
        return withLibrary(o.library, false, (store) => {
          const saved = store.addRevision(entryId(id), set, { ...(expected === undefined ? {} : { expectedRevision: expected }), acceptFailing: o.acceptFailing === true });
          out(`saved ${saved.id} revision ${saved.revision}: ${set.pump.name}`);
          return EXIT_OK;
        });
      }),
    );

  withFile(library.command('list').description('list entries, optionally those whose names contain words; figures in each set’s own units unless --units'))
    .option('--q <text>', 'words the name, maker or model must contain')
    .option('--archived', 'list archived entries instead')
    .option('--units <system>', 'show every entry in si or us units (default: each set in its own units)')
    .option('--json', 'print JSON')
    .action((o: LibraryFlag & { q?: string; archived?: boolean; units?: string; json?: boolean }) =>
      onLibrary(o.library, (store) => {
        const system = o.units === undefined ? 'own' : unitSystemNamed(o.units);
        const result = store.list({ q: o.q ?? '', archived: o.archived === true, limit: 1000 });
        if (o.json) out(JSON.stringify(result, null, 2));
        else {
          out(result.entries.length ? entryTable(result.entries, system) : 'No entries match.');
          out(`${result.entries.length} of ${result.total} shown.${store.readonly ? ` (read-only: ${store.readonlyReason})` : ''}`);
        }
      }),
    );

  withFile(library.command('find').description('rank the pumps that can meet a duty point (a captured diameter or a trim between them)'))
    .requiredOption('--flow <Q>', 'duty flow: a number with its unit ("120 m3/h", "500 gpm"), or a plain number with --units')
    .requiredOption('--head <H>', 'duty head: a number with its unit ("40 m", "130 ft"), or a plain number with --units')
    .option('--units <system>', 'si or us: the unit of plain numbers, and of every figure shown (default: each pump in its own units)')
    .option('--static <H0>', 'static head of the system, same form as --head')
    .option('--hours <n>', 'operating hours per year (with --tariff: rank by annual energy cost)')
    .option('--tariff <price>', 'energy price per kWh')
    .option('--limit <n>', 'most candidates to show', '10')
    .option('--json', 'print JSON')
    .action((o: LibraryFlag & { flow: string; head: string; units?: string; static?: string; hours?: string; tariff?: string; limit: string; json?: boolean }) =>
      onLibrary(o.library, (store) => {
        const system = o.units === undefined ? null : unitSystemNamed(o.units);
        const duty = {
          flow_m3s: dutyFigure(o.flow, '--flow', 'flow', system),
          head_m: dutyFigure(o.head, '--head', 'head', system),
          ...(o.static === undefined ? {} : { static_head_m: dutyFigure(o.static, '--static', 'head', system) }),
        };
        const hours = positiveOption(o.hours, '--hours');
        const tariff = o.tariff === undefined ? undefined : Number(o.tariff);
        if (tariff !== undefined && !Number.isFinite(tariff)) throw new LibraryError(`The option --tariff must be a number, not "${o.tariff}".`, 'invalid');
        const limit = positiveOption(o.limit, '--limit') as number;
        const result = searchByDuty(store, duty, libraryMatcher, {
          ...(hours === undefined ? {} : { hoursPerYear: hours }),
          ...(tariff === undefined ? {} : { tariffPerKWh: tariff }),
          limit: Math.trunc(limit),
        });
        const dutyUnits = system ?? (/gpm|ft/i.test(`${o.flow} ${o.head}`) ? 'us' : 'si');
        const view = dutySearchView(result, system ?? 'own', dutyUnits);
        if (o.json) {
          out(JSON.stringify(view, null, 2));
          return EXIT_OK;
        }
        const u = view.units;
        out(`Duty ${num(view.duty.flow)} ${u.flow} at ${num(view.duty.head)} ${u.head}: ${matchSentence(view)}`);
        if (view.candidates.length) out(searchTable(view));
        out(view.notice);
      }),
    );

  withFile(library.command('show').description('print an entry’s curve set (latest revision unless --revision)').argument('<id>'))
    .option('--revision <n>', 'which revision')
    .option('--raw', 'print the stored text exactly, without indentation')
    .option('-o, --output <file>', 'write to a file instead')
    .action((id: string, o: LibraryFlag & { revision?: string; raw?: boolean; output?: string }) =>
      onLibrary(o.library, (store) => {
        const rev = positiveOption(o.revision, '--revision');
        const stored = store.get(entryId(id), rev === undefined ? undefined : Math.trunc(rev));
        const text = o.raw ? `${stored.body}\n` : `${JSON.stringify(JSON.parse(stored.body), null, 2)}\n`;
        if (o.output) {
          writeTextAtomic(o.output, text);
          out(`wrote ${o.output} (entry ${stored.id} revision ${stored.revision})`);
        } else process.stdout.write(text);
      }),
    );

  withFile(library.command('revisions').description('list the revisions of an entry').argument('<id>')).action((id: string, o: LibraryFlag) =>
    onLibrary(o.library, (store) => {
      const info = store.info(entryId(id));
      out(`${info.id}: ${info.name}${info.archived_at ? ` (archived ${info.archived_at})` : ''}`);
      out(table([['revision', 'saved at', 'bytes', 'sha256'], ...store.revisions(info.id).map((r) => [String(r.revision), r.saved_at, String(r.bytes), r.sha256])]));
    }),
  );

  withFile(library.command('archive').description('archive an entry (it stays in the file and can be restored)').argument('<id>')).action((id: string, o: LibraryFlag) =>
    onLibrary(o.library, (store) => {
      const info = store.archive(entryId(id));
      out(`${info.id} archived at ${info.archived_at}: ${info.name}`);
    }),
  );

  withFile(
    library
      .command('restore')
      .description('bring an archived entry back, or (--from) restore a whole library from a backup or an export into a new file')
      .argument('[id]', 'the archived entry'),
  )
    .option('--from <backup>', 'a file made by "library backup" or "library export"; --library names the new library file')
    .option('--accept-failing', 'with an export: take curve sets with failing checks (marked)')
    .action((id: string | undefined, o: LibraryFlag & { from?: string; acceptFailing?: boolean }) =>
      runCommand(async () => {
        if (o.from !== undefined) {
          if (id !== undefined) throw new LibraryError('Give either an entry id or --from, not both.', 'invalid');
          const target = resolve(o.library);
          const r = await restoreLibrary(resolve(o.from), target, { acceptFailing: o.acceptFailing === true });
          out(`restored ${r.entries} entries from ${r.kind === 'copy' ? 'the backup copy' : 'the export'} ${o.from} into ${target}.`);
          return EXIT_OK;
        }
        if (id === undefined) throw new LibraryError('Say which archived entry to restore (its id), or give --from <backup> to restore a whole library.', 'invalid');
        return withLibrary(o.library, false, (store) => {
          const info = store.restore(entryId(id));
          out(`${info.id} is active: ${info.name}`);
          return EXIT_OK;
        });
      }),
    );

  withFile(library.command('export').description('write the whole library as JSON Lines; refuses to write a backup that could not be imported'))
    .option('-o, --output <file>', 'file to write (default: standard output)')
    .option('--skip-damaged', 'leave out entries with a damaged revision (named on stderr) instead of refusing')
    .action((o: LibraryFlag & { output?: string; skipDamaged?: boolean }) =>
      onLibrary(o.library, async (store) => {
        const skipped: DamagedRow[] = [];
        const options = { skipDamaged: o.skipDamaged === true, skipped };
        const tellSkipped = () => {
          for (const d of skipped) process.stderr.write(`pumpscribe: left out ${d.id}${d.revision ? ` (revision ${d.revision})` : ''}: ${d.problem}\n`);
        };
        if (!o.output) {
          // Check everything first, so that a refusal never leaves half a backup on standard output.
          for (const _line of exportLines(store, { skipDamaged: o.skipDamaged === true })) void _line;
          for (const line of exportLines(store, options)) {
            if (!process.stdout.write(`${line}\n`)) await once(process.stdout, 'drain');
          }
          tellSkipped();
          return EXIT_OK;
        }
        const target = resolve(o.output);
        if (!existsSync(dirname(target))) throw new LibraryError(`Cannot write "${o.output}": the folder does not exist.`, 'invalid');
        const tmp = join(dirname(target), `.${basename(target)}.${process.pid}.tmp`);
        const stream = createWriteStream(tmp);
        let streamError: unknown = null;
        stream.on('error', (error) => {
          streamError = error;
        });
        try {
          for (const line of exportLines(store, options)) {
            if (streamError) throw streamError;
            if (!stream.write(`${line}\n`)) await once(stream, 'drain');
          }
          stream.end();
          await once(stream, 'finish');
          if (streamError) throw streamError;
          renameSync(tmp, target);
        } catch (error) {
          if (!stream.destroyed) {
            stream.destroy();
            await once(stream, 'close').catch(() => undefined);
          }
          if (existsSync(tmp)) unlinkSync(tmp);
          throw storageFault(error, target) ?? error;
        }
        tellSkipped();
        out(`wrote ${o.output} (${statSync(target).size} bytes${skipped.length ? `; ${skipped.length} damaged rows left out` : ''})`);
      }),
    );

  withFile(library.command('import').description('add a JSON Lines export to the library, all or nothing (written in batches; a failed or killed import is removed again)').argument('<file>', 'file written by "library export"'))
    .option('--accept-failing', 'take curve sets whose checks found a fail (they are marked) even where the export does not say so')
    .action((file: string, o: LibraryFlag & { acceptFailing?: boolean }) =>
      runCommand(() => {
        if (!existsSync(file) || statSync(file).isDirectory()) throw new LibraryError(`The import file "${file}" does not exist.`, 'not-found');
        return withLibrary(o.library, true, async (store) => {
          const report = await importLines(store, linesOf(createReadStream(file)), { acceptFailing: o.acceptFailing === true, source: basename(file) });
          out(
            `imported: ${report.entries_created} new entries, ${report.entries_extended} entries with new revisions, ${report.revisions_added} revisions added, ` +
              `${report.revisions_already_present} already present, ${report.sheets_added} sheets, ${report.takeoffs_added} take-off files.`,
          );
          return EXIT_OK;
        });
      }),
    );

  withFile(library.command('verify').description('read every row of the library and name each damaged one (exit 1 when any is)'))
    .option('--json', 'print JSON')
    .action((o: LibraryFlag & { json?: boolean }) =>
      onLibrary(o.library, (store) => {
        const report = store.verify();
        if (o.json) out(JSON.stringify(report, null, 2));
        else {
          for (const d of report.damaged) out(`damaged ${d.kind} ${d.id}${d.revision ? ` revision ${d.revision}` : ''}: ${d.problem}`);
          out(
            report.damaged.length
              ? `${report.damaged.length} damaged row${report.damaged.length === 1 ? '' : 's'} in ${report.entries} entries, ${report.revisions} revisions and ${report.sheets} sheets; "library export --skip-damaged" writes a backup of every sound entry.`
              : `No damaged rows: ${report.entries} entries, ${report.revisions} revisions and ${report.sheets} sheets read.`,
          );
        }
        return report.damaged.length ? EXIT_FAILED_CHECKS : EXIT_OK;
      }),
    );

  withFile(library.command('backup').description('copy the library to a new file while it stays in use (online backup)').argument('<file>', 'backup file to create'))
    .action((file: string, o: LibraryFlag) =>
      onLibrary(o.library, async (store) => {
        const { pages } = await store.backup(resolve(file));
        out(`backed up ${resolve(o.library)} to ${resolve(file)} (${pages} pages).`);
      }),
    );
}
