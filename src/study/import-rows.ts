/** The rows a --replace import carries across: a transcript's codings, kept, moved or set apart. */
import type { DB } from './db.js';

export interface KeptCoding {
  passage_id: string;
  text: string;
  ordinal: number;
  theme_id: string;
  coder: string;
  origin: string;
  created_at: string;
  rev: number;
}

/** Prepared statements for replacing transcripts in one transaction. */
export function replacementWriter(db: DB) {
  const keep = db.prepare(
    'SELECT c.passage_id, p.text, p.ordinal, c.theme_id, c.coder, c.origin, c.created_at, c.rev FROM codings c JOIN passages p ON p.id = c.passage_id WHERE p.transcript_id = ? AND c.removed_at IS NULL',
  );
  const restore = db.prepare('INSERT OR IGNORE INTO codings (passage_id, theme_id, coder, origin, created_at, rev) VALUES (?, ?, ?, ?, ?, ?)');
  const setApart = db.prepare(
    'INSERT INTO unplaced_codings (transcript, passage_id, text, theme_id, coder, origin, coded_at, unplaced_at) VALUES (?, ?, ?, ?, ?, ?, ?, ?)',
  );
  // Suggestions made for the old text no longer apply.
  const dropSuggestions = db.prepare('DELETE FROM suggestions WHERE passage_id IN (SELECT id FROM passages WHERE transcript_id = ?)');
  return {
    /** The transcript's current codings, with their passages' text and place. */
    codings: (transcriptId: number) => keep.all(transcriptId) as KeptCoding[],
    dropSuggestions: (transcriptId: number) => void dropSuggestions.run(transcriptId),
    /** The coding again, on the passage its text moved to. */
    restore: (k: KeptCoding, passageId: string) => void restore.run(passageId, k.theme_id, k.coder, k.origin, k.created_at, k.rev),
    /** A coding no passage of the new text can take, kept apart (unplaced_codings). */
    setApart: (transcript: string, k: KeptCoding, at: string) => void setApart.run(transcript, k.passage_id, k.text, k.theme_id, k.coder, k.origin, k.created_at, at),
  };
}
