/**
 * The terms a passage contributes to the models: its non-stop lemmas in order, and optionally
 * the bigrams of adjacent non-stop lemmas (stop words removed first, as scikit-learn's
 * vectorisers do, so "cover for absence" gives the bigram "cover absence").
 */
import type { TextAnalysis } from './analysis.js';

/** Whether a non-stop lemma is a term: it has a letter (numbers and punctuation are not). */
export const isTermLemma = (lemma: string): boolean => /\p{L}/u.test(lemma);

/** Non-stop lemmas of a stored analysis, in order (lemmas are already lower case). */
export function contentLemmas(a: Pick<TextAnalysis, 'lemmas' | 'stop'>): string[] {
  const out: string[] = [];
  for (let i = 0; i < a.lemmas.length; i++) if (!a.stop[i] && isTermLemma(a.lemmas[i]!)) out.push(a.lemmas[i]!);
  return out;
}

/** Unigrams followed by bigrams ("a b") when asked; without them, a copy of the lemmas. */
export function withBigrams(lemmas: readonly string[], bigrams: boolean): string[] {
  if (!bigrams || lemmas.length < 2) return lemmas.slice();
  const out = lemmas.slice();
  for (let i = 1; i < lemmas.length; i++) out.push(`${lemmas[i - 1]} ${lemmas[i]}`);
  return out;
}
