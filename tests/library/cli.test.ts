/**
 * `pumpscribe library …` against a real library file. Most cases run the command in-process (fast);
 * two run the real command line in a child process, to check exit codes and stderr end to end.
 */
import { afterAll, describe, expect, it } from 'vitest';
import { runLibrary } from './runCli.ts';
import { spawnSync } from 'node:child_process';
import { existsSync, mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { FAMILIES, exactTrimDiameter, inventedCurveSet } from './fixtures.ts';

const dir = mkdtempSync(join(tmpdir(), 'pumpscribe-library-cli-'));
afterAll(() => rmSync(dir, { recursive: true, force: true }));
const tsx = join('node_modules', 'tsx', 'dist', 'cli.mjs');
const lib = join(dir, 'office.sqlite');

function spawnRun(...args: string[]) {
  const r = spawnSync(process.execPath, [tsx, 'src/cli/main.ts', 'library', ...args], { encoding: 'utf8' });
  return { code: r.status, out: r.stdout, err: r.stderr };
}

/** Runs `library …` in this process, capturing stdout, stderr and the exit code. */
const run = runLibrary;

function file(name: string, value: unknown): string {
  const p = join(dir, name);
  writeFileSync(p, typeof value === 'string' ? value : JSON.stringify(value, null, 2));
  return p;
}

describe('pumpscribe library', async () => {
  const small = file('small.curveset.json', inventedCurveSet(FAMILIES.small));
  const mid = file('mid.curveset.json', inventedCurveSet(FAMILIES.mid));
  const large = file('large.curveset.json', inventedCurveSet(FAMILIES.large));
  let midId = '';

  it('add checks every file first and adds none when one is invalid', async () => {
    const bad = file('bad.curveset.json', { ...inventedCurveSet(FAMILIES.small), members: [] });
    const r = await run('add', small, bad, '--library', lib);
    expect(r.code).toBe(2);
    expect(r.err.trim().split('\n')).toHaveLength(1);
    expect(r.err).toMatch(/^pumpscribe: .*members/);
    expect(existsSync(lib)).toBe(false);
  });

  it('add, list and list --json', async () => {
    const r = await run('add', small, mid, large, '--library', lib);
    expect(r.err).toBe('');
    expect(r.code).toBe(0);
    midId = /added ([0-9a-f]{16}) revision 1: Invented Mid/.exec(r.out)?.[1] ?? '';
    expect(midId).toMatch(/^[0-9a-f]{16}$/);
    const list = await run('list', '--library', lib);
    expect(list.out).toContain(FAMILIES.large.name);
    expect(list.out).toContain('3 of 3 shown.');
    const json = JSON.parse((await run('list', '--q', 'mid', '--json', '--library', lib)).out);
    expect(json.entries.map((e: { id: string }) => e.id)).toEqual([midId]);
  });

  it('find --json returns the pump that meets the duty with its trim in inches within 1 %', async () => {
    const r = spawnRun('find', '--flow', String(120 / 0.2271247), '--head', String(40 / 0.3048), '--units', 'us', '--json', '--library', lib);
    expect(r.code).toBe(0);
    const view = JSON.parse(r.out);
    expect(view.candidates.map((c: { id: string }) => c.id)).toEqual([midId]);
    const exactIn = exactTrimDiameter(FAMILIES.mid, 120 / 3600, 40) / 0.0254;
    expect(Math.abs(view.candidates[0].diameter - exactIn) / exactIn).toBeLessThan(0.01);
    const text = await run('find', '--flow', '120', '--head', '40', '--units', 'si', '--library', lib);
    expect(text.out).toMatch(/1 of the \d+ pumps spanning the duty can meet it/);
    expect(text.out).toContain('licensed professional');
  });

  it('find refuses a missing unit system or a non-number with one sentence and exit 2', async () => {
    const r = spawnRun('find', '--flow', '120', '--head', 'forty', '--units', 'si', '--library', lib);
    expect(r.code).toBe(2);
    expect(r.err).toMatch(/^pumpscribe: The option --head must be a positive number, not "forty"\.\n$/);
    expect((await run('find', '--flow', '120', '--head', '40', '--units', 'imperial', '--library', lib)).code).toBe(2);
  });

  it('update adds a revision, show prints it, and show --revision 1 the original', async () => {
    const renamed = file('mid2.curveset.json', inventedCurveSet({ ...FAMILIES.mid, name: 'Invented Mid, revised' }));
    const refused = await run('update', midId, renamed, '--library', lib);
    expect(refused.code).toBe(2);
    expect(refused.err).toMatch(/^pumpscribe: The curve set is for "Invented Mid, revised".*--as-new-revision-of/);
    expect((await run('add', renamed, '--as-new-revision-of', midId, '--library', lib)).out).toMatch(/revision 2/);
    expect(JSON.parse((await run('show', midId, '--library', lib)).out).pump.name).toBe('Invented Mid, revised');
    expect(JSON.parse((await run('show', midId, '--revision', '1', '--library', lib)).out)).toEqual(JSON.parse(readFileSync(mid, 'utf8')));
    expect((await run('revisions', midId, '--library', lib)).out).toMatch(/\n2 /);
    const unknown = await run('show', 'ffffffffffffffff', '--library', lib);
    expect(unknown.code).toBe(2);
    expect(unknown.err).toMatch(/No library entry/);
  });

  it('archive hides an entry from list and find; restore brings it back', async () => {
    await run('archive', midId, '--library', lib);
    expect((await run('list', '--library', lib)).out).not.toContain('Invented Mid');
    expect(JSON.parse((await run('find', '--flow', '120', '--head', '40', '--units', 'si', '--json', '--library', lib)).out).candidates).toEqual([]);
    await run('restore', midId, '--library', lib);
    expect((await run('list', '--library', lib)).out).toContain('Invented Mid, revised');
  });

  it('export, import into a new library and backup keep every revision', async () => {
    const exported = join(dir, 'office.jsonl');
    expect((await run('export', '-o', exported, '--library', lib)).code).toBe(0);
    const copy = join(dir, 'copy.sqlite');
    const imp = await run('import', exported, '--library', copy);
    expect(imp.code).toBe(0);
    expect(imp.out).toMatch(/3 new entries, 0 entries with new revisions, 4 revisions added/);
    expect((await run('show', midId, '--revision', '1', '--raw', '--library', copy)).out).toBe((await run('show', midId, '--revision', '1', '--raw', '--library', lib)).out);
    const backup = join(dir, 'backup.sqlite');
    expect((await run('backup', backup, '--library', lib)).code).toBe(0);
    expect((await run('list', '--library', backup)).out).toContain('3 of 3 shown.');
    const again = await run('backup', backup, '--library', lib);
    expect(again.code).toBe(2);
    expect(again.err).toMatch(/already exists/);
    const broken = file('broken.jsonl', '{"kind":"header","format":"pumpscribe.library-export","version":1}\nnot json\n');
    const bad = await run('import', broken, '--library', copy);
    expect(bad.code).toBe(2);
    expect(bad.err).toMatch(/Line 2 .* Nothing was imported\./);
  });
});
