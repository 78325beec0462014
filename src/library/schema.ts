/**
 * The library file's tables and their migrations. `PRAGMA user_version` carries the schema
 * version; each migration moves it up by one inside the same transaction as its DDL.
 * Revisions, sheets and take-offs are append-only: triggers refuse UPDATE and DELETE on them,
 * except (from version 4) the rows an unfinished import wrote, while that import is being undone.
 */
import type Database from 'better-sqlite3';
import { LibraryError } from './errors.ts';

export const LIBRARY_FORMAT = 'pumpscribe.library';
export const SCHEMA_VERSION = 4;

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
  // 1 → 2: sound records and a duty index that scales. Each revision keeps its findings summary;
  // each entry keeps the summary of its latest revision, its display units and its duty slices
  // (dutyIndex.ts), which triggers copy into a three-dimensional R*Tree (flow, head, efficiency bound)
  // for active entries. The old two-dimensional envelope goes; the backfill runs in `migrate`.
  `
  CREATE TABLE revision_summaries (
    entry_id TEXT NOT NULL REFERENCES entries (id),
    revision INTEGER NOT NULL,
    fail_count INTEGER NOT NULL,
    warn_count INTEGER NOT NULL,
    fail_codes TEXT NOT NULL,
    accepted_failing INTEGER NOT NULL CHECK (accepted_failing IN (0, 1)),
    PRIMARY KEY (entry_id, revision)
  ) STRICT;
  ALTER TABLE entries ADD COLUMN fail_count INTEGER NOT NULL DEFAULT 0;
  ALTER TABLE entries ADD COLUMN warn_count INTEGER NOT NULL DEFAULT 0;
  ALTER TABLE entries ADD COLUMN fail_codes TEXT NOT NULL DEFAULT '[]';
  ALTER TABLE entries ADD COLUMN display_units_json TEXT NOT NULL DEFAULT '{}';
  ALTER TABLE entries ADD COLUMN slices_json TEXT NOT NULL DEFAULT '[]';
  DROP TRIGGER entries_envelope_i;
  DROP TRIGGER entries_envelope_u;
  DROP TABLE entries_envelope;
  CREATE VIRTUAL TABLE duty_index USING rtree (slice, flow_min, flow_max, head_min, head_max, eta_min, eta_max, +entry_key, +failing);
  CREATE TRIGGER duty_index_i AFTER INSERT ON entries BEGIN
    INSERT INTO duty_index SELECT NEW.key * 16 + j.key, j.value ->> 0, j.value ->> 1, j.value ->> 2, j.value ->> 3, j.value ->> 4, j.value ->> 4, NEW.key, NEW.fail_count > 0
      FROM json_each(NEW.slices_json) AS j WHERE NEW.archived_at IS NULL AND j.key < 16;
  END;
  CREATE TRIGGER duty_index_u AFTER UPDATE ON entries BEGIN
    DELETE FROM duty_index WHERE slice BETWEEN NEW.key * 16 AND NEW.key * 16 + 15;
    INSERT INTO duty_index SELECT NEW.key * 16 + j.key, j.value ->> 0, j.value ->> 1, j.value ->> 2, j.value ->> 3, j.value ->> 4, j.value ->> 4, NEW.key, NEW.fail_count > 0
      FROM json_each(NEW.slices_json) AS j WHERE NEW.archived_at IS NULL AND j.key < 16;
  END;
  `,
  // 2 → 3: each entry keeps the duty card of its latest revision (dutyCard.ts), so that a duty search
  // bounds a candidate from a few hundred bytes and runs the duty engine only on those that can win.
  // The backfill (backfill.ts) fills it for the rows already there.
  // The index trigger fires only on the columns the index is made of, so filling the card leaves it be.
  // The cards are copied by triggers into a narrow table beside the duty index: an entry row is
  // several kilobytes (its search copy), and reading columns past it would walk its overflow pages.
  `
  ALTER TABLE entries ADD COLUMN duty_card BLOB;
  CREATE TABLE duty_cards (entry_key INTEGER PRIMARY KEY, entry_id TEXT NOT NULL, revision INTEGER NOT NULL, card BLOB) STRICT;
  INSERT INTO duty_cards SELECT key, id, latest_revision, duty_card FROM entries;
  CREATE TRIGGER duty_cards_i AFTER INSERT ON entries BEGIN
    INSERT INTO duty_cards VALUES (NEW.key, NEW.id, NEW.latest_revision, NEW.duty_card);
  END;
  CREATE TRIGGER duty_cards_u AFTER UPDATE OF latest_revision, duty_card ON entries BEGIN
    INSERT OR REPLACE INTO duty_cards VALUES (NEW.key, NEW.id, NEW.latest_revision, NEW.duty_card);
  END;
  DROP TRIGGER duty_index_u;
  CREATE TRIGGER duty_index_u AFTER UPDATE OF key, archived_at, fail_count, slices_json ON entries BEGIN
    DELETE FROM duty_index WHERE slice BETWEEN NEW.key * 16 AND NEW.key * 16 + 15;
    INSERT INTO duty_index SELECT NEW.key * 16 + j.key, j.value ->> 0, j.value ->> 1, j.value ->> 2, j.value ->> 3, j.value ->> 4, j.value ->> 4, NEW.key, NEW.fail_count > 0
      FROM json_each(NEW.slices_json) AS j WHERE NEW.archived_at IS NULL AND j.key < 16;
  END;
  `,
  // 3 → 4: imports commit in batches (importJournal.ts). Each import that has not finished has a row
  // in `imports`; every entry it created, entry it added revisions to, sheet and take-off file it
  // stored has a row in `import_rows`, written in the same transaction as the data. A finished
  // import is marked 'finished' with its last batch, then deletes both. An import that fails, or one
  // found stopped while 'running' (its process gone), is undone:
  // its state becomes 'undoing', and only then do the append-only triggers let its own rows go.
  `
  CREATE TABLE imports (
    id INTEGER PRIMARY KEY,
    source TEXT NOT NULL,
    started_at TEXT NOT NULL,
    host TEXT NOT NULL,
    pid INTEGER NOT NULL,
    state TEXT NOT NULL CHECK (state IN ('running', 'finished', 'undoing')),
    entries INTEGER NOT NULL DEFAULT 0
  ) STRICT;
  CREATE TABLE import_rows (
    import_id INTEGER NOT NULL REFERENCES imports (id),
    kind TEXT NOT NULL CHECK (kind IN ('entry', 'revisions', 'sheet', 'takeoff')),
    key TEXT NOT NULL,
    before_revision INTEGER,
    before_updated_at TEXT,
    PRIMARY KEY (import_id, kind, key)
  ) STRICT;
  CREATE INDEX import_rows_key ON import_rows (key, kind);
  DROP TRIGGER revisions_append_only_d;
  CREATE TRIGGER revisions_append_only_d BEFORE DELETE ON revisions
    WHEN NOT EXISTS (SELECT 1 FROM import_rows j JOIN imports i ON i.id = j.import_id
      WHERE i.state = 'undoing' AND j.key = OLD.entry_id AND (j.kind = 'entry' OR (j.kind = 'revisions' AND OLD.revision > j.before_revision)))
    BEGIN SELECT RAISE(ABORT, 'revisions are append-only'); END;
  DROP TRIGGER sheets_append_only_d;
  CREATE TRIGGER sheets_append_only_d BEFORE DELETE ON sheets
    WHEN NOT EXISTS (SELECT 1 FROM import_rows j JOIN imports i ON i.id = j.import_id WHERE i.state = 'undoing' AND j.kind = 'sheet' AND j.key = OLD.sha256)
    BEGIN SELECT RAISE(ABORT, 'sheets are append-only'); END;
  DROP TRIGGER takeoffs_append_only_d;
  CREATE TRIGGER takeoffs_append_only_d BEFORE DELETE ON takeoffs
    WHEN NOT EXISTS (SELECT 1 FROM import_rows j JOIN imports i ON i.id = j.import_id WHERE i.state = 'undoing' AND j.kind = 'takeoff' AND j.key = OLD.id)
    BEGIN SELECT RAISE(ABORT, 'take-offs are append-only'); END;
  DROP TRIGGER entries_no_delete;
  CREATE TRIGGER entries_no_delete BEFORE DELETE ON entries
    WHEN NOT EXISTS (SELECT 1 FROM import_rows j JOIN imports i ON i.id = j.import_id WHERE i.state = 'undoing' AND j.kind = 'entry' AND j.key = OLD.id)
    BEGIN SELECT RAISE(ABORT, 'entries are archived, never deleted'); END;
  CREATE TRIGGER entries_undone AFTER DELETE ON entries BEGIN
    DELETE FROM duty_index WHERE slice BETWEEN OLD.key * 16 AND OLD.key * 16 + 15;
    DELETE FROM duty_cards WHERE entry_key = OLD.key;
  END;
  `,
];

