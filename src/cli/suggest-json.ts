/** The JSON of one passage's suggestions (the scripting contract of `trellis suggest --json`). */
import type { SuggestRun } from '../jobs/suggest.js';
import { exemplarCited, exemplarTail, reasonJson, type Reason, type Snippets } from './reasons.js';

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
  const reasons = reasonsJsonText(snippets);
  return (p: Passage): string => {
    let s = `{"passage_id":${JSON.stringify(p.passageId)},"transcript":${JSON.stringify(p.transcript)},"unclaimed":${p.unclaimed},"candidates":[`;
    p.candidates.forEach((c, i) => {
      s += `${i ? ',' : ''}{"suggestion_id":${c.suggestionId},"theme":${theme(c.themeId)},"confidence":${round(c.confidence)},` +
        `"above_threshold":${c.aboveThreshold},"chosen":${c.chosen},"reasons":${c.reasons.length ? reasons(c.reasons) : '[]'}}`;
    });
    return s + ']}';
  };
}

/**
 * A candidate's reasons as JSON text. An exemplar reason cites one of a few thousand coded
 * passages, so its escaped id, transcript and snippets are kept; JSON escaping works character
 * by character, so escaped pieces joined are the escaped whole.
 */
function reasonsJsonText(snippets: Snippets) {
  const esc = (x: string) => JSON.stringify(x).slice(1, -1);
  const cited = new Map<string, { id: string; tail: string; short: string }>();
  const exemplar = (id: string, similarity: number) => {
    let e = cited.get(id);
    if (!e) {
      const s = snippets.get(id);
      const c = exemplarCited(s);
      e = { id: esc(id), tail: s ? `,"transcript":${JSON.stringify(c.transcript)},"snippet":${JSON.stringify(c.snippet)}` : '', short: esc(exemplarTail(s)) };
      cited.set(id, e);
    }
    return `{"kind":"exemplar","passage_id":"${e.id}","similarity":${similarity}${e.tail},` +
      `"text":"most like coded passage ${e.id} (similarity ${similarity.toFixed(2)})${e.short}"}`;
  };
  return (reasons: readonly Reason[]) =>
    '[' + reasons.map((r) => (r.kind === 'exemplar' ? exemplar(r.passageId, r.similarity) : JSON.stringify(reasonJson(r, snippets)))).join(',') + ']';
}
