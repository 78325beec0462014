import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { mkdtempSync, rmSync, existsSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import Database from 'better-sqlite3';
import { LibraryStore } from '../../src/library/store.ts';
import { LibraryError } from '../../src/library/errors.ts';
import { FAMILIES, inventedCurveSet } from './fixtures.ts';

let dir: string;
let file: string;
beforeEach(() => {
  dir = mkdtempSync(join(tmpdir(), 'pumpscribe-store-'));
  file = join(dir, 'library.sqlite');
});
afterEach(() => rmSync(dir, { recursive: true, force: true }));

describe('library store', () => {
  it('creates a new file in WAL mode and reports it as new', () => {
    const store = LibraryStore.open(file);
    expect(store.isNew).toBe(true);
    expect(store.db.pragma('journal_mode', { simple: true })).toBe('wal');
    store.close();
    const again = LibraryStore.open(file);
    expect(again.isNew).toBe(false);
    again.close();
  });

  it('keeps a curve set exactly and numbers each save as a new revision', () => {
    const store = LibraryStore.open(file);
    const set = inventedCurveSet(FAMILIES.mid);
    const saved = store.create(set);
    expect(saved.revision).toBe(1);
    expect(JSON.parse(store.get(saved.id).body)).toEqual(set);
    const changed = { ...set, pump: { ...set.pump, name: 'Invented Mid, renamed' } };
    expect(() => store.addRevision(saved.id, changed)).toThrow(/holds "Invented Mid 80-250"/);
    expect(store.addRevision(saved.id, changed, { asNewRevision: true }).revision).toBe(2);
    expect(JSON.parse(store.get(saved.id).body).pump.name).toBe('Invented Mid, renamed');
    expect(JSON.parse(store.get(saved.id, 1).body)).toEqual(set);
    expect(store.revisions(saved.id).map((r) => r.revision)).toEqual([1, 2]);
    expect(store.info(saved.id).name).toBe('Invented Mid, renamed');
    store.close();
  });

  it('refuses an invalid curve set and stores nothing', () => {
    const store = LibraryStore.open(file);
    const bad = { ...inventedCurveSet(FAMILIES.small), speed_rpm: -5 };
    expect(() => store.create(bad)).toThrow(LibraryError);
    expect(() => store.create({ hello: 'world' })).toThrow(/not a curve set/);
    expect(store.counts()).toEqual({ entries: 0, archived: 0, revisions: 0, sheets: 0 });
    store.close();
  });

  it('refuses a stale revision when the caller says which one it edited', () => {
    const store = LibraryStore.open(file);
    const set = inventedCurveSet(FAMILIES.small);
    const { id } = store.create(set);
    store.addRevision(id, set, { expectedRevision: 1 });
    expect(() => store.addRevision(id, set, { expectedRevision: 1 })).toThrow(/is at revision 2/);
    store.close();
  });

  it('archives instead of deleting, hides archived entries from lists, and restores them', () => {
    const store = LibraryStore.open(file);
    const a = store.create(inventedCurveSet(FAMILIES.small));
    store.create(inventedCurveSet(FAMILIES.large));
    store.archive(a.id);
    expect(store.list().entries.map((e) => e.id)).not.toContain(a.id);
    expect(store.list({ archived: true }).entries.map((e) => e.id)).toEqual([a.id]);
    expect(() => store.addRevision(a.id, inventedCurveSet(FAMILIES.small))).toThrow(/archived/);
    expect(JSON.parse(store.get(a.id).body).pump.name).toBe(FAMILIES.small.name);
    store.restore(a.id);
    expect(store.list().total).toBe(2);
    store.close();
  });

  it('cannot overwrite or delete a revision even with raw SQL', () => {
    const store = LibraryStore.open(file);
    const { id } = store.create(inventedCurveSet(FAMILIES.small));
    expect(() => store.db.prepare(`UPDATE revisions SET body = '{}'`).run()).toThrow(/append-only/);
    expect(() => store.db.prepare('DELETE FROM revisions').run()).toThrow(/append-only/);
    expect(() => store.db.prepare('DELETE FROM entries WHERE id = ?').run(id)).toThrow(/never deleted/);
    store.close();
  });

  it('finds entries by every word of a text query, case-insensitively, treating % and _ literally', () => {
    const store = LibraryStore.open(file);
    store.create(inventedCurveSet(FAMILIES.small));
    store.create(inventedCurveSet(FAMILIES.mid));
    store.create(inventedCurveSet({ ...FAMILIES.large, name: '100% Invented_Large' }));
    expect(store.list({ q: 'invented mid' }).entries.map((e) => e.name)).toEqual([FAMILIES.mid.name]);
    expect(store.list({ q: 'INVENTED' }).total).toBe(3);
    expect(store.list({ q: '100%' }).entries.map((e) => e.name)).toEqual(['100% Invented_Large']);
    expect(store.list({ q: '_' }).total).toBe(1);
    store.close();
  });

  it('keeps searchable summary columns of the latest revision', () => {
    const store = LibraryStore.open(file);
    const { id } = store.create(inventedCurveSet(FAMILIES.mid));
    const info = store.info(id);
    // The fixture's diameters are 0.84, 0.92 and 1 × 0.26 m (exact to rounding, 1e-12).
    expect(info.diameters_m[0]).toBeCloseTo(0.84 * 0.26, 12);
    expect(info.diameters_m[2]).toBeCloseTo(0.26, 12);
    // Head envelope: shutoff of the full impeller is 58 m (fixture law, exact to 1e-9).
    expect(info.head_range_m[1]).toBeCloseTo(58, 9);
    expect(info.flow_range_m3s[0]).toBe(0);
    expect(info.flow_range_m3s[1]).toBeCloseTo((1.3 * 140) / 3600, 12);
    expect(info.bep?.efficiency).toBe(0.79);
    store.close();
  });

  it('refuses to open a SQLite file that is not a library, and a file that is not SQLite', () => {
    const other = join(dir, 'other.sqlite');
    const db = new Database(other);
    db.exec('CREATE TABLE t (x)');
    db.close();
    expect(() => LibraryStore.open(other)).toThrow(/not a Pumpscribe library/);
    const text = join(dir, 'notes.txt');
    writeFileSync(text, 'this is not a database at all, just some words '.repeat(40));
    expect(() => LibraryStore.open(text)).toThrow(LibraryError);
  });

  it('stores a sheet once by SHA-256 and names its media type from the bytes', () => {
    const store = LibraryStore.open(file);
    const pdf = Buffer.from('%PDF-1.4\n% invented test sheet\n');
    const first = store.sheets.put(pdf, '../../etc/passwd');
    const second = store.sheets.put(pdf, 'again.pdf');
    expect(first.created).toBe(true);
    expect(second.created).toBe(false);
    expect(first.media_type).toBe('application/pdf');
    expect(first.name).toBe('passwd');
    expect(store.sheets.put(Buffer.from('<html><script>alert(1)</script>'), 'x.html').media_type).toBe('application/octet-stream');
    expect(store.counts().sheets).toBe(2);
    expect(Buffer.compare(store.sheets.get(first.sha256).bytes, pdf)).toBe(0);
    store.close();
  });

  it('makes an online backup to a new file and refuses to overwrite an existing one', async () => {
    const store = LibraryStore.open(file);
    store.create(inventedCurveSet(FAMILIES.mid));
    const copy = join(dir, 'backup.sqlite');
    await store.backup(copy);
    expect(existsSync(copy)).toBe(true);
    const restored = LibraryStore.open(copy);
    expect(restored.counts().entries).toBe(1);
    restored.close();
    await expect(store.backup(copy)).rejects.toThrow(/already exists/);
    store.close();
  });
});
