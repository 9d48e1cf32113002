/** The rows of suggestion runs and their candidates. */
import type { Candidate, PassageSuggestions, Reason } from '../suggest/types.js';
import type { DB } from './db.js';

export interface StoredCandidate extends Candidate {
  suggestionId: number;
  rank: number;
}

/** What a run row records beside its candidates. */
export interface RunRow {
  rev: number;
  fingerprint: string;
  options: unknown;
  /** The model inputs' key (model_states), so a later run can tell it used the same inputs. */
  key: string;
}

/**
 * Stores a run and every candidate of its passages; each candidate gets its id and rank in place,
 * so the caller returns the same objects. Call inside the command's write transaction.
 */
export function storeSuggestionRun(db: DB, run: RunRow, kept: PassageSuggestions[], progress?: (done: number) => void): number {
  const runId = Number(
    db
      .prepare('INSERT INTO suggestion_runs (created_at, rev, fingerprint, options, passages, unclaimed, model_inputs) VALUES (?, ?, ?, ?, ?, ?, ?)')
      .run(new Date().toISOString(), run.rev, run.fingerprint, JSON.stringify(run.options), kept.length, kept.filter((p) => p.unclaimed).length, run.key).lastInsertRowid,
  );
  storeCandidates(db, runId, kept, progress);
  return runId;
}

/**
 * Stores more passages into a run stored earlier (a run scored in parts), as storeSuggestionRun
 * would have stored them: ids continue from the last one given, and the run's counts grow.
 */
export function addToSuggestionRun(db: DB, runId: number, kept: PassageSuggestions[], progress?: (done: number) => void): void {
  const changed = db
    .prepare('UPDATE suggestion_runs SET passages = passages + ?, unclaimed = unclaimed + ? WHERE id = ?')
    .run(kept.length, kept.filter((p) => p.unclaimed).length, runId).changes;
  if (changed !== 1) throw new Error(`suggestion run ${runId} is not in the study`);
  storeCandidates(db, runId, kept, progress);
}

function storeCandidates(db: DB, runId: number, kept: PassageSuggestions[], progress?: (done: number) => void): void {
  // Ids are given explicitly (the next free ones, inside this transaction), so that many rows
  // can go in one statement: a run writes hundreds of thousands of rows, and one statement
  // execution per row was most of the cost of storing them.
  let next = (db.prepare('SELECT COALESCE(MAX(id), 0) AS id FROM suggestions').get() as { id: number }).id + 1;
  const COLS = 9;
  const BATCH = 200;
  const statement = (n: number) =>
    db.prepare(`INSERT INTO suggestions (id, run_id, passage_id, theme_id, rank, confidence, above, chosen, reasons) VALUES ${Array(n).fill('(?, ?, ?, ?, ?, ?, ?, ?, ?)').join(', ')}`);
  const full = statement(BATCH);
  const args: unknown[] = [];
  const flush = () => {
    if (!args.length) return;
    (args.length === BATCH * COLS ? full : statement(args.length / COLS)).run(args);
    args.length = 0;
  };
  kept.forEach((p, n) => {
    if (progress && n % 500 === 0) progress(n / kept.length);
    p.candidates.forEach((c, i) => {
      const stored = c as StoredCandidate;
      stored.suggestionId = next++;
      stored.rank = i + 1;
      args.push(stored.suggestionId, runId, p.passageId, c.themeId, i + 1, c.confidence, c.aboveThreshold ? 1 : 0, c.chosen ? 1 : 0, c.reasons.length ? JSON.stringify(c.reasons) : '[]');
      if (args.length === BATCH * COLS) flush();
    });
  });
  flush();
}

export interface SuggestionRow {
  id: number;
  run_id: number;
  passage_id: string;
  theme_id: string;
  rank: number;
  confidence: number;
  above: number;
  chosen: number;
  reasons: Reason[];
  fingerprint: string;
  rev: number;
}

export function getSuggestion(db: DB, id: number): SuggestionRow | undefined {
  const row = db
    .prepare(
      `SELECT s.*, r.fingerprint, r.rev FROM suggestions s JOIN suggestion_runs r ON r.id = s.run_id WHERE s.id = ?`,
    )
    .get(id) as (Omit<SuggestionRow, 'reasons'> & { reasons: string }) | undefined;
  return row ? { ...row, reasons: JSON.parse(row.reasons) as Reason[] } : undefined;
}
