/**
 * The rows of a review session: which passages are still open to it, the guarded writes it
 * makes, and what it reads of a passage. The session rules are in src/review/session.ts; the screens only draw and read keys.
 */
import { UserError } from '../errors.js';
import type { Reason } from '../suggest/types.js';
import { FALLBACK_THRESHOLD, type ReviewItem } from '../review/order.js';
import { walk } from '../template/paths.js';
import type { DB } from './db.js';
import { decide, markNothingToCode, undo, type Action, type DecisionRow } from './decisions.js';
import { getPassage, passageTokens, type StoredPassage } from './passages.js';
import { currentTemplate, themePaths } from './template.js';

/** Passages with a decision that still stands (not undone; a defer does not count). */
export function decidedPassages(db: DB): Set<string> {
  const rows = db
    .prepare(
      `SELECT DISTINCT d.passage_id AS id FROM standing_decisions d WHERE d.action != 'defer' AND d.passage_id IS NOT NULL`,
    )
    .all() as { id: string }[];
  return new Set(rows.map((r) => r.id));
}

/** Theme id -> position in the current template (document order). */
export function themeOrder(db: DB): Map<string, number> {
  return new Map([...walk(currentTemplate(db))].map((e, i) => [e.node.id, i]));
}

/** Each passage's place in the study: its ordinal and its transcript's row id. */
export function passagePlaces(db: DB): Map<string, { id: string; ordinal: number; t: number }> {
  return new Map(
    (db.prepare('SELECT p.id, p.ordinal, p.transcript_id AS t FROM passages p').all() as { id: string; ordinal: number; t: number }[]).map((r) => [r.id, r]),
  );
}

/** Another coder's (or another session's) claim on a passage, which closes it for this session. */
export interface Claim {
  kind: 'decision' | 'coding';
  coder: string;
  action?: string;
  decisionId?: number;
}

/**
 * Whether the passage is still open for this session: no current coding and no standing
 * decision other than those this session made itself (`mine`: its decision ids).
 */
export function claimOn(db: DB, passageId: string, mine: ReadonlySet<number>): Claim | null {
  const ds = db
    .prepare(
      `SELECT d.id, d.coder, d.action FROM standing_decisions d WHERE d.passage_id = ? AND d.action != 'defer' ORDER BY d.id`,
    )
    .all(passageId) as { id: number; coder: string; action: string }[];
  const other = ds.find((d) => !mine.has(d.id));
  if (other) return { kind: 'decision', coder: other.coder, action: other.action, decisionId: other.id };
  const cs = db.prepare('SELECT coder, decision_id FROM codings WHERE passage_id = ? AND removed_at IS NULL').all(passageId) as {
    coder: string;
    decision_id: number | null;
  }[];
  const coding = cs.find((c) => c.decision_id === null || !mine.has(c.decision_id));
  return coding ? { kind: 'coding', coder: coding.coder } : null;
}

const ACTION_WORDS: Record<string, string> = { accept: 'accepted', reject: 'rejected', recode: 're-coded', defer: 'deferred', nocode: 'marked nothing to code' };

/** Raised when another session got to the passage first; the loop says so and moves on. */
export class AlreadyDecided extends UserError {
  constructor(
    readonly passageId: string,
    readonly claim: Claim,
  ) {
    super(
      claim.kind === 'decision'
        ? `${passageId} was already decided (${ACTION_WORDS[claim.action!] ?? claim.action} by ${claim.coder}, decision #${claim.decisionId})`
        : `${passageId} was already coded (by ${claim.coder})`,
    );
    this.name = 'AlreadyDecided';
  }
}

export interface ReviewDecision {
  suggestionId: number;
  action: Action;
  themePath?: string;
  note?: string;
  coder: string;
}

/**
 * One decision, in its own IMMEDIATE transaction: the write lock is taken before the passage is
 * checked, so two sessions cannot both decide it (the second waits, then sees the first).
 */
export function reviewDecide(db: DB, passageId: string, d: ReviewDecision, mine: ReadonlySet<number>): DecisionRow {
  return db
    .transaction(() => {
      const claim = claimOn(db, passageId, mine);
      if (claim) throw new AlreadyDecided(passageId, claim);
      return decide(db, d);
    })
    .immediate();
}

/** "Reviewed, nothing to code" from a review session, guarded like reviewDecide. */
export function reviewNothingToCode(db: DB, passageId: string, coder: string, note: string | undefined, mine: ReadonlySet<number>): DecisionRow {
  return db
    .transaction(() => {
      const claim = claimOn(db, passageId, mine);
      if (claim) throw new AlreadyDecided(passageId, claim);
      return markNothingToCode(db, [passageId], coder, note)[0]!;
    })
    .immediate();
}

