/**
 * The library file's tables and their migrations. `PRAGMA user_version` carries the schema
 * version; each migration moves it up by one inside the same transaction as its DDL.
 * Revisions, sheets and take-offs are append-only: triggers refuse UPDATE and DELETE on them.
 */
import type Database from 'better-sqlite3';
import { LibraryError } from './errors.ts';

export const LIBRARY_FORMAT = 'pumpscribe.library';
export const SCHEMA_VERSION = 1;

const MIGRATIONS: readonly string[] = [
  // 0 → 1
  `
  CREATE TABLE meta (key TEXT PRIMARY KEY, value TEXT NOT NULL) STRICT;

  CREATE TABLE entries (
    key INTEGER PRIMARY KEY,
    id TEXT NOT NULL UNIQUE,
    created_at TEXT NOT NULL,
    archived_at TEXT,
    latest_revision INTEGER NOT NULL,
    name TEXT NOT NULL,
    maker TEXT,
    model TEXT,
    size TEXT,
    pump_type TEXT,
    family TEXT NOT NULL,
    speed_rpm REAL NOT NULL,
    diameters_json TEXT NOT NULL,
    diameter_min_m REAL,
    diameter_max_m REAL,
    member_count INTEGER NOT NULL,
    flow_min_m3s REAL NOT NULL,
    flow_max_m3s REAL NOT NULL,
    head_min_m REAL NOT NULL,
    head_max_m REAL NOT NULL,
    bep_flow_m3s REAL,
    bep_head_m REAL,
    bep_efficiency REAL,
    search_text TEXT NOT NULL,
    search_json TEXT NOT NULL,
    updated_at TEXT NOT NULL
  ) STRICT;
  -- The head-curve envelope of every active entry with its latest revision, for the duty prefilter
  -- (R*Tree: which boxes contain the duty point). Archived entries are left out.
  CREATE VIRTUAL TABLE entries_envelope USING rtree (entry_key, flow_min, flow_max, head_min, head_max, +entry_id, +revision);
  CREATE TRIGGER entries_envelope_i AFTER INSERT ON entries BEGIN
    INSERT INTO entries_envelope SELECT NEW.key, NEW.flow_min_m3s, NEW.flow_max_m3s, NEW.head_min_m, NEW.head_max_m, NEW.id, NEW.latest_revision
      WHERE NEW.archived_at IS NULL AND NEW.flow_min_m3s <= NEW.flow_max_m3s AND NEW.head_min_m <= NEW.head_max_m;
  END;
  CREATE TRIGGER entries_envelope_u AFTER UPDATE ON entries BEGIN
    DELETE FROM entries_envelope WHERE entry_key = NEW.key;
    INSERT INTO entries_envelope SELECT NEW.key, NEW.flow_min_m3s, NEW.flow_max_m3s, NEW.head_min_m, NEW.head_max_m, NEW.id, NEW.latest_revision
      WHERE NEW.archived_at IS NULL AND NEW.flow_min_m3s <= NEW.flow_max_m3s AND NEW.head_min_m <= NEW.head_max_m;
  END;
  CREATE INDEX entries_name ON entries (name);

  CREATE TABLE revisions (
    entry_id TEXT NOT NULL REFERENCES entries (id),
    revision INTEGER NOT NULL CHECK (revision >= 1),
    saved_at TEXT NOT NULL,
    sha256 TEXT NOT NULL,
    body TEXT NOT NULL,
    source_sha256 TEXT,
    PRIMARY KEY (entry_id, revision)
  ) STRICT;

  CREATE TABLE entry_events (
    seq INTEGER PRIMARY KEY AUTOINCREMENT,
    entry_id TEXT NOT NULL REFERENCES entries (id),
    at TEXT NOT NULL,
    event TEXT NOT NULL CHECK (event IN ('created', 'revised', 'archived', 'restored', 'imported')),
    revision INTEGER
  ) STRICT;

  CREATE TABLE sheets (
    sha256 TEXT PRIMARY KEY,
    name TEXT,
    media_type TEXT NOT NULL,
    size INTEGER NOT NULL,
    bytes BLOB NOT NULL,
    stored_at TEXT NOT NULL
  ) STRICT;

  CREATE TABLE takeoffs (
    id TEXT PRIMARY KEY,
    sheet_sha256 TEXT NOT NULL REFERENCES sheets (sha256),
    name TEXT,
    sha256 TEXT NOT NULL,
    body TEXT NOT NULL,
    saved_at TEXT NOT NULL,
    UNIQUE (sheet_sha256, sha256)
  ) STRICT;

  CREATE TRIGGER revisions_append_only_u BEFORE UPDATE ON revisions BEGIN SELECT RAISE(ABORT, 'revisions are append-only'); END;
  CREATE TRIGGER revisions_append_only_d BEFORE DELETE ON revisions BEGIN SELECT RAISE(ABORT, 'revisions are append-only'); END;
  CREATE TRIGGER sheets_append_only_u BEFORE UPDATE ON sheets BEGIN SELECT RAISE(ABORT, 'sheets are append-only'); END;
  CREATE TRIGGER sheets_append_only_d BEFORE DELETE ON sheets BEGIN SELECT RAISE(ABORT, 'sheets are append-only'); END;
  CREATE TRIGGER takeoffs_append_only_u BEFORE UPDATE ON takeoffs BEGIN SELECT RAISE(ABORT, 'take-offs are append-only'); END;
  CREATE TRIGGER takeoffs_append_only_d BEFORE DELETE ON takeoffs BEGIN SELECT RAISE(ABORT, 'take-offs are append-only'); END;
  CREATE TRIGGER entries_no_delete BEFORE DELETE ON entries BEGIN SELECT RAISE(ABORT, 'entries are archived, never deleted'); END;
  `,
];

function tableCount(db: Database.Database): number {
  return (db.prepare(`SELECT count(*) AS n FROM sqlite_schema WHERE type = 'table'`).get() as { n: number }).n;
}

/** Brings the file's schema up to SCHEMA_VERSION, or refuses a file that is not a Pumpscribe library. */
export function migrate(db: Database.Database, now: string): void {
  const current = db.pragma('user_version', { simple: true }) as number;
  if (current > SCHEMA_VERSION) {
    throw new LibraryError(
      `This library file has schema version ${current}, newer than this Pumpscribe understands (${SCHEMA_VERSION}); update Pumpscribe before opening it.`,
      'unusable-file',
    );
  }
  if (current === 0 && tableCount(db) > 0) {
    throw new LibraryError('This SQLite file holds other tables and is not a Pumpscribe library; choose a new file name for the library.', 'unusable-file');
  }
  if (current >= 1) {
    const format = db.prepare(`SELECT value FROM meta WHERE key = 'format'`).get() as { value: string } | undefined;
    if (format?.value !== LIBRARY_FORMAT) {
      throw new LibraryError('This SQLite file is not a Pumpscribe library; choose a new file name for the library.', 'unusable-file');
    }
  }
  for (let v = current; v < SCHEMA_VERSION; v++) {
    const step = db.transaction(() => {
      db.exec(MIGRATIONS[v] as string);
      if (v === 0) {
        const put = db.prepare('INSERT INTO meta (key, value) VALUES (?, ?)');
        put.run('format', LIBRARY_FORMAT);
        put.run('created_at', now);
      }
      db.pragma(`user_version = ${v + 1}`);
    });
    step.immediate();
  }
}
