import { createHash } from 'node:crypto';
import type { ResolvedOptions } from '../suggest/suggester.js';
import type { Coding, ModelPassage, ThemeInfo } from '../suggest/types.js';
import { walk } from '../template/paths.js';
import { analyse } from '../text/nlp.js';
import { contentLemmas, isTermLemma } from '../text/terms.js';
import { currentCodings } from '../study/codings.js';
import type { DB } from '../study/db.js';
import { analysedPassages } from '../study/passages.js';
import { currentTemplate } from '../study/template.js';

export interface ModelInputs {
  passages: ModelPassage[];
  codings: Coding[];
  themes: ThemeInfo[];
  /** Participant passages with no current coding by anyone: what `suggest` works on. */
  uncoded: string[];
}

/** Everything the suggestion model learns from, read from the study in one go. */
export function modelInputs(db: DB): ModelInputs {
  // One pass over the stored analysis: the lemma string is split once, and whether a lemma has a
  // letter is decided once per distinct lemma (contentLemmas' test), not per token.
  // Every occurrence of a lemma becomes one shared string, whose hash the model's maps reuse.
  const rows = analysedPassages(db);
  const canonical = new Map<string, string | null>();
  const passages: ModelPassage[] = rows.map(([id, transcript, ordinal, role, lemmaText, stops]) => {
    const lemmas = lemmaText ? lemmaText.split(' ') : [];
    const terms: string[] = [];
    for (let i = 0; i < lemmas.length; i++) {
      if (stops[i]) continue;
      const l = lemmas[i]!;
      let c = canonical.get(l);
      if (c === undefined) canonical.set(l, (c = isTermLemma(l) ? l : null));
      if (c !== null) terms.push(c);
    }
    return { id, transcript, ordinal, role, terms, words: lemmas.length };
  });

  // Several coders may give one passage the same theme: the model needs it once.
  const seen = new Set<string>();
  const codings: Coding[] = [];
  for (const c of currentCodings(db)) {
    const key = `${c.passage_id}\u0000${c.theme_id}`;
    if (seen.has(key)) continue;
    seen.add(key);
    codings.push({ passageId: c.passage_id, themeId: c.theme_id });
  }
  const coded = new Set(codings.map((c) => c.passageId));
  const uncoded = passages.filter((p) => p.role === 'participant' && !coded.has(p.id)).map((p) => p.id);

  const themes: ThemeInfo[] = [...walk(currentTemplate(db))].map((e) => ({
    id: e.node.id,
    parentId: e.parentId,
    name: e.node.name,
    path: e.path,
    apriori: e.node.apriori,
    definition: e.node.definition,
    seeds: e.node.seeds.map((s) => contentLemmas(analyse(s)).join(' ')).filter(Boolean),
    // (Blank notes need no analysis, and so no loading of the language model.)
    nameTerms: contentLemmas(analyse(e.node.name)),
    definitionTerms: `${e.node.definition} ${e.node.include}`.trim() ? contentLemmas(analyse(`${e.node.definition} ${e.node.include}`)) : [],
  }));
  return { passages, codings, themes, uncoded };
}

/**
 * A hash of everything a fit learns from. Two fits on the same inputs give the same state (every
 * random choice is seeded), so a state stored under this key can stand in for a new fit.
 */
export function inputsKey(inputs: ModelInputs, negatives: readonly Coding[], options: ResolvedOptions, version: number): string {
  const h = createHash('sha256');
  const put = (s: string) => h.update(s).update('\u0000');
  put(`state ${version}`);
  put(JSON.stringify(options));
  for (const p of inputs.passages) put(`${p.id}\u0001${p.transcript}\u0001${p.ordinal}\u0001${p.role}\u0001${p.words ?? ''}\u0001${p.terms.join(' ')}`);
  for (const c of inputs.codings) put(`c ${c.passageId}\u0001${c.themeId}`);
  for (const n of negatives) put(`n ${n.passageId}\u0001${n.themeId}`);
  put(JSON.stringify(inputs.themes));
  return h.digest('hex').slice(0, 32);
}
