import { writtenFormCounts } from '../study/passages.js';
import type { DB } from '../study/db.js';
import { commonForm } from '../text/fragment.js';

/**
 * How the study writes each of these lemmas (src/text/fragment.ts commonForm), from the stored
 * tokens of every passage: the analysis may spell a lemma otherwise ("colour" -> "color").
 */
export function writtenForms(db: DB, lemmas: Iterable<string>): Map<string, string> {
  const want = new Set(lemmas);
  const counts = writtenFormCounts(db, want);
  return new Map([...want].map((l) => [l, commonForm(l, counts.get(l))]));
}
