import { createRequire } from 'node:module';
import type winkNLP from 'wink-nlp';
import type { TextAnalysis } from './analysis.js';
import { isStopWord } from './stopwords.js';

type Nlp = ReturnType<typeof winkNLP>;
let nlp: Nlp | null = null;

const CLITIC = /^(?:['\u2019](?:s|re|ll|d|ve|m)|n['\u2019]t)$/i;
const POSSESSIVE = /['\u2019]s$/;

// Required on first use, not imported: the model takes about 120 ms to load, and most commands
// (status, log, stats, review, …) never analyse text, yet every one of them would pay for it at start.
const load = createRequire(import.meta.url);

/** The wink-nlp pipeline, loaded on first use. Sentence boundaries and POS for lemmas. */
function pipeline(): Nlp {
  if (nlp === null) {
    const make = load('wink-nlp') as typeof winkNLP;
    nlp = make(load('wink-eng-lite-web-model') as Parameters<typeof winkNLP>[0], ['sbd', 'pos']);
  }
  return nlp;
}

/** Lemmas, stop-word flags, token and sentence offsets of one text. */
export function analyse(text: string): TextAnalysis {
  const p = pipeline();
  const its = p.its;
  const doc = p.readDoc(text);
  const tokens = doc.tokens();
  const values = tokens.out(its.value) as string[];
  const spaces = tokens.out(its.precedingSpaces) as string[];
  const types = tokens.out(its.type) as string[];
  // its.lemma needs the model add-ons; its declared type does not say so.
  const lemmas = tokens.out(its.lemma as never) as unknown as string[];

  // wink keeps every character: preceding spaces + values rebuild the text, so offsets follow.
  const tokStart = new Int32Array(values.length);
  const tokEnd = new Int32Array(values.length);
  let pos = 0;
  for (let i = 0; i < values.length; i++) {
    pos += spaces[i]!.length;
    tokStart[i] = pos;
    pos += values[i]!.length;
    tokEnd[i] = pos;
  }

  // Clitics ('s, 're, n't, ...) are dropped and a possessive kept inside a word ("god's") is cut
  // off: wink splits "God's" differently depending on what it has seen before, and passage word
  // counts (hence windows and passage ids) must not depend on what else was analysed.
  const wordIdx: number[] = [];
  for (let i = 0; i < types.length; i++) if (types[i] === 'word' && !CLITIC.test(values[i]!)) wordIdx.push(i);
  const n = wordIdx.length;
  const outLemmas = new Array<string>(n);
  const stop = new Uint8Array(n);
  const starts = new Int32Array(n);
  const ends = new Int32Array(n);
  for (let k = 0; k < n; k++) {
    const i = wordIdx[k]!;
    // wink gives no lemma for a few words ("cannot"): the word itself stands in.
    const lemma = (lemmas[i] ?? values[i]!).toLowerCase().replace(/\s+/g, '-').replace(POSSESSIVE, '');
    outLemmas[k] = lemma;
    stop[k] = isStopWord(lemma) ? 1 : 0;
    starts[k] = tokStart[i]!;
    ends[k] = tokEnd[i]!;
  }

  const spans = doc.sentences().out(its.span) as unknown as [number, number][];
  const sentences = new Int32Array(spans.length * 2);
  spans.forEach(([a, b], s) => {
    // Skip leading line-break tokens so a sentence starts at its first visible character.
    let first = a;
    while (first < b && types[first] === 'tabCRLF') first++;
    sentences[2 * s] = tokStart[first]!;
    sentences[2 * s + 1] = tokEnd[b]!;
  });
  return { lemmas: outLemmas, stop, starts, ends, sentences };
}
