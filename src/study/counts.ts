/** The counts `status` shows: transcripts, passages, codings per coder and per transcript. */
import type { DB } from './db.js';

export interface StudyCounts {
  transcripts: number;
  passages: { total: number; participant: number; interviewer: number };
  /** Participant passages with at least one current coding, and without. */
  coded: number;
  uncoded: number;
  perCoder: { coder: string; codings: number; passages: number }[];
  perTranscript: { name: string; passages: number; participant: number; coded: number }[];
}

export function studyCounts(db: DB): StudyCounts {
  const one = <T>(sql: string) => db.prepare(sql).get() as T;
  const p = one<{ total: number; participant: number | null }>(
    "SELECT COUNT(*) AS total, SUM(role = 'participant') AS participant FROM passages",
  );
  const participant = p.participant ?? 0;
  const coded = one<{ n: number }>(
    `SELECT COUNT(DISTINCT c.passage_id) AS n FROM codings c JOIN passages p ON p.id = c.passage_id
     WHERE c.removed_at IS NULL AND p.role = 'participant'`,
  ).n;
  const perTranscript = db
    .prepare(
      `SELECT t.name, COUNT(p.id) AS passages, SUM(p.role = 'participant') AS participant,
         (SELECT COUNT(DISTINCT c.passage_id) FROM codings c JOIN passages q ON q.id = c.passage_id
           WHERE q.transcript_id = t.id AND c.removed_at IS NULL) AS coded
       FROM transcripts t LEFT JOIN passages p ON p.transcript_id = t.id GROUP BY t.id ORDER BY t.id`,
    )
    .all() as StudyCounts['perTranscript'];
  return {
    transcripts: one<{ n: number }>('SELECT COUNT(*) AS n FROM transcripts').n,
    passages: { total: p.total, participant, interviewer: p.total - participant },
    coded,
    uncoded: participant - coded,
    perCoder: db
      .prepare(
        `SELECT coder, COUNT(*) AS codings, COUNT(DISTINCT passage_id) AS passages FROM codings
         WHERE removed_at IS NULL GROUP BY coder ORDER BY coder`,
      )
      .all() as StudyCounts['perCoder'],
    perTranscript,
  };
}

/** The current codings as distinct (theme, passage) pairs, and the transcript of each coded passage. */
export function codedPairs(db: DB): { rows: { theme_id: string; passage_id: string }[]; transcriptOf: Map<string, number> } {
  const rows = db.prepare('SELECT DISTINCT theme_id, passage_id FROM codings WHERE removed_at IS NULL').all() as {
    theme_id: string;
    passage_id: string;
  }[];
  const transcriptOf = new Map(
    (db.prepare('SELECT DISTINCT c.passage_id AS id, p.transcript_id AS t FROM codings c JOIN passages p ON p.id = c.passage_id WHERE c.removed_at IS NULL').all() as { id: string; t: number }[]).map((r) => [r.id, r.t]),
  );
  return { rows, transcriptOf };
}
