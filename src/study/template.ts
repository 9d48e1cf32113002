import { entriesById, flattenTemplate, pathKey, pathsById, unflattenTemplate, walk, type FlatTheme } from '../template/paths.js';
import type { Change, Template } from '../template/types.js';
import type { DB } from './db.js';

export interface Revision {
  rev: number;
  created_at: string;
  author: string;
  action: string;
  reason: string | null;
  outline: string;
  template: Template;
  changes: Change[];
}

interface RevisionRow {
  rev: number;
  created_at: string;
  author: string;
  action: string;
  reason: string | null;
  outline: string;
  tree: string;
  changes: string;
}

const EMPTY: Template = { roots: [] };

/**
 * The tree is stored as a flat list (a theme and its parent's position): nested JSON would overflow
 * the stack on very deep templates. Revisions stored nested by older versions still read.
 */
function encodeTree(t: Template): string {
  return JSON.stringify({ flat: flattenTemplate(t) });
}

function decodeTree(text: string): Template {
  const v = JSON.parse(text) as Template | { flat: FlatTheme[] };
  return 'flat' in v ? unflattenTemplate(v.flat) : v;
}

function toRevision(r: RevisionRow): Revision {
  return { ...r, action: shownAction(r.action), template: decodeTree(r.tree), changes: JSON.parse(r.changes) as Change[] };
}

/**
 * The file's name only, never the folders it sat in: a path shows the researcher's folders (and
 * often their name) to anyone who reads the history or the report. Revisions recorded before the
 * name alone was kept are shown the same way.
 */
export function fileNameOnly(file: string): string {
  const parts = file.split(/[\\/]+/).filter(Boolean);
  return parts.length ? parts[parts.length - 1]! : file;
}

function shownAction(action: string): string {
  return action.startsWith('set ') ? `set ${fileNameOnly(action.slice(4))}` : action;
}

/** The current revision, or null before the first `template set`. */
export function currentRevision(db: DB): Revision | null {
  const row = db.prepare('SELECT * FROM revisions ORDER BY rev DESC LIMIT 1').get() as RevisionRow | undefined;
  return row ? toRevision(row) : null;
}

/** Theme id -> path in the current template. */
export function themePaths(db: DB): Map<string, string> {
  return pathsById(currentTemplate(db));
}

export function currentTemplate(db: DB): Template {
  return currentRevision(db)?.template ?? EMPTY;
}

export function revisionHistory(db: DB): Revision[] {
  return (db.prepare('SELECT * FROM revisions ORDER BY rev').all() as RevisionRow[]).map(toRevision);
}

/**
 * Retired themes (not merged: a merged theme's codings moved on) by the path they had when they
 * were retired, keyed by pathKey; the most recently retired wins a shared path.
 */
export function retiredPaths(db: DB): Map<string, string> {
  const rows = db
    .prepare('SELECT id, retired_rev FROM themes WHERE retired_rev IS NOT NULL AND merged_into IS NULL ORDER BY retired_rev')
    .all() as { id: string; retired_rev: number }[];
  const out = new Map<string, string>();
  if (!rows.length) return out;
  const before = db.prepare('SELECT tree FROM revisions WHERE rev < ? ORDER BY rev DESC LIMIT 1');
  for (const r of rows) {
    const row = before.get(r.retired_rev) as { tree: string } | undefined;
    if (!row) continue;
    for (const e of walk(decodeTree(row.tree))) if (e.node.id === r.id) out.set(pathKey(e.path), r.id);
  }
  return out;
}

/** Theme ids are T1, T2, ... in order of creation, never reused. */
export function themeIdAllocator(db: DB): () => string {
  const row = db.prepare("SELECT MAX(CAST(SUBSTR(id, 2) AS INTEGER)) AS n FROM themes WHERE id LIKE 'T%'").get() as {
    n: number | null;
  };
  let n = row.n ?? 0;
  return () => `T${++n}`;
}

export interface NewRevision {
  template: Template;
  changes: Change[];
  outline: string;
  action: string;
  author: string;
  reason?: string | null;
}

/**
 * Records a revision and keeps the themes table and the codings in step with its changes:
 * new themes get a row, removed ones are retired (history kept), a merge re-points codings.
 * Call inside a transaction.
 */
export function recordRevision(db: DB, r: NewRevision): number {
  const now = new Date().toISOString();
  const rev = Number(
    db
      .prepare('INSERT INTO revisions (created_at, author, action, reason, outline, tree, changes) VALUES (?, ?, ?, ?, ?, ?, ?)')
      .run(now, r.author, r.action, r.reason ?? null, r.outline, encodeTree(r.template), JSON.stringify(r.changes))
      .lastInsertRowid,
  );
  const names = new Map([...entriesById(r.template)].map(([id, e]) => [id, e.node.name]));

  const add = db.prepare('INSERT OR IGNORE INTO themes (id, name, created_rev) VALUES (?, ?, ?)');
  const retire = db.prepare('UPDATE themes SET retired_rev = ? WHERE id = ? AND retired_rev IS NULL');
  const rename = db.prepare('UPDATE themes SET name = ? WHERE id = ?');
  const revive = db.prepare('UPDATE themes SET retired_rev = NULL WHERE id = ?');
  const mergeTheme = db.prepare('UPDATE themes SET retired_rev = ?, merged_into = ? WHERE id = ?');
  // A coding re-pointed by a merge remembers the theme it was first given.
  const repoint = db.prepare(
    `UPDATE codings SET first_theme = COALESCE(first_theme, theme_id), theme_id = ?
     WHERE theme_id = ? AND removed_at IS NULL
       AND NOT EXISTS (SELECT 1 FROM codings c2 WHERE c2.passage_id = codings.passage_id AND c2.coder = codings.coder
                       AND c2.theme_id = ? AND c2.removed_at IS NULL)`,
  );
  const dropDup = db.prepare("UPDATE codings SET removed_at = ?, removed_by = 'merge' WHERE theme_id = ? AND removed_at IS NULL");

  for (const c of r.changes) {
    switch (c.kind) {
      case 'added':
        add.run(c.id, names.get(c.id) ?? c.path, rev);
        break;
      case 'removed':
      case 'retired':
      case 'split':
        retire.run(rev, c.id);
        break;
      case 'merged':
        mergeTheme.run(rev, c.into, c.id);
        repoint.run(c.into, c.id, c.into);
        dropDup.run(now, c.id); // the passage already carried the target theme
        break;
      case 'revived':
        revive.run(c.id);
        break;
      case 'renamed':
      case 'moved':
      case 'edited':
        break;
    }
  }
  for (const [id, name] of names) {
    add.run(id, name, rev);
    rename.run(name, id);
  }
  return rev;
}
