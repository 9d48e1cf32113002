import Database from 'better-sqlite3';
import { chmodSync, closeSync, existsSync, mkdirSync, openSync, readdirSync, readSync, statSync } from 'node:fs';
import { join, resolve } from 'node:path';
import { UserError } from '../errors.js';
import { PRIVATE_DIR, PRIVATE_FILE, writeFileAtomic } from './files.js';
import { MIGRATIONS, SCHEMA_VERSION } from './schema.js';

export type DB = Database.Database;

export const DB_FILE = 'study.db';
export const TEMPLATE_FILE = 'template.txt';

export interface StudySettings {
  /** Longest passage in words before a turn is split. */
  window: number;
}

export const DEFAULT_SETTINGS: StudySettings = { window: 120 };

/** The starter template.txt: comments only, so nothing is coded against an example by mistake. */
const STARTER_TEMPLATE = `# The study's template: one theme per line, sub-themes indented by two spaces.
# Mark a theme set before coding from the research brief with [a priori].
# Notes belong to the theme above and are indented one level deeper:
#   | definition: what the theme covers
#   | include: what belongs here     | exclude: what does not
#   | seeds: comma, separated, terms
# Record it with: trellis template set template.txt
#
# Example:
# Workload [a priori]
#   | definition: Demands on staff time around handover.
#   | seeds: busy, short-staffed, overtime
#   Staffing levels
#   Time on the system
`;

/**
 * How long a writer waits for another trellis command's write to finish, in milliseconds:
 * 30 s, or $TRELLIS_LOCK_WAIT seconds.
 */
export function writeWaitMs(): number {
  const v = process.env.TRELLIS_LOCK_WAIT;
  const s = v ? Number(v) : NaN;
  return Number.isFinite(s) && s >= 0 ? Math.round(s * 1000) : 30_000;
}

function configure(db: DB, file: string): void {
  db.pragma('journal_mode = WAL');
  db.pragma('foreign_keys = ON');
  // Two processes on one study (say, two review sessions) wait for each other instead of failing.
  db.pragma(`busy_timeout = ${writeWaitMs()}`);
  db.pragma('synchronous = NORMAL');
  patientTransactions(db, file);
}

function isBusy(e: unknown): boolean {
  return e instanceof Error && 'code' in e && typeof e.code === 'string' && e.code.startsWith('SQLITE_BUSY');
}

/**
 * Takes the study's write lock (BEGIN IMMEDIATE). When another command holds it, says so on
 * stderr and waits up to writeWaitMs(); past that, a clear error rather than "database is locked".
 */
export function beginWrite(db: DB, file: string): void {
  db.pragma('busy_timeout = 0');
  try {
    db.exec('BEGIN IMMEDIATE');
    return;
  } catch (e) {
    if (!isBusy(e)) throw e;
  } finally {
    db.pragma(`busy_timeout = ${writeWaitMs()}`);
  }
  process.stderr.write(`trellis: another trellis command is writing to this study; waiting up to ${writeWaitMs() / 1000} s for it...\n`);
  try {
    db.exec('BEGIN IMMEDIATE');
  } catch (e) {
    if (!isBusy(e)) throw e;
    throw new UserError(
      `the study is busy: another trellis command (an import, a review) kept it locked for ${writeWaitMs() / 1000} s; nothing was changed. Try again when it has finished`,
      file,
    );
  }
}

/**
 * Every db.transaction(...) becomes a write transaction taken through beginWrite (IMMEDIATE, so
 * two writers never deadlock halfway; waiting with a message). Nested calls keep their savepoints.
 */
function patientTransactions(db: DB, file: string): void {
  const plain = db.transaction.bind(db);
  db.transaction = ((fn: (...a: unknown[]) => unknown) => {
    const t = plain(fn);
    const run = (...args: unknown[]) => {
      if (db.inTransaction) return t(...args);
      beginWrite(db, file);
      try {
        const out = t(...args); // a savepoint inside the transaction just begun
        db.exec('COMMIT');
        return out;
      } catch (e) {
        if (db.inTransaction) db.exec('ROLLBACK');
        throw e;
      }
    };
    return Object.assign(run, { default: run, deferred: t.deferred, immediate: t.immediate, exclusive: t.exclusive });
  }) as DB['transaction'];
}

const SQLITE_HEADER = Buffer.from('SQLite format 3\0', 'latin1');

/**
 * Refuses a study file that is empty, not an SQLite database, or shorter than its own header says
 * (truncated), before SQLite touches it: opening an empty file would silently make a new study.
 */
export function checkStudyFile(file: string): void {
  const st = statSync(file);
  const restore = 'nothing was changed. Restore study.db from a backup (or move it away and run "trellis init" for a new study)';
  if (!st.isFile()) throw new UserError(`study.db is not a file; ${restore}`, file);
  if (st.size === 0) throw new UserError(`study.db is empty (0 bytes): the study is damaged; ${restore}`, file);
  const head = Buffer.alloc(100);
  const fd = openSync(file, 'r');
  let got: number;
  try {
    got = readSync(fd, head, 0, 100, 0);
  } finally {
    closeSync(fd);
  }
  if (got < 100 || !head.subarray(0, 16).equals(SQLITE_HEADER)) {
    throw new UserError(`study.db is not a trellis study (not an SQLite database): it is damaged or another file; ${restore}`, file);
  }
  const raw = head.readUInt16BE(16);
  const pageSize = raw === 1 ? 65536 : raw;
  const pages = head.readUInt32BE(28);
  // The header's page count is valid when its change counter matches (SQLite file format, 1.3.7).
  const valid = head.readUInt32BE(24) === head.readUInt32BE(92);
  if (valid && pages > 0 && st.size < pages * pageSize) {
    throw new UserError(`study.db is truncated (${st.size} bytes of ${pages * pageSize}): the study is damaged; ${restore}`, file);
  }
}

