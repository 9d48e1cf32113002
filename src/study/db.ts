import Database from 'better-sqlite3';
import { existsSync, mkdirSync, readdirSync, writeFileSync } from 'node:fs';
import { join, resolve } from 'node:path';
import { UserError } from '../errors.js';
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

function configure(db: DB): void {
  db.pragma('journal_mode = WAL');
  db.pragma('foreign_keys = ON');
  // Two processes on one study (say, two review sessions) wait for each other instead of failing.
  db.pragma('busy_timeout = 10000');
  db.pragma('synchronous = NORMAL');
}

/** Creates a study in DIR: study.db and a starter template.txt. Refuses to overwrite one. */
export function createStudy(dir: string, settings: StudySettings = DEFAULT_SETTINGS): DB {
  const root = resolve(dir);
  const file = join(root, DB_FILE);
  if (existsSync(file)) throw new UserError(`a study already exists here (${file})`, file);
  mkdirSync(root, { recursive: true });
  const db = new Database(file);
  configure(db);
  migrate(db, file);
  const put = db.prepare('INSERT OR REPLACE INTO meta (key, value) VALUES (?, ?)');
  db.transaction(() => {
    put.run('created_at', new Date().toISOString());
    put.run('window', String(settings.window));
  })();
  if (!existsSync(join(root, TEMPLATE_FILE))) writeFileSync(join(root, TEMPLATE_FILE), STARTER_TEMPLATE);
  return db;
}

/** Opens the study in DIR, migrating an older schema forward. */
export function openStudy(dir: string, opts: { readonly?: boolean } = {}): DB {
  const root = resolve(dir);
  const file = join(root, DB_FILE);
  if (!existsSync(file)) {
    const hint = existsSync(root) && readdirSync(root).length ? '' : ' (the folder does not exist or is empty)';
    throw new UserError(`no study here${hint}: run "trellis init ${dir}" first, or pass --study DIR`, root);
  }
  const db = new Database(file, { fileMustExist: true });
  configure(db);
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

export function settingsOf(db: DB): StudySettings {
  const row = db.prepare("SELECT value FROM meta WHERE key = 'window'").get() as { value: string } | undefined;
  return { window: row ? Number(row.value) : DEFAULT_SETTINGS.window };
}

/**
 * Runs `work` in one IMMEDIATE transaction that may await (imports analyse text in worker threads
 * while rows are written). Any throw rolls everything back, so a failed command leaves the study
 * exactly as it was.
 */
export async function inTransaction<T>(db: DB, work: () => Promise<T>): Promise<T> {
  db.exec('BEGIN IMMEDIATE');
  try {
    const out = await work();
    db.exec('COMMIT');
    return out;
  } catch (e) {
    if (db.inTransaction) db.exec('ROLLBACK');
    throw e;
  }
}
