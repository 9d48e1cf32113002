import { UserError } from '../errors.js';
import type { ImportedRow } from '../sheet/sheet.js';
import { findByPath } from '../template/paths.js';
import { codingSetter, seenMarker } from '../study/codings.js';
import type { DB } from '../study/db.js';
import { markNothingToCode, nothingToCodeBy, undo } from '../study/decisions.js';
import { latestPassageNotes, passageMemoWriter } from '../study/memos.js';
import { getPassage } from '../study/passages.js';
import { currentRevision } from '../study/template.js';

const squash = (s: string) => s.replace(/\s+/g, ' ').trim();

export interface SheetImportReport {
  rows: number;
  coded: number;
  added: number;
  removed: number;
  /** Rows marked "nothing to code". */
  nothing_to_code: number;
  /** Notes that became new passage memos. */
  memos: number;
}

/**
 * Applies a coding sheet for one coder, all or nothing: every row is checked first, and any
 * problem (unknown passage or theme, changed text) stops the import with the rows named.
 */
export function importSheet(db: DB, rows: ImportedRow[], file: string, coder: string): SheetImportReport {
  const rev = currentRevision(db);
  const problems: string[] = [];
  const resolved: { passageId: string; themeIds: string[]; nothing: boolean; row: number; note: string | null }[] = [];
  const seen = new Map<string, number>();
  for (const r of rows) {
    if (!r.passageId) {
      problems.push(`row ${r.row}: the passage_id cell is empty`);
      continue;
    }
    const p = getPassage(db, r.passageId);
    if (!p) {
      problems.push(`row ${r.row}: unknown passage "${r.passageId}" (not in this study; was the sheet made from other files?)`);
      continue;
    }
    if (seen.has(r.passageId)) problems.push(`row ${r.row}: passage "${r.passageId}" is also on row ${seen.get(r.passageId)}`);
    seen.set(r.passageId, r.row);
    if (r.text !== null && squash(r.text) !== squash(p.text)) {
      problems.push(`row ${r.row}: the text of passage "${r.passageId}" no longer matches the study (was the transcript replaced, or the cell edited?)`);
    }
    const ids: string[] = [];
    for (const path of r.themes) {
      if (!rev) {
        problems.push(`row ${r.row}: the study has no template yet: run "trellis template set FILE" first`);
        break;
      }
      try {
        ids.push(findByPath(rev.template, path).id);
      } catch (e) {
        if (!(e instanceof UserError)) throw e;
        problems.push(`row ${r.row}: theme "${path}": ${e.message}`);
      }
    }
    if (r.nothing && p.role !== 'participant') problems.push(`row ${r.row}: passage "${r.passageId}" is an interviewer turn: there is nothing to mark`);
    resolved.push({ passageId: r.passageId, themeIds: [...new Set(ids)], nothing: r.nothing, row: r.row, note: r.note });
  }
  if (problems.length) {
    const shown = problems.slice(0, 20);
    if (problems.length > shown.length) shown.push(`... and ${problems.length - shown.length} more`);
    throw new UserError(`nothing was imported; ${problems.length === 1 ? 'one problem' : problems.length + ' problems'}:\n  ${shown.join('\n  ')}`, file);
  }
  const report: SheetImportReport = { rows: rows.length, coded: 0, added: 0, removed: 0, nothing_to_code: 0, memos: 0 };
  db.transaction(() => {
    const set = codingSetter(db);
    const markSeen = seenMarker(db);
    const marked = nothingToCodeBy(db, coder);
    const marks: string[] = [];
    const notes = latestPassageNotes(db, coder);
    const memo = passageMemoWriter(db);
    const now = new Date().toISOString();
    for (const r of resolved) {
      markSeen(coder, r.passageId);
      const { added, removed } = set(r.passageId, coder, r.themeIds, 'sheet', rev?.rev ?? 0);
      report.added += added;
      report.removed += removed;
      if (r.themeIds.length) report.coded++;
      const mark = marked.get(r.passageId);
      if (r.nothing && mark === undefined) marks.push(r.passageId);
      // The sheet now codes a passage this coder had marked nothing to code: the mark is withdrawn (logged).
      if (!r.nothing && r.themeIds.length && mark !== undefined) undo(db, coder, mark, `coded in ${file}`);
      if (r.nothing) report.nothing_to_code++;
      // A note that is not the coder's latest memo on the passage is a new memo (an empty cell, or
      // the same text exported earlier, adds nothing: the column round-trips).
      if (r.note && r.note !== notes.get(r.passageId)) {
        memo(now, coder, r.passageId, r.note, rev?.rev ?? null);
        report.memos++;
      }
    }
    if (marks.length) markNothingToCode(db, marks, coder, `marked in ${file}`);
  })();
  return report;
}
