/**
 * Silhouette coefficient (Rousseeuw 1987) with scikit-learn's conventions: s(i) = (b - a) /
 * max(a, b), where a is the mean distance to the other members of i's cluster and b the lowest
 * mean distance to another cluster's members; a member of a singleton cluster scores 0.
 *
 * Cosine distance (1 - cosine similarity) is linear in the other point, so the distance sums to
 * each cluster come from per-cluster sums of unit vectors: O(n k nnz), exact, with no pairwise
 * pass and no need to sample however many passages there are. Euclidean distance needs every
 * pair: O(n^2 d), fine up to ~5,000 points; beyond that pass `sampleSize` (as scikit-learn's
 * sample_size: the score of a seeded random subset).
 */

import { sampleIndices } from '../math/random.js';

export type DenseRow = readonly number[] | Float64Array;
/** Sorted term indices with their weights (the shape of src/text's SparseVector). */
export interface SparseRow {
  indices: ArrayLike<number>;
  values: ArrayLike<number>;
}
export type Row = DenseRow | SparseRow;
export type SilhouetteMetric = 'cosine' | 'euclidean';

export interface SilhouetteOptions {
  /** Score a random subset of this many points (when smaller than the data). */
  sampleSize?: number;
  /** Seed for the subset; default 0. */
  seed?: number;
}

function isSparse(row: Row): row is SparseRow {
  return !Array.isArray(row) && !(row instanceof Float64Array);
}

function encode(labels: readonly (string | number)[]): { codes: Int32Array; k: number } {
  const seen = new Map<string | number, number>();
  const codes = new Int32Array(labels.length);
  labels.forEach((l, i) => {
    let c = seen.get(l);
    if (c === undefined) seen.set(l, (c = seen.size));
    codes[i] = c;
  });
  return { codes, k: seen.size };
}

/** dims: one past the largest index used, for sparse rows. */
function dimensionOf(X: readonly Row[]): number {
  let d = 0;
  for (const r of X) {
    if (isSparse(r)) {
      for (let t = 0; t < r.indices.length; t++) d = Math.max(d, r.indices[t]! + 1);
    } else d = Math.max(d, r.length);
  }
  return d;
}

/** sums[i * k + c] = sum of distances from point i to the points of cluster c (self excluded). */
function cosineSums(X: readonly Row[], codes: Int32Array, k: number): Float64Array {
  const n = X.length;
  const d = dimensionOf(X);
  const centre = new Float64Array(k * d); // per-cluster sums of unit vectors
  const counts = new Float64Array(k);
  const norms = new Float64Array(n);
  X.forEach((r, i) => {
    let s = 0;
    const vals = isSparse(r) ? r.values : r;
    for (let t = 0; t < vals.length; t++) s += vals[t]! * vals[t]!;
    norms[i] = Math.sqrt(s);
    counts[codes[i]!]++;
    if (norms[i] === 0) return;
    const base = codes[i]! * d;
    if (isSparse(r)) for (let t = 0; t < r.indices.length; t++) centre[base + r.indices[t]!] += r.values[t]! / norms[i]!;
    else for (let t = 0; t < r.length; t++) centre[base + t] += r[t]! / norms[i]!;
  });
  const sums = new Float64Array(n * k);
  X.forEach((r, i) => {
    const inv = norms[i]! > 0 ? 1 / norms[i]! : 0;
    for (let c = 0; c < k; c++) {
      const base = c * d;
      let dot = 0;
      if (isSparse(r)) for (let t = 0; t < r.indices.length; t++) dot += r.values[t]! * centre[base + r.indices[t]!]!;
      else for (let t = 0; t < r.length; t++) dot += r[t]! * centre[base + t]!;
      sums[i * k + c] = counts[c]! - dot * inv;
    }
    // Remove the point's distance to itself: 1 - |x|^2/|x|^2, i.e. 0, or 1 for a zero vector.
    const own = i * k + codes[i]!;
    sums[own] = sums[own]! - (norms[i]! > 0 ? 0 : 1);
  });
  return sums;
}

