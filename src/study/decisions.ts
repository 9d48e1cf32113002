import { UserError } from '../errors.js';
import { findByPath, pathOf } from '../template/paths.js';
import type { DB } from './db.js';
import { getSuggestion } from './suggestion-rows.js';
import { currentRevision, currentTemplate, themePaths } from './template.js';

export type Action = 'accept' | 'reject' | 'recode' | 'defer';

export interface DecisionRow {
  id: number;
  at: string;
  coder: string;
  action: Action | 'undo' | 'nocode';
  suggestion_id: number | null;
  passage_id: string | null;
  transcript: string | null;
  theme_id: string | null;
  confidence: number | null;
  rank: number | null;
  chosen_theme: string | null;
  note: string | null;
  rev: number | null;
  fingerprint: string | null;
  bulk: number;
  undoes: number | null;
}

export interface DecideInput {
  suggestionId: number;
  action: Action;
  /** With accept or reject: code this theme instead (a re-code). */
  themePath?: string;
  note?: string;
  coder: string;
  bulk?: boolean;
}

/** Decisions that still stand: not undo entries, and not undone. */
export function effectiveDecisions(db: DB): DecisionRow[] {
  return db
    .prepare(
      `SELECT * FROM standing_decisions d ORDER BY d.id`,
    )
    .all() as DecisionRow[];
}

export function allDecisions(db: DB): DecisionRow[] {
  return db.prepare('SELECT * FROM decisions ORDER BY id').all() as DecisionRow[];
}

/** The decision that still stands on this suggestion, or on the same passage and theme from another run. */
function standing(db: DB, suggestionId: number): DecisionRow | undefined {
  return db
    .prepare(
      `SELECT d.* FROM standing_decisions d, suggestions s WHERE s.id = ?
         AND (d.suggestion_id = s.id OR (d.passage_id = s.passage_id AND d.theme_id = s.theme_id))
         AND d.action != 'defer' ORDER BY d.id DESC LIMIT 1`,
    )
    .get(suggestionId) as DecisionRow | undefined;
}

/**
 * Records one decision on a suggestion and its effect, in one transaction: an accept or a
 * re-code becomes a coding whose origin says so; a reject is kept as negative evidence.
 */
export function decide(db: DB, d: DecideInput): DecisionRow {
  // IMMEDIATE: it reads, then writes; another process committing in between must make it wait, not fail.
  return db.transaction(() => record(db, d)).immediate();
}

function record(db: DB, d: DecideInput): DecisionRow {
  const s = getSuggestion(db, d.suggestionId);
  if (!s) throw new UserError(`no suggestion #${d.suggestionId} in this study (see the ids in "trellis suggest")`);
  const passage = db.prepare('SELECT p.id, t.name AS transcript FROM passages p JOIN transcripts t ON t.id = p.transcript_id WHERE p.id = ?').get(s.passage_id) as
    | { id: string; transcript: string }
    | undefined;
  if (!passage) throw new UserError(`suggestion #${d.suggestionId} is for passage ${s.passage_id}, which is no longer in the study (its transcript was replaced)`);
  const before = standing(db, d.suggestionId);
  if (before) {
    throw new UserError(`suggestion #${d.suggestionId} was already decided (${before.action} by ${before.coder}, ${before.at.slice(0, 16).replace('T', ' ')}); undo that decision first`);
  }
  const rev = currentRevision(db);
  const template = currentTemplate(db);
  let action: Action = d.action;
  let chosen: string | null = null;
  if (d.themePath) {
    if (action === 'defer') throw new UserError('--theme re-codes a passage: use it with accept or reject, not defer');
    chosen = findByPath(template, d.themePath).id;
    action = chosen === s.theme_id ? 'accept' : 'recode';
  } else if (action === 'recode') {
    throw new UserError('a re-code needs the theme to code instead: --theme PATH');
  } else if (action === 'accept') {
    chosen = s.theme_id;
    try {
      pathOf(template, chosen);
    } catch {
      throw new UserError(`the suggested theme of #${d.suggestionId} is no longer in the template (retired or merged); re-code with --theme PATH`);
    }
  }
  const now = new Date().toISOString();
  const id = Number(
    db
      .prepare(
        `INSERT INTO decisions (at, coder, action, suggestion_id, passage_id, transcript, theme_id, confidence, rank, chosen_theme, note, rev, fingerprint, bulk)
         VALUES (?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?)`,
      )
      .run(now, d.coder, action, s.id, s.passage_id, passage.transcript, s.theme_id, s.confidence, s.rank, chosen, d.note ?? null, rev?.rev ?? null, s.fingerprint, d.bulk ? 1 : 0)
      .lastInsertRowid,
  );
  if (chosen) {
    db.prepare(
      `INSERT INTO codings (passage_id, theme_id, coder, origin, created_at, rev, decision_id)
       SELECT ?, ?, ?, ?, ?, ?, ? WHERE NOT EXISTS
         (SELECT 1 FROM codings WHERE passage_id = ? AND theme_id = ? AND coder = ? AND removed_at IS NULL)`,
    ).run(s.passage_id, chosen, d.coder, action === 'accept' ? (d.bulk ? 'bulk' : 'accepted') : 're-coded', now, rev?.rev ?? 0, id, s.passage_id, chosen, d.coder);
  }
  db.prepare('INSERT OR IGNORE INTO seen (coder, passage_id) VALUES (?, ?)').run(d.coder, s.passage_id);
  return db.prepare('SELECT * FROM decisions WHERE id = ?').get(id) as DecisionRow;
}

