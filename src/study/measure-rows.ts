/** The rows the study's measures count: coverage, scorings, first codings, theme ages, reviews. */
import type { DB } from './db.js';

/** A suggestion run made by promoting a cluster is not a scoring of the passages. */
const SCORING_RUNS = `SELECT id FROM suggestion_runs WHERE options NOT LIKE '%"source":"promote"%'`;

/** Participant passages, and those with at least one current coding. */
export function codedParticipants(db: DB): { participant: number; coded: number } {
  return db
    .prepare(
      `SELECT (SELECT COUNT(*) FROM passages WHERE role = 'participant') AS participant,
              (SELECT COUNT(DISTINCT c.passage_id) FROM codings c JOIN passages p ON p.id = c.passage_id
                WHERE c.removed_at IS NULL AND p.role = 'participant') AS coded`,
    )
    .get() as { participant: number; coded: number };
}

/** The latest suggestion run that scored passages, if any. */
export function latestScoringRun(db: DB): { id: number } | undefined {
  return db.prepare(`${SCORING_RUNS} ORDER BY id DESC LIMIT 1`).get() as { id: number } | undefined;
}

/** Passages with a current coding. */
export function codedPassageIds(db: DB): Set<string> {
  return new Set((db.prepare(`SELECT DISTINCT c.passage_id AS id FROM codings c WHERE c.removed_at IS NULL`).all() as { id: string }[]).map((r) => r.id));
}

export function participantIds(db: DB): string[] {
  return (db.prepare("SELECT id FROM passages WHERE role = 'participant'").all() as { id: string }[]).map((r) => r.id);
}

/** Each coded transcript with the time of its first coding, in that order. */
export function firstCodings(db: DB): { transcript: string; firstCodedAt: string }[] {
  return db
    .prepare(
      `SELECT t.name AS transcript, MIN(c.created_at) AS firstCodedAt FROM codings c
       JOIN passages p ON p.id = c.passage_id JOIN transcripts t ON t.id = p.transcript_id
       GROUP BY t.id ORDER BY firstCodedAt, t.id`,
    )
    .all() as { transcript: string; firstCodedAt: string }[];
}

/**
 * For every passage any suggestion run scored: whether the latest run that scored it found a
 * theme to claim it (a chosen candidate). Runs made by promoting a cluster are not scorings.
 */
export function latestClaims(db: DB): Map<string, boolean> {
  const rows = db
    .prepare(
      `WITH latest AS (
         SELECT s.passage_id, MAX(s.run_id) AS run_id FROM suggestions s
         WHERE s.run_id IN (${SCORING_RUNS})
         GROUP BY s.passage_id)
       SELECT l.passage_id AS id, EXISTS (SELECT 1 FROM suggestions x WHERE x.run_id = l.run_id AND x.passage_id = l.passage_id AND x.chosen = 1) AS claimed
       FROM latest l`,
    )
    .all() as { id: string; claimed: number }[];
  return new Map(rows.map((r) => [r.id, r.claimed === 1]));
}

/** Theme id -> the time of the revision that created it. */
export function themesAddedAt(db: DB): Map<string, string> {
  return new Map(
    (db.prepare('SELECT t.id, r.created_at FROM themes t JOIN revisions r ON r.rev = t.created_rev').all() as { id: string; created_at: string }[]).map((r) => [r.id, r.created_at]),
  );
}

/** Each theme with each transcript it has been coded in (codings later withdrawn included). */
export function codedThemeTranscripts(db: DB): { themeId: string; transcript: string }[] {
  return db
    .prepare('SELECT DISTINCT c.theme_id AS themeId, t.name AS transcript FROM codings c JOIN passages p ON p.id = c.passage_id JOIN transcripts t ON t.id = p.transcript_id')
    .all() as { themeId: string; transcript: string }[];
}

export interface ReviewRow {
  coder: string;
  passage_id: string;
  transcript: string;
  theme_id?: string;
  origin?: string;
}

const JOIN = `JOIN passages p ON p.id = x.passage_id JOIN transcripts t ON t.id = p.transcript_id`;

/** Participant passages each of these coders decided on (a standing accept, reject, re-code or nothing-to-code). */
export function decidedBy(db: DB, coders: readonly string[]): ReviewRow[] {
  if (!coders.length) return [];
  return db
    .prepare(
      `SELECT DISTINCT x.coder, x.passage_id, t.name AS transcript FROM standing_decisions x ${JOIN}
       WHERE x.coder IN (${coders.map(() => '?').join(',')}) AND p.role = 'participant' AND x.action IN ('accept', 'reject', 'recode', 'nocode')`,
    )
    .all(...coders) as ReviewRow[];
}

/** The current codings of these coders on participant passages. */
export function codingsBy(db: DB, coders: readonly string[]): ReviewRow[] {
  if (!coders.length) return [];
  return db
    .prepare(
      `SELECT x.coder, x.passage_id, x.theme_id, x.origin, t.name AS transcript FROM codings x ${JOIN}
       WHERE x.removed_at IS NULL AND p.role = 'participant' AND x.coder IN (${coders.map(() => '?').join(',')})`,
    )
    .all(...coders) as ReviewRow[];
}

/** Each scored participant passage's latest scoring run, and the themes that run chose for it. */
export function latestScorings(db: DB): { passage_id: string; transcript: string; run_id: number; chosen: () => string[] }[] {
  const latest = db
    .prepare(
      `SELECT s.passage_id, t.name AS transcript, MAX(s.run_id) AS run_id FROM suggestions s
       JOIN passages p ON p.id = s.passage_id JOIN transcripts t ON t.id = p.transcript_id
       WHERE p.role = 'participant' AND s.run_id IN (${SCORING_RUNS})
       GROUP BY s.passage_id`,
    )
    .all() as { passage_id: string; transcript: string; run_id: number }[];
  const chosen = db.prepare('SELECT theme_id FROM suggestions WHERE run_id = ? AND passage_id = ? AND chosen = 1');
  return latest.map((l) => ({ ...l, chosen: () => (chosen.all(l.run_id, l.passage_id) as { theme_id: string }[]).map((r) => r.theme_id) }));
}
