import { groupByTheme, rollUp } from '../template/rollup.js';
import { clock } from '../sheet/sheet.js';
import { walk } from '../template/paths.js';
import type { DB } from './db.js';
import { currentTemplate, themePaths } from './template.js';

export interface CodingExport {
  passage_id: string;
  transcript: string;
  speaker: string;
  time: string;
  theme: string;
  coder: string;
  origin: string;
  coded_at: string;
  text: string;
}

export const CODING_COLUMNS = ['passage_id', 'transcript', 'speaker', 'time', 'theme', 'coder', 'origin', 'coded_at', 'text'] as const;

/** Every current coding with its passage, for analysis elsewhere (a retired theme is named so). */
export function codingsForExport(db: DB): CodingExport[] {
  const paths = themePaths(db);
  const names = new Map((db.prepare('SELECT id, name FROM themes').all() as { id: string; name: string }[]).map((t) => [t.id, t.name]));
  const rows = db
    .prepare(
      `SELECT c.passage_id, t.name AS transcript, p.speaker, p.start_s, c.theme_id, c.coder, c.origin, c.created_at, p.text
       FROM codings c JOIN passages p ON p.id = c.passage_id JOIN transcripts t ON t.id = p.transcript_id
       WHERE c.removed_at IS NULL ORDER BY t.id, p.ordinal, c.id`,
    )
    .all() as { passage_id: string; transcript: string; speaker: string | null; start_s: number | null; theme_id: string; coder: string; origin: string; created_at: string; text: string }[];
  return rows.map((r) => ({
    passage_id: r.passage_id,
    transcript: r.transcript,
    speaker: r.speaker ?? '',
    time: clock(r.start_s),
    theme: paths.get(r.theme_id) ?? `${names.get(r.theme_id) ?? r.theme_id} (retired)`,
    coder: r.coder,
    origin: r.origin,
    coded_at: r.created_at,
    text: r.text,
  }));
}

/** Theme x transcript matrix of coded passages, rolled up over sub-themes (each passage once). */
export function themeMatrix(db: DB): { transcripts: string[]; rows: { number: string; theme: string; counts: number[] }[] } {
  const template = currentTemplate(db);
  const entries = [...walk(template)];
  const transcripts = (db.prepare('SELECT name FROM transcripts ORDER BY id').all() as { name: string }[]).map((t) => t.name);
  const idx = new Map(transcripts.map((t, i) => [t, i]));
  const coded = db
    .prepare('SELECT DISTINCT c.theme_id, c.passage_id, t.name AS transcript FROM codings c JOIN passages p ON p.id = c.passage_id JOIN transcripts t ON t.id = p.transcript_id WHERE c.removed_at IS NULL')
    .all() as { theme_id: string; passage_id: string; transcript: string }[];
  const transcriptOf = new Map(coded.map((c) => [c.passage_id, c.transcript]));
  const rolled = rollUp(template, groupByTheme(coded.map((c) => ({ themeId: c.theme_id, member: c.passage_id }))));
  return {
    transcripts,
    rows: entries.map((e) => {
      const counts = new Array<number>(transcripts.length).fill(0);
      for (const p of rolled.get(e.node.id)!) counts[idx.get(transcriptOf.get(p)!)!]!++;
      return { number: e.number, theme: e.path, counts };
    }),
  };
}
