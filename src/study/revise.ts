import { writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { assignIds } from '../template/diff.js';
import { parseOutlineOrThrow } from '../template/parse.js';
import { printOutline } from '../template/print.js';
import type { Change, Diagnostic, Revised, Template } from '../template/types.js';
import { TEMPLATE_FILE, type DB } from './db.js';
import { currentRevision, recordRevision, themeIdAllocator } from './template.js';

export interface RevisionResult {
  /** The new revision, or null when nothing changed. */
  rev: number | null;
  changes: Change[];
  warnings: Diagnostic[];
  template: Template;
}

/**
 * `template set FILE`: the outline becomes the new revision, with ids carried over from the
 * last one (renames and moves keep their theme), and the study's template.txt made equal to it.
 */
export function setTemplate(db: DB, studyDir: string, text: string, file: string, author: string, reason?: string): RevisionResult {
  const { template: parsed, warnings } = parseOutlineOrThrow(text, file);
  const prev = currentRevision(db);
  const result = db.transaction(() => {
    const { template, changes } = assignIds(parsed, prev?.template ?? null, themeIdAllocator(db));
    if (prev && changes.length === 0) {
      writeFileSync(join(studyDir, TEMPLATE_FILE), text);
      return { rev: null, changes, warnings, template };
    }
    const rev = recordRevision(db, { template, changes, outline: text, action: `set ${file}`, author, reason });
    // Written last inside the transaction: if the file cannot be written, the revision rolls back.
    writeFileSync(join(studyDir, TEMPLATE_FILE), text);
    return { rev, changes, warnings, template };
  })();
  return result;
}

/** A revision operation (rename, move, merge, split, retire, add) on the current template. */
export function reviseTemplate(
  db: DB,
  studyDir: string,
  action: string,
  op: (t: Template, newId: () => string) => Revised,
  author: string,
  reason?: string,
): RevisionResult {
  const result = db.transaction(() => {
    const prev = currentRevision(db);
    const { template, changes } = op(prev?.template ?? { roots: [] }, themeIdAllocator(db));
    const outline = printOutline(template);
    const rev = recordRevision(db, { template, changes, outline, action, author, reason });
    writeFileSync(join(studyDir, TEMPLATE_FILE), outline);
    return { rev, changes, warnings: [], template };
  })();
  return result;
}
