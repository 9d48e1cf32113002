/**
 * One handle on a study: its database and its folder together, so that nothing carries the
 * folder beside the database. Row functions take `study.db`; use cases that also write the
 * study's files (template.txt) or name the folder take the Study.
 */
import { join, resolve } from 'node:path';
import { createDatabase, DB_FILE, DEFAULT_SETTINGS, openDatabase, TEMPLATE_FILE, type DB, type StudySettings } from './db.js';

export class Study {
  /** The study folder, resolved. */
  readonly dir: string;
  /** study.db */
  readonly file: string;
  /** The study's template.txt, kept equal to the current revision. */
  readonly templateFile: string;

  constructor(
    readonly db: DB,
    dir: string,
  ) {
    this.dir = resolve(dir);
    this.file = join(this.dir, DB_FILE);
    this.templateFile = join(this.dir, TEMPLATE_FILE);
  }

  close(): void {
    this.db.close();
  }
}

/** Creates a study in DIR: study.db and a starter template.txt. Refuses to overwrite one. */
export function createStudy(dir: string, settings: StudySettings = DEFAULT_SETTINGS, coder?: string): Study {
  return new Study(createDatabase(dir, settings, coder), dir);
}

/** Opens the study in DIR, migrating an older schema forward (or, read-only, refusing a newer one). */
export function openStudy(dir: string, opts: { readonly?: boolean } = {}): Study {
  return new Study(openDatabase(dir, opts), dir);
}
