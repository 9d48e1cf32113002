/**
 * Where a passage says what a reason cites: each matched lemma as the passage writes it, and the
 * stretch of the passage that holds most of the matched terms, so a researcher can check the
 * reason against the words themselves.
 */

export interface Fragment {
  /** lemma -> the first token of the passage with that lemma, exactly as written. */
  written: Record<string, string>;
  /** The matched stretch, cut at word boundaries, with "…" where the passage goes on. */
  fragment: string;
}

/**
 * @param spans token start and end offsets in `text`, two per token (as stored with the analysis)
 * @param maxChars longest fragment before the ellipses
 */
export function matchedFragment(text: string, lemmas: readonly string[], spans: ArrayLike<number>, terms: readonly string[], maxChars = 100): Fragment {
  const want = new Set(terms);
  const written: Record<string, string> = {};
  const hits: { token: number; lemma: string }[] = [];
  for (let i = 0; i < lemmas.length; i++) {
    const l = lemmas[i]!;
    if (!want.has(l)) continue;
    hits.push({ token: i, lemma: l });
    if (!(l in written)) written[l] = text.slice(spans[2 * i]!, spans[2 * i + 1]!);
  }
  if (!hits.length) return { written, fragment: '' };
  // The window starting at a hit that holds the most distinct matched lemmas within maxChars
  // (the earliest such window on a tie).
  let best = { from: 0, to: 0, n: 0 };
  for (let a = 0; a < hits.length; a++) {
    const start = spans[2 * hits[a]!.token]!;
    const seen = new Set<string>();
    let end = spans[2 * hits[a]!.token + 1]!;
    for (let b = a; b < hits.length; b++) {
      const e = spans[2 * hits[b]!.token + 1]!;
      if (e - start > maxChars) break;
      seen.add(hits[b]!.lemma);
      end = e;
    }
    if (seen.size > best.n) best = { from: start, to: end, n: seen.size };
  }
  // Widen to about maxChars with the words around it, half before and half after.
  const room = Math.max(0, maxChars - (best.to - best.from));
  let from = Math.max(0, best.from - Math.floor(room / 2));
  let to = Math.min(text.length, best.to + Math.ceil(room / 2));
  while (from > 0 && /\S/.test(text[from - 1]!) && from < best.from) from++;
  while (to < text.length && /\S/.test(text[to]!) && to > best.to) to--;
  const body = text.slice(from, to).replace(/\s+/g, ' ').trim();
  return { written, fragment: `${from > 0 ? '…' : ''}${body}${to < text.length ? '…' : ''}` };
}

/**
 * The form a study writes a lemma in, from the counts of its surface forms: the lemma itself
 * when the study writes it so; else the most frequent lower-case form (a word capitalised only
 * at the start of a sentence; "centre" for the lemma "center"), else the most frequent form (a
 * name such as "HCAs"); ties by code-unit order. The lemma when no form is seen.
 */
export function commonForm(lemma: string, forms: ReadonlyMap<string, number> | undefined): string {
  if (!forms || !forms.size) return lemma;
  if (forms.has(lemma)) return lemma;
  const pick = (keep: (f: string) => boolean) => {
    let best: string | null = null;
    let n = 0;
    for (const [f, c] of forms) if (keep(f) && (c > n || (c === n && best !== null && f < best))) (best = f), (n = c);
    return best;
  };
  return pick((f) => f === f.toLowerCase()) ?? pick(() => true) ?? lemma;
}
