import Database from 'better-sqlite3';
import { mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { UserError } from '../../src/errors.js';
import { readTranscriptFile } from '../../src/ingest/read.js';
import { createStudy, openStudy } from '../../src/study/study.js';
import { importTranscripts } from '../../src/jobs/import.js';
import { setTemplate } from '../../src/jobs/revise.js';
import { MIGRATIONS, SCHEMA_VERSION } from '../../src/study/schema.js';

const tmp = () => mkdtempSync(join(tmpdir(), 'trellis-db-'));

describe('the Study handle', () => {
  it('carries the folder with the database: the resolved folder, study.db and template.txt in it', () => {
    const dir = tmp();
    const made = createStudy(join(dir, 'a', '..', 'study'));
    expect(made.dir).toBe(join(dir, 'study'));
    expect(made.file).toBe(join(dir, 'study', 'study.db'));
    expect(readFileSync(made.templateFile, 'utf8')).toMatch(/^# The study's template/);
    made.close();
    const study = openStudy(join(dir, 'study'));
    expect(study.db.open).toBe(true);
    // A use case that writes the study's files finds them through the handle alone.
    setTemplate(study, 'Workload\n  Staffing levels\n', 'outline.txt', 'priya');
    expect(readFileSync(study.templateFile, 'utf8')).toBe('Workload\n  Staffing levels\n');
    study.close();
    expect(study.db.open).toBe(false);
  });
});

describe('study.db', () => {
  it('is created in WAL mode with foreign keys on and the current schema version', () => {
    const dir = tmp();
    const db = createStudy(dir).db;
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

  it('migrates a database of schema version 0 forward to the current schema', () => {
    const dir = tmp();
    const raw = new Database(join(dir, 'study.db'));
    raw.pragma('journal_mode = WAL'); // writes the file's header: an SQLite file with no tables
    raw.close();
    const db = openStudy(dir).db;
    expect(db.pragma('user_version', { simple: true })).toBe(SCHEMA_VERSION);
    const tables = (db.prepare("SELECT name FROM sqlite_master WHERE type='table'").all() as { name: string }[]).map((t) => t.name);
    expect(tables).toEqual(expect.arrayContaining(['transcripts', 'passages', 'revisions', 'themes', 'codings']));
    db.close();
  });

  it('upgrades a schema-7 study to hold quote choices and aliases, its data kept', () => {
    const dir = tmp();
    const raw = new Database(join(dir, 'study.db'));
    for (const m of MIGRATIONS.slice(0, 7)) raw.exec(m);
    raw.pragma('user_version = 7');
    raw.exec("INSERT INTO transcripts VALUES (1, 't1', 't1.txt', 'text', 'h', 's', 0, '2026-01-01');");
    raw.close();
    const db = openStudy(dir).db;
    expect(db.pragma('user_version', { simple: true })).toBeGreaterThanOrEqual(9);
    expect(db.prepare('SELECT name FROM transcripts').all()).toEqual([{ name: 't1' }]);
    db.prepare("INSERT INTO aliases VALUES ('transcript', 't1', 'T01', '2026-01-02')").run();
    expect(() => db.prepare("INSERT INTO aliases VALUES ('speaker', 'Bo', 'T01', 'x'), ('speaker', 'Al', 'T01', 'x')").run()).toThrow(/UNIQUE/);
    db.prepare("INSERT INTO quote_choices (theme_id, passage_id, choice, at, coder) VALUES ('T1', 't1#1', 'pin', 'x', 'ana')").run();
    expect(() => db.prepare("INSERT INTO quote_choices (theme_id, passage_id, choice, at, coder) VALUES ('T1', 't1#2', 'star', 'x', 'ana')").run()).toThrow(/CHECK/);
    db.close();
  });

  it('upgrades a schema-4 study: decisions kept, codings still pointing at them, "nothing to code" allowed, log still append-only', () => {
    const dir = tmp();
    const raw = new Database(join(dir, 'study.db'));
    for (const m of MIGRATIONS.slice(0, 4)) raw.exec(m);
    raw.pragma('user_version = 4');
    raw.exec(`
      INSERT INTO transcripts VALUES (1, 't1', 't1.txt', 'text', 'h', 's', 0, '2026-01-01');
      INSERT INTO passages (id, transcript_id, ordinal, turn, role, char_offset, char_length, text, words, lemmas, stops, spans)
        VALUES ('t1#1', 1, 1, 1, 'participant', 0, 5, 'hello', 1, 'hello', x'00', x'0000000005000000');
      INSERT INTO revisions VALUES (1, '2026-01-01', 'a', 'set', NULL, 'A', '{"roots":[]}', '[]');
      INSERT INTO themes VALUES ('T1', 'A', 1, NULL, NULL);
      INSERT INTO decisions (id, at, coder, action, passage_id, theme_id) VALUES (7, '2026-01-02', 'ana', 'accept', 't1#1', 'T1');
      INSERT INTO codings (passage_id, theme_id, coder, origin, created_at, rev, decision_id) VALUES ('t1#1', 'T1', 'ana', 'accepted', '2026-01-02', 1, 7);
    `);
    raw.close();
    const db = openStudy(dir).db;
    expect(db.pragma('user_version', { simple: true })).toBe(SCHEMA_VERSION);
    expect(db.pragma('foreign_keys', { simple: true })).toBe(1);
    expect(db.prepare('SELECT id, action, coder FROM decisions').all()).toEqual([{ id: 7, action: 'accept', coder: 'ana' }]);
    expect(db.prepare('SELECT decision_id FROM codings').get()).toEqual({ decision_id: 7 });
    expect(db.pragma('foreign_key_check')).toEqual([]);
    db.prepare("INSERT INTO decisions (at, coder, action, passage_id) VALUES ('2026-01-03', 'ana', 'nocode', 't1#1')").run();
    expect(() => db.prepare("INSERT INTO decisions (at, coder, action) VALUES ('x', 'ana', 'guess')").run()).toThrow(/CHECK/);
    expect(() => db.prepare("UPDATE decisions SET coder = 'bo'").run()).toThrow(/append-only/);
    expect(() => db.prepare('DELETE FROM decisions').run()).toThrow(/append-only/);
    db.close();
  });

  it('rolls back everything a transaction wrote when it throws', () => {
    const db = createStudy(tmp()).db;
    expect(() =>
      db.transaction(() => {
        db.prepare("INSERT INTO meta (key, value) VALUES ('x', '1')").run();
        throw new UserError('stop');
      })(),
    ).toThrow('stop');
    expect(db.prepare("SELECT * FROM meta WHERE key = 'x'").get()).toBeUndefined();
    db.close();
  });

  it('a writer that meets another write waits, says so, and gives a clear error when it cannot get in', () => {
    const dir = tmp();
    createStudy(dir).close();
    const holder = openStudy(dir).db;
    holder.exec('BEGIN IMMEDIATE');
    const waiting = openStudy(dir).db;
    const said: string[] = [];
    const write = process.stderr.write;
    process.env.TRELLIS_LOCK_WAIT = '0.2';
    process.stderr.write = ((chunk: string) => (said.push(String(chunk)), true)) as typeof process.stderr.write;
    try {
      const t0 = Date.now();
      expect(() => waiting.transaction(() => waiting.prepare("INSERT INTO meta (key, value) VALUES ('y', '1')").run())()).toThrow(
        /the study is busy: another trellis command .* kept it locked for 0.2 s; nothing was changed/,
      );
      expect(Date.now() - t0).toBeGreaterThanOrEqual(150); // it did wait
      expect(said.join('')).toMatch(/another trellis command is writing to this study; waiting up to 0.2 s/);
    } finally {
      process.stderr.write = write;
      delete process.env.TRELLIS_LOCK_WAIT;
    }
    holder.exec('COMMIT');
    // Once the other write is done, the same transaction goes through.
    waiting.transaction(() => waiting.prepare("INSERT INTO meta (key, value) VALUES ('y', '1')").run())();
    expect(holder.prepare("SELECT value FROM meta WHERE key = 'y'").get()).toEqual({ value: '1' });
    holder.close();
    waiting.close();
  });

  it('an import leaves the study unlocked while it analyses the text', async () => {
    const dir = tmp();
    createStudy(dir).close();
    const db = openStudy(dir).db;
    const other = openStudy(dir).db;
    other.pragma('busy_timeout = 0'); // any lock held by the import fails this at once
    const text = Array.from({ length: 40 }, (_, i) => `Nadia: Turn ${i} about the tablets and the handover sheet.\n\nInterviewer: And then?\n`).join('\n');
    const items = [];
    for (const name of ['a', 'b', 'c']) {
      writeFileSync(join(dir, `${name}.txt`), text.replaceAll('Turn', `Turn of ${name}`));
      items.push({ file: `${name}.txt`, ...(await readTranscriptFile(join(dir, `${name}.txt`))) });
    }
    let wrote = 0;
    await importTranscripts(db, items, {
      coder: 'tester',
      onProgress: (done) => {
        // Called while the analysis runs: another command can write meanwhile.
        other.prepare('INSERT OR REPLACE INTO meta (key, value) VALUES (?, ?)').run(`during-${done}`, '1');
        wrote++;
      },
    });
    expect(wrote).toBe(3);
    expect((db.prepare('SELECT COUNT(*) AS n FROM transcripts').get() as { n: number }).n).toBe(3);
    expect((db.prepare("SELECT COUNT(*) AS n FROM meta WHERE key LIKE 'during-%'").get() as { n: number }).n).toBe(3);
    db.close();
    other.close();
  });
});
