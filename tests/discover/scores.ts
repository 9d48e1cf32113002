/** Hand-made model scores for the discovery tests: confidences by theme id, 0 for a theme not named. */
import type { ThemeScores } from '../../src/suggest/types.js';

export interface ScoreRow {
  id: string;
  /** Confidence by theme id. */
  conf: Record<string, number>;
  /** The chosen themes (any order: put best first here, as the model does). */
  chosen?: string[];
}

export function scoreTable(themeIds: string[], rows: ScoreRow[], thresholds: Record<string, number> = {}): ThemeScores {
  const index = new Map(themeIds.map((id, t) => [id, t]));
  const at = (id: string) => {
    const t = index.get(id);
    if (t === undefined) throw new Error(`no theme ${id} in the table`);
    return t;
  };
  return {
    themeIds,
    scored: themeIds.map((_, t) => t),
    thresholds: themeIds.map((id) => thresholds[id] ?? 1),
    passages: rows.map((r) => {
      const confidence = new Float64Array(themeIds.length);
      for (const [id, c] of Object.entries(r.conf)) confidence[at(id)] = c;
      const chosen = (r.chosen ?? []).map(at).sort((a, b) => confidence[b]! - confidence[a]! || a - b);
      return { passageId: r.id, transcript: r.id.split('#')[0]!, confidence, chosen };
    }),
  };
}
