/**
 * TF-IDF passage vectors with a fit/transform shape and plain learned state.
 *
 * Defaults follow scikit-learn's TfidfVectorizer(sublinear_tf=True): tf = 1 + ln(count),
 * idf = ln((1 + n) / (1 + df)) + 1 (smoothed, as if one extra document held every term),
 * rows scaled to unit L2 length. The textbook variants (plain idf = log(n/df), base-10 logs, no
 * idf) are options so the model can be checked against published worked examples.
 */
import type { SparseVector } from '../math/sparse.js';

export type IdfKind = 'smooth' | 'plain' | 'none';

export interface TfidfOptions {
  /** 1 + log(tf) instead of the raw count (default true). */
  sublinearTf?: boolean;
  /** Default 'smooth'. */
  idf?: IdfKind;
  /** Base of the logarithms in tf and idf (default e; textbooks use 10). */
  logBase?: number;
  /** Scale every vector to unit L2 length (default true). */
  normalise?: boolean;
  /** Drop terms found in fewer documents than this (default 1: keep all). */
  minDf?: number;
}

/** Everything fit() learned, as plain data (JSON-serialisable). */
export interface TfidfState {
  options: Required<TfidfOptions>;
  documents: number;
  /** Terms in code-unit order; a term's index is its position here. */
  vocabulary: string[];
  df: number[];
  idf: number[];
}

/** The idf of a term found in `df` of `n` documents. */
export function idfWeight(n: number, df: number, kind: IdfKind = 'smooth', logBase = Math.E): number {
  const lg = Math.log(logBase);
  if (kind === 'none') return 1;
  if (kind === 'plain') return Math.log(n / df) / lg;
  return Math.log((1 + n) / (1 + df)) / lg + 1;
}

export class TfidfVectorizer {
  readonly options: Required<TfidfOptions>;
  private vocab: string[] = [];
  private index = new Map<string, number>();
  private df = new Float64Array(0);
  private idf = new Float64Array(0);
  private n = 0;

  constructor(opts: TfidfOptions = {}) {
    this.options = {
      sublinearTf: opts.sublinearTf ?? true,
      idf: opts.idf ?? 'smooth',
      logBase: opts.logBase ?? Math.E,
      normalise: opts.normalise ?? true,
      minDf: opts.minDf ?? 1,
    };
  }

  /** Learns the vocabulary and document frequencies of `docs` (each a list of terms). */
  fit(docs: readonly (readonly string[])[]): this {
    this.learn(docs);
    return this;
  }

  /**
   * fit(docs) and the vectors and raw counts of the same docs, hashing each token once: the
   * docs are turned into term ids while the vocabulary is learned, and vectorised from the ids.
   */
  fitVectorise(docs: readonly (readonly string[])[]): { vectors: SparseVector[]; counts: SparseVector[] } {
    const { ids, remap } = this.learn(docs);
    const vectors: SparseVector[] = new Array(docs.length);
    const counts: SparseVector[] = new Array(docs.length);
    const counter = new Float64Array(this.vocab.length);
    const seen: number[] = [];
    for (let d = 0; d < docs.length; d++) {
      for (const raw of ids[d]!) {
        const i = remap[raw]!;
        if (i < 0) continue;
        if (counter[i] === 0) seen.push(i);
        counter[i] = counter[i]! + 1;
      }
      const b = this.weigh(seen, counter);
      seen.length = 0;
      vectors[d] = b.vector;
      counts[d] = b.counts;
    }
    return { vectors, counts };
  }

