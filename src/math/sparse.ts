/**
 * Sparse vectors: sorted term indices with their weights. Passages have tens of distinct terms
 * out of tens of thousands, so every model works on this form; dense arrays appear only for
 * per-theme sums, and only over the vocabulary of coded passages.
 */
export interface SparseVector {
  /** Strictly increasing term indices. */
  indices: Int32Array;
  values: Float64Array;
}

export const EMPTY: SparseVector = { indices: new Int32Array(0), values: new Float64Array(0) };

/** A dense row as a sparse vector: its non-zero columns, in order. */
export function fromDense(row: ArrayLike<number>): SparseVector {
  const keep: number[] = [];
  for (let j = 0; j < row.length; j++) if (row[j] !== 0) keep.push(j);
  return { indices: Int32Array.from(keep), values: Float64Array.from(keep, (j) => row[j]!) };
}

/** A sparse vector from (index, value) pairs in any order; zero values are dropped. */
export function fromEntries(entries: Iterable<[number, number]>): SparseVector {
  const pairs = [...entries].filter(([, v]) => v !== 0).sort((a, b) => a[0] - b[0]);
  const indices = new Int32Array(pairs.length);
  const values = new Float64Array(pairs.length);
  pairs.forEach(([i, v], k) => {
    if (k > 0 && indices[k - 1] === i) throw new Error(`duplicate index ${i} in sparse vector`);
    indices[k] = i;
    values[k] = v;
  });
  return { indices, values };
}

/** Dot product of two sparse vectors (merge of the sorted index lists). */
export function dot(a: SparseVector, b: SparseVector): number {
  const ai = a.indices;
  const bi = b.indices;
  let i = 0;
  let j = 0;
  let s = 0;
  while (i < ai.length && j < bi.length) {
    const x = ai[i]!;
    const y = bi[j]!;
    if (x === y) s += a.values[i++]! * b.values[j++]!;
    else if (x < y) i++;
    else j++;
  }
  return s;
}

export function norm(a: SparseVector): number {
  let s = 0;
  for (let k = 0; k < a.values.length; k++) s += a.values[k]! * a.values[k]!;
  return Math.sqrt(s);
}

/** A copy scaled to unit length (the zero vector stays zero). */
export function normalised(a: SparseVector): SparseVector {
  const n = norm(a);
  const values = new Float64Array(a.values.length);
  if (n > 0) for (let k = 0; k < values.length; k++) values[k] = a.values[k]! / n;
  return { indices: a.indices.slice(), values };
}

export function cosine(a: SparseVector, b: SparseVector): number {
  const na = norm(a);
  const nb = norm(b);
  return na > 0 && nb > 0 ? dot(a, b) / (na * nb) : 0;
}

/** Sum of weighted sparse vectors, as a sparse vector. */
export function sum(vectors: SparseVector[], weights?: number[]): SparseVector {
  const acc = new Map<number, number>();
  vectors.forEach((v, n) => {
    const w = weights ? weights[n]! : 1;
    for (let k = 0; k < v.indices.length; k++) acc.set(v.indices[k]!, (acc.get(v.indices[k]!) ?? 0) + w * v.values[k]!);
  });
  return fromEntries(acc);
}

/** The vector as a plain object { index: value } (for fixtures, debugging and fingerprints). */
export function toRecord(a: SparseVector, terms?: readonly string[]): Record<string, number> {
  const out: Record<string, number> = {};
  for (let k = 0; k < a.indices.length; k++) out[terms ? terms[a.indices[k]!]! : String(a.indices[k])] = a.values[k]!;
  return out;
}