function isDamaged(e: unknown): boolean {
  return e instanceof Error && 'code' in e && (e.code === 'SQLITE_NOTADB' || e.code === 'SQLITE_CORRUPT');
}

function openChecked(file: string): DB {
  checkStudyFile(file);
  let db: DB | null = null;
  try {
    db = new Database(file, { fileMustExist: true });
    configure(db, file);
    db.prepare('SELECT count(*) FROM sqlite_master').get();
    return db;
  } catch (e) {
    db?.close();
    if (isDamaged(e)) throw new UserError(`study.db is damaged (${(e as Error).message}); run "trellis check" for details. Restore it from a backup`, file);
    throw e;
  }
}

/** Creates study.db and a starter template.txt in DIR (createStudy in study.ts). Refuses to overwrite one. */
export function createDatabase(dir: string, settings: StudySettings = DEFAULT_SETTINGS, coder?: string): DB {
  const root = resolve(dir);
  const file = join(root, DB_FILE);
  if (existsSync(file)) throw new UserError(`a study already exists here (${file})`, file);
  const fresh = !existsSync(root);
  mkdirSync(root, { recursive: true, mode: PRIVATE_DIR });
  if (fresh) chmodSync(root, PRIVATE_DIR); // the umask may have taken bits off
  const db = new Database(file);
  chmodSync(file, PRIVATE_FILE); // SQLite gives its -wal and -shm files the same mode
  configure(db, file);
  migrate(db, file);
  const put = db.prepare('INSERT OR REPLACE INTO meta (key, value) VALUES (?, ?)');
  db.transaction(() => {
    put.run('created_at', new Date().toISOString());
    put.run('window', String(settings.window));
    if (coder) put.run('coder', coder);
  })();
  if (!existsSync(join(root, TEMPLATE_FILE))) writeFileAtomic(join(root, TEMPLATE_FILE), STARTER_TEMPLATE);
  return db;
}

/** Opens study.db in DIR (openStudy in study.ts), migrating an older schema forward. */
export function openDatabase(dir: string, opts: { readonly?: boolean } = {}): DB {
  const root = resolve(dir);
  const file = join(root, DB_FILE);
  if (!existsSync(file)) {
    const hint = existsSync(root) && readdirSync(root).length ? '' : ' (the folder does not exist or is empty)';
    throw new UserError(`no study here${hint}: run "trellis init ${dir}" first, or pass --study DIR`, root);
  }
  const db = openChecked(file);
  if (!opts.readonly) migrate(db, file);
  else checkVersion(db, file);
  return db;
}

function versionOf(db: DB): number {
  return db.pragma('user_version', { simple: true }) as number;
}

function checkVersion(db: DB, file: string): void {
  const v = versionOf(db);
  if (v > SCHEMA_VERSION) {
    throw new UserError(`this study was written by a newer trellis (schema ${v}; this one knows ${SCHEMA_VERSION}): upgrade trellis`, file);
  }
}

function migrate(db: DB, file: string): void {
  checkVersion(db, file);
  const from = versionOf(db);
  if (from === SCHEMA_VERSION) return;
  // Foreign keys are off while tables are rebuilt (SQLite's own procedure for changing a table);
  // the check afterwards makes sure the rebuilt tables still hold together.
  db.pragma('foreign_keys = OFF');
  try {
    db.transaction(() => {
      for (let v = from; v < SCHEMA_VERSION; v++) db.exec(MIGRATIONS[v]!);
      const broken = db.pragma('foreign_key_check') as unknown[];
      if (broken.length) throw new Error(`migration to schema ${SCHEMA_VERSION} broke ${broken.length} references`);
      db.pragma(`user_version = ${SCHEMA_VERSION}`);
    })();
  } finally {
    db.pragma('foreign_keys = ON');
  }
}

/** The name a study records decisions and revisions under when none is given (init --coder, or the first --coder). */
export function studyCoder(db: DB): string | null {
  const row = db.prepare("SELECT value FROM meta WHERE key = 'coder'").get() as { value: string } | undefined;
  return row?.value ?? null;
}

/** Remembers `name` as the study's coder, unless it has one already. */
export function rememberCoder(db: DB, name: string): void {
  db.prepare("INSERT OR IGNORE INTO meta (key, value) VALUES ('coder', ?)").run(name);
}

export function settingsOf(db: DB): StudySettings {
  const row = db.prepare("SELECT value FROM meta WHERE key = 'window'").get() as { value: string } | undefined;
  return { window: row ? Number(row.value) : DEFAULT_SETTINGS.window };
}
