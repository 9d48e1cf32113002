import { existsSync, readFileSync } from 'node:fs';
import { resolve } from 'node:path';
import { UserError } from '../errors.js';
import { DB_FILE, TEMPLATE_FILE } from './db.js';
import { openStudy, type Study } from './study.js';
import { currentRevision } from './template.js';

export interface CheckReport {
  study: string;
  /** True when the study file is whole and consistent. */
  ok: boolean;
  /** What is wrong with study.db: damage SQLite found, or why it cannot be read at all. */
  problems: string[];
  /** Remarks that are not damage (template.txt edited but not recorded, say). */
  notes: string[];
}

/**
 * `trellis check`: SQLite's full integrity check and the foreign-key check on study.db, read
 * only; a file that cannot be opened as a study is reported, never repaired or replaced.
 */
export function checkStudy(dir: string): CheckReport {
  const study = resolve(dir);
  const report: CheckReport = { study, ok: true, problems: [], notes: [] };
  let opened: Study;
  try {
    opened = openStudy(dir, { readonly: true });
  } catch (e) {
    if (!(e instanceof UserError)) throw e;
    return { ...report, ok: false, problems: [e.message] };
  }
  const { db } = opened;
  try {
    const integrity = (db.pragma('integrity_check') as { integrity_check: string }[]).map((r) => r.integrity_check);
    if (!(integrity.length === 1 && integrity[0] === 'ok')) report.problems.push(...integrity.map((m) => `integrity: ${m}`));
    const orphans = db.pragma('foreign_key_check') as { table: string; rowid: number; parent: string }[];
    for (const o of orphans.slice(0, 20)) report.problems.push(`a row of ${o.table} (rowid ${o.rowid}) points to a missing row of ${o.parent}`);
    if (orphans.length > 20) report.problems.push(`... and ${orphans.length - 20} more rows pointing to missing rows`);
    const rev = report.problems.length ? null : currentRevision(db);
    const file = opened.templateFile;
    if (rev && !existsSync(file)) report.notes.push(`${TEMPLATE_FILE} is missing: "trellis export template --out ${TEMPLATE_FILE}" writes revision ${rev.rev} again`);
    else if (rev && readFileSync(file, 'utf8') !== rev.outline) {
      report.notes.push(`${TEMPLATE_FILE} differs from the recorded revision ${rev.rev}: record it with "trellis template set ${TEMPLATE_FILE}", or leave it`);
    }
  } catch (e) {
    const code = e && typeof e === 'object' && 'code' in e ? String(e.code) : '';
    if (!code.startsWith('SQLITE_')) throw e;
    report.problems.push(`${DB_FILE} could not be read through (${(e as Error).message})`);
  } finally {
    opened.close();
  }
  report.ok = report.problems.length === 0;
  return report;
}
