/**
 * The text analysis stored with every passage, computed once at import so later commands never
 * re-run the language pipeline. Only word tokens are kept (punctuation, numbers, e-mail addresses
 * and line breaks carry no theme).
 */
export interface TextAnalysis {
  /** Lower-case lemma of each word token. */
  lemmas: string[];
  /** 1 where the lemma is a stop word or spoken filler. */
  stop: Uint8Array;
  /** Character offsets [start, end) of each word token in the analysed text. */
  starts: Int32Array;
  ends: Int32Array;
  /** Sentence spans as flat pairs [start0, end0, start1, end1, ...] in characters. */
  sentences: Int32Array;
}

/** The wire form used between worker threads and the main thread (strings + typed arrays). */
export interface PackedAnalysis {
  lemmas: string; // space-joined: a word token's lemma never contains a space
  stop: Uint8Array;
  starts: Int32Array;
  ends: Int32Array;
  sentences: Int32Array;
}

export function pack(a: TextAnalysis): PackedAnalysis {
  return { lemmas: a.lemmas.join(' '), stop: a.stop, starts: a.starts, ends: a.ends, sentences: a.sentences };
}

export function unpack(p: PackedAnalysis): TextAnalysis {
  return {
    lemmas: p.lemmas.length ? p.lemmas.split(' ') : [],
    stop: p.stop,
    starts: p.starts,
    ends: p.ends,
    sentences: p.sentences,
  };
}

/** The slice of an analysis covering characters [from, to), with offsets made relative to `from`. */
export function sliceAnalysis(a: TextAnalysis, from: number, to: number): TextAnalysis {
  let i = lowerBound(a.starts, from);
  let j = i;
  while (j < a.starts.length && a.ends[j]! <= to) j++;
  const starts = new Int32Array(j - i);
  const ends = new Int32Array(j - i);
  for (let k = i; k < j; k++) {
    starts[k - i] = a.starts[k]! - from;
    ends[k - i] = a.ends[k]! - from;
  }
  const sent: number[] = [];
  for (let k = 0; k < a.sentences.length; k += 2) {
    const s = Math.max(a.sentences[k]!, from);
    const e = Math.min(a.sentences[k + 1]!, to);
    if (e > s) sent.push(s - from, e - from);
  }
  return { lemmas: a.lemmas.slice(i, j), stop: a.stop.slice(i, j), starts, ends, sentences: Int32Array.from(sent) };
}

function lowerBound(arr: Int32Array, x: number): number {
  let lo = 0;
  let hi = arr.length;
  while (lo < hi) {
    const mid = (lo + hi) >> 1;
    if (arr[mid]! < x) lo = mid + 1;
    else hi = mid;
  }
  return lo;
}
