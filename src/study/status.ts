import { countThemes } from '../template/number.js';
import { walk } from '../template/paths.js';
import { groupByTheme, rollUp } from '../template/rollup.js';
import type { Template } from '../template/types.js';
import type { DB } from './db.js';
import { currentRevision } from './template.js';
import { themeStrength, type Strength } from '../suggest/strength.js';

export interface ThemeCount {
  id: string;
  /** Passages coded to this theme itself. */
  direct: number;
  /** Passages coded to it or any of its sub-themes (each passage once). */
  total: number;
  /** Transcripts holding those passages. */
  transcripts: number;
  /** Whether its suggestions' confidence can be checked on its own codings (src/suggest/strength.ts). */
  strength: Strength;
}

export interface StudyStatus {
  transcripts: number;
  passages: { total: number; participant: number; interviewer: number };
  /** Participant passages with at least one current coding, and without. */
  coded: number;
  uncoded: number;
  revision: number | null;
  themes: number;
  perTheme: ThemeCount[];
  perCoder: { coder: string; codings: number; passages: number }[];
  perTranscript: { name: string; passages: number; participant: number; coded: number }[];
  /** Transcripts with at least one current coding (perTranscript rows with coded > 0). */
  coded_transcripts: number;
}

export function studyStatus(db: DB): StudyStatus {
  const one = <T>(sql: string) => db.prepare(sql).get() as T;
  const rev = currentRevision(db);
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
    .all() as StudyStatus['perTranscript'];
  return {
    transcripts: one<{ n: number }>('SELECT COUNT(*) AS n FROM transcripts').n,
    passages: { total: p.total, participant, interviewer: p.total - participant },
    coded,
    uncoded: participant - coded,
    revision: rev?.rev ?? null,
    themes: rev ? countThemes(rev.template) : 0,
    perTheme: rev ? themeCounts(db, rev.template) : [],
    perCoder: db
      .prepare(
        `SELECT coder, COUNT(*) AS codings, COUNT(DISTINCT passage_id) AS passages FROM codings
         WHERE removed_at IS NULL GROUP BY coder ORDER BY coder`,
      )
      .all() as StudyStatus['perCoder'],
    perTranscript,
    coded_transcripts: perTranscript.filter((t) => t.coded > 0).length,
  };
}

/** Passage counts per theme, direct and rolled up over sub-themes (a passage counts once). */
export function themeCounts(db: DB, t: Template): ThemeCount[] {
  const rows = db.prepare('SELECT DISTINCT theme_id, passage_id FROM codings WHERE removed_at IS NULL').all() as {
    theme_id: string;
    passage_id: string;
  }[];
  const transcriptOf = new Map(
    (db.prepare('SELECT DISTINCT c.passage_id AS id, p.transcript_id AS t FROM codings c JOIN passages p ON p.id = c.passage_id WHERE c.removed_at IS NULL').all() as { id: string; t: number }[]).map((r) => [r.id, r.t]),
  );
  const batch = new Set(transcriptOf.values()).size;
  const rolled = rollUp(t, groupByTheme(rows.map((r) => ({ themeId: r.theme_id, member: r.passage_id }))));
  const direct = new Map<string, number>();
  for (const r of rows) direct.set(r.theme_id, (direct.get(r.theme_id) ?? 0) + 1);
  return [...walk(t)].map((e) => {
    const all = rolled.get(e.node.id)!;
    const ts = new Set([...all].map((pid) => transcriptOf.get(pid)));
    return {
      id: e.node.id,
      direct: direct.get(e.node.id) ?? 0,
      total: all.size,
      transcripts: ts.size,
      strength: themeStrength(all.size, ts.size, batch, Boolean(e.node.name.trim() || e.node.definition.trim() || e.node.seeds.length)),
    };
  });
}
