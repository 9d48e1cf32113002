/** The JSON of one passage's suggestions (the scripting contract of `trellis suggest --json`). */
import type { SuggestRun } from '../study/suggestions.js';
import { reasonJson, type Snippets } from './reasons.js';

type Passage = SuggestRun['passages'][number];

const round = (x: number) => Math.round(x * 1e4) / 1e4;

/** One passage's suggestions as a plain object. */
export function passageJson(path: (themeId: string) => string, snippets: Snippets) {
  return (p: Passage) => ({
    passage_id: p.passageId,
    transcript: p.transcript,
    unclaimed: p.unclaimed,
    candidates: p.candidates.map((c) => ({
      suggestion_id: c.suggestionId,
      theme: path(c.themeId),
      confidence: round(c.confidence),
      above_threshold: c.aboveThreshold,
      chosen: c.chosen,
      reasons: c.reasons.map((r) => reasonJson(r, snippets)),
    })),
  });
}

/**
 * The same as JSON text, members in the same order, written out directly: bulk runs print
 * hundreds of thousands of candidates, and building then stringifying objects was most of the cost.
 */
export function passageJsonText(path: (themeId: string) => string, snippets: Snippets) {
  const themes = new Map<string, string>();
  const theme = (id: string) => {
    let t = themes.get(id);
    if (t === undefined) themes.set(id, (t = JSON.stringify(path(id))));
    return t;
  };
  return (p: Passage): string => {
    let s = `{"passage_id":${JSON.stringify(p.passageId)},"transcript":${JSON.stringify(p.transcript)},"unclaimed":${p.unclaimed},"candidates":[`;
    p.candidates.forEach((c, i) => {
      const reasons = c.reasons.length ? JSON.stringify(c.reasons.map((r) => reasonJson(r, snippets))) : '[]';
      s += `${i ? ',' : ''}{"suggestion_id":${c.suggestionId},"theme":${theme(c.themeId)},"confidence":${round(c.confidence)},` +
        `"above_threshold":${c.aboveThreshold},"chosen":${c.chosen},"reasons":${reasons}}`;
    });
    return s + ']}';
  };
}
