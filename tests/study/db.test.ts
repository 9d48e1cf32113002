import Database from 'better-sqlite3';
import { mkdtempSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { UserError } from '../../src/errors.js';
import { createStudy, inTransaction, openStudy } from '../../src/study/db.js';
import { SCHEMA_VERSION } from '../../src/study/schema.js';

const tmp = () => mkdtempSync(join(tmpdir(), 'trellis-db-'));

describe('study.db', () => {
  it('is created in WAL mode with foreign keys on and the current schema version', () => {
    const dir = tmp();
    const db = createStudy(dir);
    expect(db.pragma('journal_mode', { simple: true })).toBe('wal');
    expect(db.pragma('foreign_keys', { simple: true })).toBe(1);
    expect(db.pragma('user_version', { simple: true })).toBe(SCHEMA_VERSION);
    db.close();
    expect(() => createStudy(dir)).toThrow(/already exists/);
  });

  it('refuses a study written by a newer trellis, and a folder with no study', () => {
    const dir = tmp();
    createStudy(dir).close();
    const raw = new Database(join(dir, 'study.db'));
    raw.pragma(`user_version = ${SCHEMA_VERSION + 1}`);
    raw.close();
    expect(() => openStudy(dir)).toThrow(/newer trellis/);
    expect(() => openStudy(tmp())).toThrow(UserError);
  });

  it('migrates an empty database forward to the current schema', () => {
    const dir = tmp();
    new Database(join(dir, 'study.db')).close(); // version 0: no tables
    const db = openStudy(dir);
    expect(db.pragma('user_version', { simple: true })).toBe(SCHEMA_VERSION);
    const tables = (db.prepare("SELECT name FROM sqlite_master WHERE type='table'").all() as { name: string }[]).map((t) => t.name);
    expect(tables).toEqual(expect.arrayContaining(['transcripts', 'passages', 'revisions', 'themes', 'codings']));
    db.close();
  });

  it('rolls back everything an async transaction wrote when it throws', async () => {
    const db = createStudy(tmp());
    await expect(
      inTransaction(db, async () => {
        db.prepare("INSERT INTO meta (key, value) VALUES ('x', '1')").run();
        await new Promise((r) => setTimeout(r, 5));
        throw new UserError('stop');
      }),
    ).rejects.toThrow('stop');
    expect(db.prepare("SELECT * FROM meta WHERE key = 'x'").get()).toBeUndefined();
    db.close();
  });
});