/** Undoes the coder's latest standing decision; returns the undo entry and the entry it undid. */
export function undoLatest(db: DB, coder: string, note?: string): { undo: DecisionRow; undone: DecisionRow } {
  return db
    .transaction(() => {
      const u = undo(db, coder, undefined, note);
      const undone = db.prepare('SELECT * FROM decisions WHERE id = ?').get(u.undoes) as DecisionRow;
      return { undo: u, undone };
    })
    .immediate();
}

/** Suggestion ids among these with a standing reject (shown struck out, not offered again). */
export function standingRejects(db: DB, suggestionIds: number[]): Set<number> {
  return standing(db, suggestionIds, ['reject']);
}

/** Of these suggestions, those with a standing accept or re-code (the passage carries a theme from them). */
export function standingAccepts(db: DB, suggestionIds: number[]): Set<number> {
  return standing(db, suggestionIds, ['accept', 'recode']);
}

function standing(db: DB, suggestionIds: number[], actions: string[]): Set<number> {
  if (!suggestionIds.length) return new Set();
  const rows = db
    .prepare(
      `SELECT d.suggestion_id AS id FROM standing_decisions d WHERE d.action IN (${actions.map((a) => `'${a}'`).join(',')}) AND d.suggestion_id IN (${suggestionIds.map(() => '?').join(',')})`,
    )
    .all(...suggestionIds) as { id: number }[];
  return new Set(rows.map((r) => r.id));
}

/**
 * The queue item for a passage outside the session's queue (going back to it after an undo):
 * the candidates of the run that the undone decision came from, with the current theme paths.
 */
export function itemFromRun(db: DB, suggestionId: number): ReviewItem | undefined {
  const s = db.prepare('SELECT run_id, passage_id FROM suggestions WHERE id = ?').get(suggestionId) as { run_id: number; passage_id: string } | undefined;
  if (!s) return undefined;
  const p = db.prepare('SELECT p.ordinal, p.transcript_id AS t, t.name FROM passages p JOIN transcripts t ON t.id = p.transcript_id WHERE p.id = ?').get(s.passage_id) as
    | { ordinal: number; t: number; name: string }
    | undefined;
  if (!p) return undefined;
  const rows = db
    .prepare('SELECT id, theme_id, confidence, above, reasons FROM suggestions WHERE run_id = ? AND passage_id = ? ORDER BY rank')
    .all(s.run_id, s.passage_id) as { id: number; theme_id: string; confidence: number; above: number; reasons: string }[];
  const paths = themePaths(db);
  return {
    passageId: s.passage_id,
    transcript: p.name,
    transcriptIndex: p.t,
    ordinal: p.ordinal,
    candidates: rows.map((r) => ({
      suggestionId: r.id,
      themeId: r.theme_id,
      path: paths.get(r.theme_id) ?? `${r.theme_id} (no longer in the template)`,
      confidence: r.confidence,
      above: r.above === 1,
      threshold: FALLBACK_THRESHOLD,
      reasons: JSON.parse(r.reasons) as Reason[],
    })),
  };
}

export interface Turn {
  speaker: string | null;
  start: number | null;
  text: string;
}

export interface PassageView {
  passage: StoredPassage;
  tokens: { text: string; lemmas: string[]; spans: Int32Array };
  before: Turn | null;
  after: Turn | null;
  /** Passages in its transcript, for "passage 6 of 40". */
  passages: number;
}

/** The passage with its analysis, and the whole turns just before and after it, for context. */
export function passageView(db: DB, passageId: string): PassageView | undefined {
  const passage = getPassage(db, passageId);
  const tokens = passageTokens(db, [passageId]).get(passageId);
  if (!passage || !tokens) return undefined;
  const turn = (n: number): Turn | null => {
    const rows = db
      .prepare(
        `SELECT p.speaker, p.start_s AS start, p.text FROM passages p JOIN transcripts t ON t.id = p.transcript_id
         WHERE t.name = ? AND p.turn = ? ORDER BY p.ordinal`,
      )
      .all(passage.transcript, n) as { speaker: string | null; start: number | null; text: string }[];
    return rows.length ? { speaker: rows[0]!.speaker, start: rows[0]!.start, text: rows.map((r) => r.text).join(' ') } : null;
  };
  const count = db.prepare('SELECT COUNT(*) AS n FROM passages p JOIN transcripts t ON t.id = p.transcript_id WHERE t.name = ?').get(passage.transcript) as { n: number };
  return { passage, tokens, before: turn(passage.turn - 1), after: turn(passage.turn + 1), passages: count.n };
}