/**
 * Undoes a decision with a compensating entry (the log is never rewritten); the coding it made
 * is withdrawn. Without an id: the coder's latest decision that still stands.
 */
export function undo(db: DB, coder: string, decisionId?: number, note?: string): DecisionRow {
  return db.transaction(() => {
    const target = (
      decisionId !== undefined
        ? db.prepare('SELECT * FROM decisions WHERE id = ?').get(decisionId)
        : db
            .prepare(
              `SELECT * FROM standing_decisions d WHERE d.coder = ? ORDER BY d.id DESC LIMIT 1`,
            )
            .get(coder)
    ) as DecisionRow | undefined;
    if (!target) throw new UserError(decisionId !== undefined ? `no decision #${decisionId}` : `${coder} has no decision to undo`);
    if (target.action === 'undo') throw new UserError(`decision #${target.id} is itself an undo`);
    const done = db.prepare('SELECT id FROM decisions WHERE undoes = ?').get(target.id) as { id: number } | undefined;
    if (done) throw new UserError(`decision #${target.id} was already undone (by #${done.id})`);
    const now = new Date().toISOString();
    const rev = currentRevision(db);
    const id = Number(
      db
        .prepare(
          `INSERT INTO decisions (at, coder, action, suggestion_id, passage_id, transcript, theme_id, confidence, rank, chosen_theme, note, rev, fingerprint, bulk, undoes)
           VALUES (?, ?, 'undo', ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, 0, ?)`,
        )
        .run(now, coder, target.suggestion_id, target.passage_id, target.transcript, target.theme_id, target.confidence, target.rank, target.chosen_theme, note ?? null, rev?.rev ?? null, target.fingerprint, target.id)
        .lastInsertRowid,
    );
    db.prepare("UPDATE codings SET removed_at = ?, removed_by = ? WHERE decision_id = ? AND removed_at IS NULL").run(now, coder, target.id);
    return db.prepare('SELECT * FROM decisions WHERE id = ?').get(id) as DecisionRow;
  }).immediate();
}

/**
 * Deliberate bulk acceptance: every suggestion of the latest run for THEME with at least this
 * confidence, on a passage not yet coded and not yet decided, is accepted and logged as bulk.
 */
export function acceptAllAbove(db: DB, minConfidence: number, themePath: string, coder: string, note?: string): DecisionRow[] {
  const theme = findByPath(currentTemplate(db), themePath).id;
  return db.transaction(() => {
    const run = db.prepare('SELECT MAX(id) AS id FROM suggestion_runs').get() as { id: number | null };
    if (run.id === null) throw new UserError('no suggestions yet: run "trellis suggest" first');
    const ids = db
      .prepare(
        `SELECT s.id FROM suggestions s WHERE s.run_id = ? AND s.theme_id = ? AND s.confidence >= ?
         AND NOT EXISTS (SELECT 1 FROM codings c WHERE c.passage_id = s.passage_id AND c.removed_at IS NULL)
         ORDER BY s.id`,
      )
      .all(run.id, theme, minConfidence) as { id: number }[];
    return ids.filter((r) => !standing(db, r.id)).map((r) => record(db, { suggestionId: r.id, action: 'accept', coder, note, bulk: true }));
  }).immediate();
}

