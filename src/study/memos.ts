/**
 * Memos: dated, attributed notes on a theme, a transcript, a passage or the study as a whole.
 * A theme memo is kept by theme id, so it follows the theme through renames and moves.
 */
import { UserError } from '../errors.js';
import { findByPath } from '../template/paths.js';
import type { DB } from './db.js';
import { getPassage } from './passages.js';
import { requireTranscripts } from './transcripts.js';
import { currentRevision, currentTemplate, themePaths } from './template.js';

export type MemoKind = 'study' | 'theme' | 'transcript' | 'passage';

export interface MemoTarget {
  kind: MemoKind;
  /** Theme path, transcript name or passage id as the user gave it; absent for the study. */
  value?: string;
}

export interface Memo {
  memo_id: number;
  at: string;
  author: string;
  target_kind: MemoKind;
  /** Theme id, transcript name or passage id; null for the study. */
  target: string | null;
  /** What the target is called now: the theme's current path (or a note that it left the template). */
  target_label: string;
  text: string;
  rev: number | null;
}

interface Row {
  id: number;
  at: string;
  author: string;
  target_kind: MemoKind;
  target: string | null;
  text: string;
  rev: number | null;
}

/** The stored key of a target, checked against the study: a clear UserError when it is unknown. */
export function resolveTarget(db: DB, t: MemoTarget): string | null {
  switch (t.kind) {
    case 'study':
      return null;
    case 'theme': {
      if (!currentRevision(db)) throw new UserError('the study has no template yet, so there is no theme to write a memo on');
      return findByPath(currentTemplate(db), t.value ?? '').id;
    }
    case 'transcript':
      requireTranscripts(db, [t.value ?? '']);
      return t.value!;
    case 'passage':
      if (!getPassage(db, t.value ?? '')) throw new UserError(`no passage "${t.value}" in this study (passage ids are shown by "trellis suggest" and in the coding sheet)`);
      return t.value!;
  }
}

function labeller(db: DB): (kind: MemoKind, target: string | null) => string {
  const paths = themePaths(db);
  const names = new Map((db.prepare('SELECT id, name FROM themes').all() as { id: string; name: string }[]).map((r) => [r.id, r.name]));
  return (kind, target) => {
    if (kind === 'study') return 'the study';
    if (kind === 'theme') return paths.get(target!) ?? `${names.get(target!) ?? target} (no longer in the template)`;
    return target!;
  };
}

function toMemo(r: Row, label: (k: MemoKind, t: string | null) => string): Memo {
  return { memo_id: r.id, at: r.at, author: r.author, target_kind: r.target_kind, target: r.target, target_label: label(r.target_kind, r.target), text: r.text, rev: r.rev };
}

/** Adds one memo, in one transaction. */
export function addMemo(db: DB, target: MemoTarget, text: string, author: string): Memo {
  const clean = text.trim();
  if (!clean) throw new UserError('a memo needs its text: trellis memo add "TEXT" [--theme PATH | --transcript NAME | --passage ID]');
  return db
    .transaction(() => {
      const key = resolveTarget(db, target);
      const rev = currentRevision(db);
      const id = Number(
        db
          .prepare('INSERT INTO memos (at, author, target_kind, target, text, rev) VALUES (?, ?, ?, ?, ?, ?)')
          .run(new Date().toISOString(), author, target.kind, key, clean, rev?.rev ?? null).lastInsertRowid,
      );
      return getMemo(db, id);
    })
    .immediate();
}

export function getMemo(db: DB, id: number): Memo {
  const r = db.prepare('SELECT * FROM memos WHERE id = ?').get(id) as Row | undefined;
  if (!r) throw new UserError(`no memo #${id} in this study (see "trellis memo list")`);
  return toMemo(r, labeller(db));
}

/** Memos oldest first; with a target, only those on it (a theme's own, not its sub-themes'). */
export function listMemos(db: DB, target?: MemoTarget): Memo[] {
  const label = labeller(db);
  let rows: Row[];
  if (!target) rows = db.prepare('SELECT * FROM memos ORDER BY id').all() as Row[];
  else {
    const key = resolveTarget(db, target);
    rows = db.prepare('SELECT * FROM memos WHERE target_kind = ? AND target IS ? ORDER BY id').all(target.kind, key) as Row[];
  }
  return rows.map((r) => toMemo(r, label));
}

/** Passage id -> the text of this author's latest memo on it (the coding sheet's note column). */
export function latestPassageNotes(db: DB, author: string): Map<string, string> {
  const rows = db
    .prepare("SELECT target, text FROM memos WHERE target_kind = 'passage' AND author = ? ORDER BY id")
    .all(author) as { target: string; text: string }[];
  return new Map(rows.map((r) => [r.target, r.text]));
}

/** Adds many passage memos in the caller's transaction (a coding sheet's note column). */
export function passageMemoWriter(db: DB) {
  const ins = db.prepare("INSERT INTO memos (at, author, target_kind, target, text, rev) VALUES (?, ?, 'passage', ?, ?, ?)");
  return (at: string, author: string, passageId: string, text: string, rev: number | null): void => void ins.run(at, author, passageId, text, rev);
}
