import { NOTHING_TO_CODE, clock, type SheetRow } from '../sheet/sheet.js';
import { nothingToCodeBy } from './decisions.js';
import { latestPassageNotes } from './memos.js';
import { pathOf } from '../template/paths.js';
import { currentCodings } from './codings.js';
import type { DB } from './db.js';
import { listPassages } from './passages.js';
import { currentTemplate } from './template.js';

/** Rows for a coding sheet; with a coder, their current themes are filled in. */
export function sheetRows(db: DB, opts: { transcripts?: string[]; coder?: string }): SheetRow[] {
  const template = currentTemplate(db);
  const byPassage = new Map<string, string[]>();
  const notes = opts.coder ? latestPassageNotes(db, opts.coder) : new Map<string, string>();
  if (opts.coder) {
    for (const id of nothingToCodeBy(db, opts.coder).keys()) byPassage.set(id, [NOTHING_TO_CODE]);
    for (const c of currentCodings(db, opts.coder)) {
      const path = safePath(template, c.theme_id);
      if (path) byPassage.set(c.passage_id, [...(byPassage.get(c.passage_id) ?? []), path]);
    }
  }
  return listPassages(db, { transcripts: opts.transcripts }).map((p) => ({
    passage_id: p.id,
    transcript: p.transcript,
    speaker: p.speaker ?? '',
    role: p.role,
    time: clock(p.start),
    text: p.text,
    themes: byPassage.get(p.id) ?? [],
    note: notes.get(p.id) ?? '',
  }));
}

function safePath(t: ReturnType<typeof currentTemplate>, id: string): string | null {
  try {
    return pathOf(t, id);
  } catch {
    return null; // a retired theme: not part of the current sheet
  }
}
