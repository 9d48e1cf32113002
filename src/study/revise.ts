import { join } from 'node:path';
import { UserError } from '../errors.js';
import { assignIds, reviveRetired } from '../template/diff.js';
import { parseOutlineOrThrow } from '../template/parse.js';
import { printOutline } from '../template/print.js';
import type { Change, Diagnostic, Revised, Template } from '../template/types.js';
import { TEMPLATE_FILE, type DB } from './db.js';
import { writeFileAtomic } from './files.js';
import { currentRevision, fileNameOnly, recordRevision, retiredPaths, themeIdAllocator } from './template.js';

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
  if (!parsed.roots.length) {
    // Recording it would retire every theme and cut every coding off its theme.
    throw new UserError('the outline has no themes (only comments or blank lines): nothing recorded; write at least one theme, one a line', file);
  }
  const result = db.transaction(() => {
    const prev = currentRevision(db);
    const { template, changes } = reviveRetired(assignIds(parsed, prev?.template ?? null, themeIdAllocator(db)), retiredPaths(db));
    if (prev && changes.length === 0) {
      writeFileAtomic(join(studyDir, TEMPLATE_FILE), text);
      return { rev: null, changes, warnings, template };
    }
    const rev = recordRevision(db, { template, changes, outline: text, action: `set ${fileNameOnly(file)}`, author, reason });
    // Written last inside the transaction: if the file cannot be written, the revision rolls back,
    // and the atomic write leaves the old template.txt whole.
    writeFileAtomic(join(studyDir, TEMPLATE_FILE), text);
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
    writeFileAtomic(join(studyDir, TEMPLATE_FILE), outline);
    return { rev, changes, warnings: [], template };
  })();
  return result;
}