/**
 * "Reviewed, nothing to code": the coder read each passage and judged that no theme applies.
 * Each mark is a decision in the log (undo withdraws it), and counts as the coder having looked
 * at the passage, so for agreement it is a judgement that every theme is absent. A passage the
 * same coder has coded, or already marked, is refused: the whole call lands or none of it.
 */
export function markNothingToCode(db: DB, passageIds: readonly string[], coder: string, note?: string): DecisionRow[] {
  if (!passageIds.length) throw new UserError('name the passages: trellis nocode PASSAGE_ID... (ids as in "trellis suggest" or the coding sheet)');
  return db
    .transaction(() => {
      const get = db.prepare('SELECT p.id, p.role, t.name AS transcript FROM passages p JOIN transcripts t ON t.id = p.transcript_id WHERE p.id = ?');
      const coded = db.prepare('SELECT theme_id FROM codings WHERE passage_id = ? AND coder = ? AND removed_at IS NULL');
      const marked = nothingToCodeBy(db, coder);
      const rev = currentRevision(db);
      const now = new Date().toISOString();
      const ins = db.prepare(`INSERT INTO decisions (at, coder, action, passage_id, transcript, note, rev) VALUES (?, ?, 'nocode', ?, ?, ?, ?)`);
      const out: DecisionRow[] = [];
      for (const id of new Set(passageIds)) {
        const p = get.get(id) as { id: string; role: string; transcript: string } | undefined;
        if (!p) throw new UserError(`no passage "${id}" in this study (passage ids are shown by "trellis suggest" and in the coding sheet)`);
        if (p.role !== 'participant') throw new UserError(`passage ${id} is an interviewer turn: interviewer turns are never coded, so there is nothing to mark`);
        const has = coded.all(id, coder) as { theme_id: string }[];
        if (has.length) throw new UserError(`passage ${id} is coded by ${coder} (${has.length === 1 ? '1 theme' : `${has.length} themes`}): remove the coding before marking it nothing to code`);
        if (marked.has(id)) throw new UserError(`passage ${id} is already marked nothing to code by ${coder} (decision #${marked.get(id)})`);
        const did = Number(ins.run(now, coder, id, p.transcript, note ?? null, rev?.rev ?? null).lastInsertRowid);
        db.prepare('INSERT OR IGNORE INTO seen (coder, passage_id) VALUES (?, ?)').run(coder, id);
        out.push(db.prepare('SELECT * FROM decisions WHERE id = ?').get(did) as DecisionRow);
      }
      return out;
    })
    .immediate();
}

/** Passage id -> decision id of this coder's standing "nothing to code" marks. */
export function nothingToCodeBy(db: DB, coder: string): Map<string, number> {
  const rows = db
    .prepare(
      `SELECT d.id, d.passage_id FROM standing_decisions d WHERE d.action = 'nocode' AND d.coder = ?`,
    )
    .all(coder) as { id: number; passage_id: string }[];
  return new Map(rows.map((r) => [r.passage_id, r.id]));
}

/** Passages some coder marked "reviewed, nothing to code" (marks still standing). */
export function nothingToCode(db: DB): Set<string> {
  const rows = db
    .prepare(
      `SELECT DISTINCT d.passage_id AS id FROM standing_decisions d WHERE d.action = 'nocode'`,
    )
    .all() as { id: string }[];
  return new Set(rows.map((r) => r.id));
}

/** (passage, theme) pairs a coder rejected or re-coded away from: negative evidence. */
export function rejections(db: DB): { passageId: string; themeId: string }[] {
  return effectiveDecisions(db)
    .filter((d) => (d.action === 'reject' || d.action === 'recode') && d.passage_id && d.theme_id)
    .map((d) => ({ passageId: d.passage_id!, themeId: d.theme_id! }));
}

/** The whole log with theme paths beside the ids, for listing and export. */
/** The decision log's columns as CSV exports write them (the table's, then the two theme paths). */
export function logColumns(rows: readonly object[]): string[] {
  return rows.length ? Object.keys(rows[0]!) : ['id', 'at', 'coder', 'action', 'suggestion_id', 'passage_id', 'transcript', 'theme_id', 'note', 'theme_path', 'chosen_path'];
}

export function decisionLog(db: DB): (DecisionRow & { theme_path: string; chosen_path: string })[] {
  const paths = themePaths(db);
  const path = (id: string | null) => (id ? (paths.get(id) ?? id) : '');
  return allDecisions(db).map((d) => ({ ...d, theme_path: path(d.theme_id), chosen_path: path(d.chosen_theme) }));
}