/** Work a migration needs beyond its DDL (filling new columns from stored documents), by target version. */
export type Backfill = (db: Database.Database) => void;

function tableCount(db: Database.Database): number {
  return (db.prepare(`SELECT count(*) AS n FROM sqlite_schema WHERE type = 'table'`).get() as { n: number }).n;
}

/**
 * Refuses a file that is not a Pumpscribe library (or one newer than this code), before anything is
 * written to it: no journal mode is set and no table is created on a foreign file.
 */
export function checkLibraryFile(db: Database.Database): number {
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
  return current;
}

/** Brings the file's schema up to SCHEMA_VERSION, or refuses a file that is not a Pumpscribe library. */
export function migrate(db: Database.Database, now: string, backfill: Partial<Record<number, Backfill>> = {}): void {
  const current = checkLibraryFile(db);
  for (let v = current; v < SCHEMA_VERSION; v++) {
    const step = db.transaction(() => {
      db.exec(MIGRATIONS[v] as string);
      if (v === 0) {
        const put = db.prepare('INSERT INTO meta (key, value) VALUES (?, ?)');
        put.run('format', LIBRARY_FORMAT);
        put.run('created_at', now);
      }
      backfill[v + 1]?.(db);
      db.pragma(`user_version = ${v + 1}`);
    });
    step.immediate();
  }
}
