import type { Coding, ModelPassage, ThemeInfo } from '../suggest/types.js';
import { walk } from '../template/paths.js';
import { analyse } from '../text/nlp.js';
import { contentLemmas } from '../text/terms.js';
import { currentCodings } from './codings.js';
import type { DB } from './db.js';
import { passageTerms } from './passages.js';
import { currentTemplate } from './template.js';

export interface ModelInputs {
  passages: ModelPassage[];
  codings: Coding[];
  themes: ThemeInfo[];
  /** Participant passages with no current coding by anyone: what `suggest` works on. */
  uncoded: string[];
}

/** Everything the suggestion model learns from, read from the study in one go. */
export function modelInputs(db: DB): ModelInputs {
  const meta = db
    .prepare('SELECT p.id, t.name AS transcript, p.ordinal, p.role FROM passages p JOIN transcripts t ON t.id = p.transcript_id ORDER BY t.id, p.ordinal')
    .all() as { id: string; transcript: string; ordinal: number; role: ModelPassage['role'] }[];
  const terms = passageTerms(db);
  const passages: ModelPassage[] = meta.map((m, i) => ({ ...m, terms: contentLemmas({ lemmas: terms[i]!.lemmas, stop: terms[i]!.stops }) }));

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
    definitionTerms: contentLemmas(analyse(`${e.node.definition} ${e.node.include}`)),
  }));
  return { passages, codings, themes, uncoded };
}