  /** Vocabulary and document frequencies; returns each doc as provisional ids and their map to final indices (-1: dropped). */
  private learn(docs: readonly (readonly string[])[]): { ids: Int32Array[]; remap: Int32Array } {
    const id = new Map<string, number>();
    const names: string[] = [];
    const df: number[] = [];
    const last: number[] = [];
    const ids = docs.map((d, n) => {
      const out = new Int32Array(d.length);
      for (let k = 0; k < d.length; k++) {
        const t = d[k]!;
        let i = id.get(t);
        if (i === undefined) {
          i = names.length;
          id.set(t, i);
          names.push(t);
          df.push(0);
          last.push(-1);
        }
        if (last[i] !== n) {
          last[i] = n;
          df[i]!++;
        }
        out[k] = i;
      }
      return out;
    });
    const keep = names.map((_, i) => i).filter((i) => df[i]! >= this.options.minDf);
    keep.sort((a, b) => (names[a]! < names[b]! ? -1 : names[a]! > names[b]! ? 1 : 0));
    const remap = new Int32Array(names.length).fill(-1);
    keep.forEach((i, k) => (remap[i] = k));
    this.setVocabulary(
      keep.map((i) => names[i]!),
      keep.map((i) => df[i]!),
      docs.length,
    );
    return { ids, remap };
  }

  /** fit(docs), then the vectors of the same docs (in one pass, as fitVectorise). */
  fitTransform(docs: readonly (readonly string[])[]): SparseVector[] {
    return this.fitVectorise(docs).vectors;
  }

  /** Vectors of `docs`; terms outside the learned vocabulary are ignored. */
  transform(docs: readonly (readonly string[])[]): SparseVector[] {
    return docs.map((d) => this.vector(d));
  }

  vector(doc: readonly string[]): SparseVector {
    return this.vectorAndCounts(doc).vector;
  }

  /** The TF-IDF vector of a document and its raw term counts (same indices), in one pass. */
  vectorAndCounts(doc: readonly string[]): { vector: SparseVector; counts: SparseVector } {
    // A reusable dense counter: a Map per document was the cost of vectorising 10,000 passages.
    if (this.counter.length < this.vocab.length) this.counter = new Float64Array(this.vocab.length);
    const counter = this.counter;
    const seen: number[] = [];
    for (const t of doc) {
      const i = this.index.get(t);
      if (i === undefined) continue;
      if (counter[i] === 0) seen.push(i);
      counter[i] = counter[i]! + 1;
    }
    return this.weigh(seen, counter);
  }

  /**
   * Weights of the terms `seen` (counted in `counter`, which is cleared). The counts share the
   * vector's index array: both are read-only once made.
   */
  private weigh(seen: number[], counter: Float64Array): { vector: SparseVector; counts: SparseVector } {
    const indices = Int32Array.from(seen).sort();
    const values = new Float64Array(indices.length);
    const counts = new Float64Array(indices.length);
    const lg = Math.log(this.options.logBase);
    let ss = 0;
    for (let k = 0; k < indices.length; k++) {
      const c = counter[indices[k]!]!;
      counter[indices[k]!] = 0;
      counts[k] = c;
      const w = (this.options.sublinearTf ? 1 + Math.log(c) / lg : c) * this.idf[indices[k]!]!;
      values[k] = w;
      ss += w * w;
    }
    if (this.options.normalise && ss > 0) {
      const inv = 1 / Math.sqrt(ss);
      for (let k = 0; k < values.length; k++) values[k] = values[k]! * inv;
    }
    return { vector: { indices, values }, counts: { indices, values: counts } };
  }

  private counter = new Float64Array(0);

  /** The index of a term, or -1 when it is not in the vocabulary. */
  termIndex(term: string): number {
    return this.index.get(term) ?? -1;
  }

  term(index: number): string {
    return this.vocab[index]!;
  }

  get size(): number {
    return this.vocab.length;
  }

  get vocabulary(): readonly string[] {
    return this.vocab;
  }

  get state(): TfidfState {
    return { options: { ...this.options }, documents: this.n, vocabulary: this.vocab.slice(), df: [...this.df], idf: [...this.idf] };
  }

  static fromState(s: TfidfState): TfidfVectorizer {
    const v = new TfidfVectorizer(s.options);
    v.setVocabulary(s.vocabulary, s.df, s.documents);
    return v;
  }

  private setVocabulary(vocab: string[], df: readonly number[], n: number): void {
    this.vocab = vocab;
    this.n = n;
    this.index = new Map(vocab.map((t, i) => [t, i]));
    this.df = Float64Array.from(df);
    this.idf = Float64Array.from(df, (d) => idfWeight(n, d, this.options.idf, this.options.logBase));
  }
}
