import { UserError } from '../errors.js';
import { assignIds, reviveRetired } from '../template/diff.js';
import { findByPath, pathKey, pathOf, walk } from '../template/paths.js';
import { parseOutlineOrThrow } from '../template/parse.js';
import { collectComments } from '../template/comments.js';
import { printOutline } from '../template/print.js';
import type { Change, Diagnostic, Revised, Template } from '../template/types.js';
import type { DB } from '../study/db.js';
import { writeFileAtomic } from '../study/files.js';
import type { Study } from '../study/study.js';
import { currentRevision, fileNameOnly, recordRevision, retiredPaths, themeIdAllocator } from '../study/template.js';
import { themeCounts } from './status.js';

export interface RevisionResult {
  /** The new revision, or null when nothing changed. */
  rev: number | null;
  changes: Change[];
  warnings: Diagnostic[];
  template: Template;
}

/** What the researcher says about coded themes that are gone from a new outline. */
export interface VanishedThemes {
  /** Old paths to retire, codings kept in their history. */
  retire?: string[];
  /** [old path, new path]: the same theme, renamed or moved by hand; its codings follow. */
  renamed?: [string, string][];
}

/**
 * `template set FILE`: the outline becomes the new revision, with ids carried over from the
 * last one (renames and moves keep their theme), and the study's template.txt made equal to it.
 * A coded theme that disappears is never retired silently: the researcher says whether it was
 * renamed or moved (its codings follow) or is to be retired.
 */
export function setTemplate(study: Study, text: string, file: string, author: string, reason?: string, said: VanishedThemes = {}): RevisionResult {
  const { template: parsed, warnings } = parseOutlineOrThrow(text, file);
  if (!parsed.roots.length) {
    // Recording it would retire every theme and cut every coding off its theme.
    throw new UserError('the outline has no themes (only comments or blank lines): nothing recorded; write at least one theme, one a line', file);
  }
  const { db } = study;
  const result = db.transaction(() => {
    const prev = currentRevision(db);
    const same = new Map<string, string>();
    for (const [from, to] of said.renamed ?? []) {
      if (!prev) throw new UserError(`--renamed "${from}; ${to}": there is no earlier template`);
      const old = findByPath(prev.template, from);
      const node = findByPath(parsed, to, { file });
      same.set(pathKey([...walk(parsed)].find((e) => e.node === node)!.path), old.id);
    }
    const { template, changes } = reviveRetired(assignIds(parsed, prev?.template ?? null, themeIdAllocator(db), same), retiredPaths(db));
    if (prev) checkVanished(db, prev.template, changes, said.retire ?? [], file);
    if (prev && changes.length === 0) {
      writeFileAtomic(study.templateFile, text);
      return { rev: null, changes, warnings, template };
    }
    const rev = recordRevision(db, { template, changes, outline: text, action: `set ${fileNameOnly(file)}`, author, reason });
    // Written last inside the transaction: if the file cannot be written, the revision rolls back,
    // and the atomic write leaves the old template.txt whole.
    writeFileAtomic(study.templateFile, text);
    return { rev, changes, warnings, template };
  })();
  return result;
}

/** Refuses to retire coded themes the researcher has not named, listing them with their counts. */
function checkVanished(db: DB, prev: Template, changes: Change[], retire: string[], file: string): void {
  const told = new Set(retire.map((p) => findByPath(prev, p).id));
  const removed = new Map(changes.filter((c): c is Extract<Change, { kind: 'removed' }> => c.kind === 'removed').map((c) => [c.id, c]));
  for (const id of told) {
    if (!removed.has(id)) throw new UserError(`--retire "${pathOf(prev, id)}": that theme is still in the outline`, file);
  }
  const counts = new Map(themeCounts(db, prev).map((c) => [c.id, c.direct]));
  const silent = [...removed.values()].filter((c) => (counts.get(c.id) ?? 0) > 0 && !told.has(c.id));
  if (!silent.length) return;
  const list = silent.map((c) => `  ${c.path}: ${counts.get(c.id)} coded passage${counts.get(c.id) === 1 ? '' : 's'}`).join('\n');
  throw new UserError(
    `these coded themes are gone from the outline, and their codings would be cut off:\n${list}\n` +
      'Nothing was recorded. For each, say what happened:\n' +
      '  renamed or moved by hand (its codings follow):  --renamed "OLD PATH; NEW PATH"\n' +
      '  retired (codings kept in its history):          --retire "OLD PATH"',
    file,
  );
}

/** A revision operation (rename, move, merge, split, retire, add) on the current template. */
export function reviseTemplate(
  study: Study,
  action: string,
  op: (t: Template, newId: () => string) => Revised,
  author: string,
  reason?: string,
): RevisionResult {
  const { db } = study;
  const result = db.transaction(() => {
    const prev = currentRevision(db);
    const { template, changes } = op(prev?.template ?? { roots: [] }, themeIdAllocator(db));
    // The researcher's comments in the current outline survive the rewrite.
    const outline = printOutline(template, prev ? collectComments(prev.outline, prev.template) : undefined);
    const rev = recordRevision(db, { template, changes, outline, action, author, reason });
    writeFileAtomic(study.templateFile, outline);
    return { rev, changes, warnings: [], template };
  })();
  return result;
}
