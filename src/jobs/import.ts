import { UserError } from '../errors.js';
import { reanchor } from '../ingest/reanchor.js';
import { roleOf } from '../ingest/roles.js';
import { segment, type Passage } from '../ingest/segment.js';
import type { Transcript } from '../ingest/types.js';
import { findByPath, walk } from '../template/paths.js';
import type { TextAnalysis } from '../text/analysis.js';
import { analyseMany } from '../text/pool.js';
import { codingAdder, seenMarker } from '../study/codings.js';
import { settingsOf, type DB } from '../study/db.js';
import { replacementWriter, type KeptCoding } from '../study/import-rows.js';
import { currentRevision } from '../study/template.js';
import { deleteTranscript, findTranscript, transcriptWriter } from '../study/transcripts.js';

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
  /** Codings kept across a --replace on a passage of the same text. */
  keptCodings: number;
  /** Codings moved across a --replace to the passage that overlaps their old one most. */
  movedCodings: number;
  /** Codings a --replace could not place: kept apart in unplaced_codings, listed here. */
  unplaced: { transcript: string; passage_id: string; theme_id: string; theme: string; coder: string }[];
  /** Always 0: kept for scripts that read it (codings are moved or kept apart, never dropped). */
  droppedCodings: number;
  words: number;
  warnings: string[];
}

/**
 * Which transcripts of `items` need writing (new, or changed with --replace); the unchanged ones
 * go into the report. A name taken by a different transcript without --replace is an error.
 */
function plan(db: DB, items: ImportItem[], opts: ImportOptions, report: ImportReport): Planned[] {
  const todo: Planned[] = [];
  const seen = new Map<string, string>();
  for (const item of items) {
    for (const t of item.transcripts) {
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
  return todo;
}

interface Planned {
  t: Transcript;
  file: string;
  hash: string;
  replaces: number | null;
}

/**
 * Imports transcripts: every file goes in, or none does. The text is analysed first (in worker
 * threads, the slow part) with the study unlocked; then one short write transaction re-checks the
 * plan against the study as it is by then and stores everything, so a long import never holds up
 * a review or a decision in another window.
 */
export async function importTranscripts(db: DB, items: ImportItem[], opts: ImportOptions): Promise<ImportReport> {
  const first = plan(db, items, opts, emptyReport());
  if (!first.length) {
    const report = emptyReport();
    plan(db, items, opts, report);
    return withWarnings(report, items);
  }
  const texts: string[] = [];
  const firstTurn = new Map<Transcript, number>();
  for (const { t } of first) {
    firstTurn.set(t, texts.length);
    for (const turn of t.turns) texts.push(turn.text);
  }
  const analyses = new Array<TextAnalysis>(texts.length);
  const ends = first.map(({ t }) => firstTurn.get(t)! + t.turns.length);
  let done = 0;
  // Counted apart from the call: `onProgress?.(++done)` skips the increment when there is no
  // callback, and the loops above it never end.
  const progressed = () => {
    done++;
    opts.onProgress?.(done, first.length, first[done - 1]!.t.name);
  };
  await analyseMany(texts, (i, a) => {
    analyses[i] = a;
    while (done < first.length && i + 1 >= ends[done]!) progressed();
  });
  while (done < first.length) progressed(); // transcripts with no turns

  return db.transaction(() => {
    const report = emptyReport();
    const todo = plan(db, items, opts, report); // what another command did meanwhile counts
    const rev = currentRevision(db);
    const { window } = settingsOf(db);
    const interviewers = opts.interviewers ?? [];
    const write = transcriptWriter(db);
    const addCoding = codingAdder(db);
    const replacing = replacementWriter(db);
    const markSeen = seenMarker(db);
    for (const { t, file, hash, replaces } of todo) {
      const from = firstTurn.get(t);
      if (from === undefined) {
        // Another command changed this transcript while the text was being analysed.
        throw new UserError(`"${t.name}" changed in the study while this import was analysing it; nothing was imported: run the same add again`, file);
      }
      const passages = segment(t, analyses.slice(from, from + t.turns.length), { window, roleOf: (s) => roleOf(s, interviewers) });
      let kept: KeptCoding[] = [];
      if (replaces !== null) {
        kept = replacing.codings(replaces);
        replacing.dropSuggestions(replaces);
        deleteTranscript(db, replaces);
      }
      write(t, file, hash, passages);
      if (kept.length) {
        // Each coding follows its text into the edited version (src/ingest/reanchor.ts has the rule).
        const olds = [...new Map(kept.map((k) => [k.passage_id, { id: k.passage_id, ordinal: k.ordinal, text: k.text }])).values()];
        const placed = reanchor(olds, passages.map((p) => ({ id: p.id, ordinal: p.ordinal, text: p.text })));
        const now = new Date().toISOString();
        for (const k of kept) {
          const to = placed.get(k.passage_id);
          if (to) {
            replacing.restore(k, to.to);
            if (to.how === 'same text') report.keptCodings++;
            else report.movedCodings++;
          } else {
            replacing.setApart(t.name, k, now);
            const theme = rev ? [...walk(rev.template)].find((e) => e.node.id === k.theme_id)?.path : undefined;
            report.unplaced.push({ transcript: t.name, passage_id: k.passage_id, theme_id: k.theme_id, theme: theme ?? k.theme_id, coder: k.coder });
          }
        }
      }
      report.inlineCodings += writeInlineCodes(t, file, passages, rev, opts.coder, addCoding, markSeen);
      const participant = passages.filter((p) => p.role === 'participant').length;
      const words = passages.reduce((n, p) => n + p.words, 0);
      report.words += words;
      report.added.push({ name: t.name, file, passages: passages.length, participant, interviewer: passages.length - participant, words, replaced: replaces !== null });
    }
    return withWarnings(report, items);
  })();
}

function emptyReport(): ImportReport {
  return { added: [], unchanged: [], inlineCodings: 0, keptCodings: 0, movedCodings: 0, unplaced: [], droppedCodings: 0, words: 0, warnings: [] };
}

function withWarnings(report: ImportReport, items: ImportItem[]): ImportReport {
  for (const item of items) for (const t of item.transcripts) report.warnings.push(...t.warnings);
  return report;
}

function writeInlineCodes(
  t: Transcript,
  file: string,
  passages: Passage[],
  rev: ReturnType<typeof currentRevision>,
  coder: string,
  add: ReturnType<typeof codingAdder>,
  markSeen: ReturnType<typeof seenMarker>,
): number {
  let n = 0;
  // A coder who coded inline read the whole transcript: every passage counts as seen by them.
  if (passages.some((p) => p.codes.length)) {
    for (const p of passages) markSeen(coder, p.id);
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
