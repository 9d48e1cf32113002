import { UserError } from '../errors.js';
import { roleOf } from '../ingest/roles.js';
import { segment, type Passage } from '../ingest/segment.js';
import type { Transcript } from '../ingest/types.js';
import { findByPath } from '../template/paths.js';
import type { TextAnalysis } from '../text/analysis.js';
import { analyseMany } from '../text/pool.js';
import { codingAdder } from './codings.js';
import { inTransaction, settingsOf, type DB } from './db.js';
import { currentRevision } from './template.js';
import { deleteTranscript, findTranscript, transcriptWriter } from './transcripts.js';

export interface ImportItem {
  file: string;
  hash: string;
  transcripts: Transcript[];
}

export interface ImportOptions {
  replace?: boolean;
  interviewers?: string[];
  /** Who wrote the inline codes in these files. */
  coder: string;
  onProgress?: (done: number, total: number, name: string) => void;
}

export interface ImportedTranscript {
  name: string;
  file: string;
  passages: number;
  participant: number;
  interviewer: number;
  words: number;
  replaced: boolean;
}

export interface ImportReport {
  added: ImportedTranscript[];
  unchanged: { name: string; file: string }[];
  inlineCodings: number;
  /** Codings kept across a --replace because their passage's text did not change. */
  keptCodings: number;
  droppedCodings: number;
  words: number;
  warnings: string[];
}

/**
 * Imports transcripts in one transaction: every file goes in, or none does. Text analysis runs in
 * worker threads while earlier transcripts are being written.
 */
export async function importTranscripts(db: DB, items: ImportItem[], opts: ImportOptions): Promise<ImportReport> {
  const report: ImportReport = { added: [], unchanged: [], inlineCodings: 0, keptCodings: 0, droppedCodings: 0, words: 0, warnings: [] };
  const todo: { t: Transcript; file: string; hash: string; replaces: number | null }[] = [];
  const seen = new Map<string, string>();
  for (const item of items) {
    for (const t of item.transcripts) {
      report.warnings.push(...t.warnings);
      const twin = seen.get(t.name);
      if (twin) throw new UserError(`two transcripts would both be named "${t.name}" (also from ${twin}); rename one file`, item.file);
      seen.set(t.name, item.file);
      const old = findTranscript(db, t.name);
      const hash = item.transcripts.length > 1 ? `${item.hash}:${t.name}` : item.hash;
      if (old && old.hash === hash) {
        report.unchanged.push({ name: t.name, file: item.file });
        continue;
      }
      if (old && !opts.replace) {
        throw new UserError(
          `a different transcript named "${t.name}" is already in the study (from ${old.file}, added ${old.added_at.slice(0, 10)}); ` +
            'pass --replace to replace it',
          item.file,
        );
      }
      todo.push({ t, file: item.file, hash, replaces: old?.id ?? null });
    }
  }
  if (!todo.length) return report;

  const rev = currentRevision(db);
  const { window } = settingsOf(db);
  const interviewers = opts.interviewers ?? [];
  const texts: string[] = [];
  const firstTurn: number[] = [];
  for (const { t } of todo) {
    firstTurn.push(texts.length);
    for (const turn of t.turns) texts.push(turn.text);
  }

  return inTransaction(db, async () => {
    const write = transcriptWriter(db);
    const addCoding = codingAdder(db);
    const keep = db.prepare(
      'SELECT c.passage_id, p.text, c.theme_id, c.coder, c.origin, c.created_at, c.rev FROM codings c JOIN passages p ON p.id = c.passage_id WHERE p.transcript_id = ? AND c.removed_at IS NULL',
    );
    const restore = db.prepare(
      'INSERT INTO codings (passage_id, theme_id, coder, origin, created_at, rev) SELECT ?, ?, ?, ?, ?, ? WHERE EXISTS (SELECT 1 FROM passages WHERE id = ? AND text = ?)',
    );
    // Suggestions made for the old text no longer apply.
    const dropSuggestions = db.prepare('DELETE FROM suggestions WHERE passage_id IN (SELECT id FROM passages WHERE transcript_id = ?)');
    const analyses = new Array<TextAnalysis>(texts.length);
    let next = 0; // next transcript to write
    const flush = (upTo: number) => {
      while (next < todo.length && upTo >= (firstTurn[next + 1] ?? texts.length)) {
        const { t, file, hash, replaces } = todo[next]!;
        const own = analyses.slice(firstTurn[next], firstTurn[next + 1] ?? texts.length);
        const passages = segment(t, own, { window, roleOf: (s) => roleOf(s, interviewers) });
        let kept: ReturnType<typeof keep.all> = [];
        if (replaces !== null) {
          kept = keep.all(replaces);
          dropSuggestions.run(replaces);
          deleteTranscript(db, replaces);
        }
        write(t, file, hash, passages);
        for (const k of kept as { passage_id: string; text: string; theme_id: string; coder: string; origin: string; created_at: string; rev: number }[]) {
          const r = restore.run(k.passage_id, k.theme_id, k.coder, k.origin, k.created_at, k.rev, k.passage_id, k.text);
          if (r.changes) report.keptCodings++;
          else report.droppedCodings++;
        }
        report.inlineCodings += writeInlineCodes(db, t, file, passages, rev, opts.coder, addCoding);
        const participant = passages.filter((p) => p.role === 'participant').length;
        const words = passages.reduce((n, p) => n + p.words, 0);
        report.words += words;
        report.added.push({ name: t.name, file, passages: passages.length, participant, interviewer: passages.length - participant, words, replaced: replaces !== null });
        next++;
        opts.onProgress?.(next, todo.length, t.name);
      }
    };
    await analyseMany(texts, (i, a) => {
      analyses[i] = a;
      flush(i + 1);
    });
    flush(texts.length); // transcripts with no turns left
    return report;
  });
}

function writeInlineCodes(
  db: DB,
  t: Transcript,
  file: string,
  passages: Passage[],
  rev: ReturnType<typeof currentRevision>,
  coder: string,
  add: ReturnType<typeof codingAdder>,
): number {
  let n = 0;
  // A coder who coded inline read the whole transcript: every passage counts as seen by them.
  if (passages.some((p) => p.codes.length)) {
    const seen = db.prepare('INSERT OR IGNORE INTO seen (coder, passage_id) VALUES (?, ?)');
    for (const p of passages) seen.run(coder, p.id);
  }
  for (const p of passages) {
    if (!p.codes.length) continue;
    const line = lineAt(t.source, p.offset);
    if (!rev) throw new UserError('inline codes need a template: run "trellis template set FILE" first', file, line);
    for (const path of p.codes) {
      let id: string;
      try {
        id = findByPath(rev.template, path).id;
      } catch (e) {
        if (e instanceof UserError) throw new UserError(`inline code {theme: ${path}}: ${e.message}`, file, line);
        throw e;
      }
      if (add(p.id, id, coder, 'inline', rev.rev)) n++;
    }
  }
  return n;
}

function lineAt(text: string, offset: number): number {
  let line = 1;
  for (let i = 0; i < offset && i < text.length; i++) if (text.charCodeAt(i) === 10) line++;
  return line;
}