function euclideanSums(X: readonly Row[], codes: Int32Array, k: number): Float64Array {
  const n = X.length;
  const sums = new Float64Array(n * k);
  const addPair = (i: number, j: number, dist: number) => {
    sums[i * k + codes[j]!] += dist;
    sums[j * k + codes[i]!] += dist;
  };
  if (X.every((r) => !isSparse(r))) {
    const rows = X.map((r) => Float64Array.from(r as DenseRow));
    const d = rows.reduce((m, r) => Math.max(m, r.length), 0);
    const padded = rows.map((r) => (r.length === d ? r : Float64Array.from({ length: d }, (_, t) => r[t] ?? 0)));
    for (let i = 0; i < n; i++) {
      const a = padded[i]!;
      for (let j = i + 1; j < n; j++) {
        const b = padded[j]!;
        let s = 0;
        for (let t = 0; t < d; t++) {
          const diff = a[t]! - b[t]!;
          s += diff * diff;
        }
        addPair(i, j, Math.sqrt(s));
      }
    }
    return sums;
  }
  // Sparse (or mixed): |a - b|^2 = |a|^2 + |b|^2 - 2 a.b, with row i scattered into a dense buffer.
  const sparse: SparseRow[] = X.map((r) =>
    isSparse(r)
      ? r
      : { indices: Array.from({ length: r.length }, (_, t) => t), values: Array.from(r) },
  );
  const sq = sparse.map((r) => {
    let s = 0;
    for (let t = 0; t < r.values.length; t++) s += r.values[t]! * r.values[t]!;
    return s;
  });
  const buffer = new Float64Array(dimensionOf(sparse));
  for (let i = 0; i < n; i++) {
    const a = sparse[i]!;
    for (let t = 0; t < a.indices.length; t++) buffer[a.indices[t]!] = a.values[t]!;
    for (let j = i + 1; j < n; j++) {
      const b = sparse[j]!;
      let dot = 0;
      for (let t = 0; t < b.indices.length; t++) dot += b.values[t]! * buffer[b.indices[t]!]!;
      addPair(i, j, Math.sqrt(Math.max(0, sq[i]! + sq[j]! - 2 * dot)));
    }
    for (let t = 0; t < a.indices.length; t++) buffer[a.indices[t]!] = 0;
  }
  return sums;
}

/** Silhouette of every point, in input order. Throws unless 2 <= clusters <= points - 1. */
export function silhouetteSamples(
  X: readonly Row[],
  labels: readonly (string | number)[],
  metric: SilhouetteMetric = 'euclidean',
): Float64Array {
  if (X.length !== labels.length) throw new RangeError(`${X.length} points but ${labels.length} labels`);
  const n = X.length;
  const { codes, k } = encode(labels);
  if (k < 2 || k > n - 1) {
    throw new RangeError(`silhouette needs between 2 and ${n - 1} clusters (points - 1); got ${k}`);
  }
  const sums = metric === 'cosine' ? cosineSums(X, codes, k) : euclideanSums(X, codes, k);
  const sizes = new Float64Array(k);
  for (const c of codes) sizes[c]++;
  const out = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    const own = codes[i]!;
    if (sizes[own] === 1) continue; // singleton: 0
    const a = sums[i * k + own]! / (sizes[own]! - 1);
    let b = Infinity;
    for (let c = 0; c < k; c++) if (c !== own) b = Math.min(b, sums[i * k + c]! / sizes[c]!);
    const m = Math.max(a, b);
    out[i] = m > 0 ? (b - a) / m : 0;
  }
  return out;
}

/** Mean silhouette over all points, or over a seeded sample of `sampleSize` of them. */
export function silhouetteScore(
  X: readonly Row[],
  labels: readonly (string | number)[],
  metric: SilhouetteMetric = 'euclidean',
  options: SilhouetteOptions = {},
): number {
  let rows = X;
  let labs = labels;
  if (options.sampleSize !== undefined && options.sampleSize < X.length) {
    if (X.length !== labels.length) throw new RangeError(`${X.length} points but ${labels.length} labels`);
    const idx = sampleIndices(X.length, options.sampleSize, options.seed ?? 0);
    rows = idx.map((i) => X[i]!);
    labs = idx.map((i) => labels[i]!);
  }
  const s = silhouetteSamples(rows, labs, metric);
  let total = 0;
  for (const v of s) total += v;
  return total / s.length;
}
