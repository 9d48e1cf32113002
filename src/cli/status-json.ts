/** The JSON of `trellis status` (docs/schema/status.schema.json), keys in snake_case. */
import type { StudyStatus } from '../jobs/status.js';

type ThemeName = { path: string; number: string };

export function statusJson(s: StudyStatus, names: Map<string, ThemeName>) {
  return {
    transcripts: s.transcripts,
    passages: s.passages,
    coded: s.coded,
    uncoded: s.uncoded,
    revision: s.revision,
    themes: s.themes,
    per_theme: s.perTheme.map((c) => ({
      id: c.id,
      direct: c.direct,
      total: c.total,
      transcripts: c.transcripts,
      strength: c.strength,
      path: names.get(c.id)?.path,
      number: names.get(c.id)?.number,
    })),
    per_coder: s.perCoder,
    // A transcript without passages sums to null in SQL: it has 0 participant passages.
    per_transcript: s.perTranscript.map((t) => ({ name: t.name, passages: t.passages, participant: t.participant ?? 0, coded: t.coded })),
    coded_transcripts: s.coded_transcripts,
  };
}
