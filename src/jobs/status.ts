import { countThemes } from '../template/number.js';
import { walk } from '../template/paths.js';
import { groupByTheme, rollUp } from '../template/rollup.js';
import type { Template } from '../template/types.js';
import { codedPairs, studyCounts } from '../study/counts.js';
import type { DB } from '../study/db.js';
import { currentRevision } from '../study/template.js';
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
  const rev = currentRevision(db);
  const { perCoder, perTranscript, ...counts } = studyCounts(db);
  return {
    ...counts,
    revision: rev?.rev ?? null,
    themes: rev ? countThemes(rev.template) : 0,
    perTheme: rev ? themeCounts(db, rev.template) : [],
    perCoder,
    perTranscript,
    coded_transcripts: perTranscript.filter((t) => t.coded > 0).length,
  };
}

/** Passage counts per theme, direct and rolled up over sub-themes (a passage counts once). */
export function themeCounts(db: DB, t: Template): ThemeCount[] {
  const { rows, transcriptOf } = codedPairs(db);
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
