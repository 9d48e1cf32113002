/**
 * Dense bounded rows of the pool, from when k-means (ml-kmeans) needed a full array per passage:
 * a pool of 20,000 passages over a 30,000-term vocabulary would be 4.8 GB. Discovery now runs
 * k-means on the sparse vectors (kmeans.ts); these remain as options for the measurements of
 * bench/lab-discover.mjs (docs/discovery.md). Two bounded forms:
 *  - 'vocabulary': the `dims` terms found in most passages (scikit-learn's max_features), each
 *    row re-scaled to unit length; passages with none of those terms become zero rows;
 *  - 'projection': a seeded sparse random projection of the full TF-IDF vector (every term sent
 *    to `nonZeros` of the `dims` columns with random signs, scaled by 1/sqrt(nonZeros): the sparse
 *    Johnson-Lindenstrauss transform of Kane and Nelson 2014), re-scaled to unit length. A term's
 *    columns depend only on the term and the seed, not on the rest of the vocabulary.
 */
import { seededRandom } from '../math/random.js';
import type { SparseVector } from '../math/sparse.js';
import type { Representation } from './types.js';

/** FNV-1a over UTF-16 code units: a term's stable 32-bit key. */
function hashString(s: string, seed: number): number {
  let h = (0x811c9dc5 ^ seed) >>> 0;
  for (let i = 0; i < s.length; i++) {
    h ^= s.charCodeAt(i);
    h = Math.imul(h, 0x01000193) >>> 0;
  }
  return h;
}

/** The columns and signs a term is projected onto. */
export function projectionOf(term: string, dims: number, nonZeros: number, seed: number): { columns: Int32Array; signs: Float64Array } {
  const s = Math.min(nonZeros, dims);
  const rand = seededRandom(hashString(term, seed));
  const columns = new Int32Array(s);
  const signs = new Float64Array(s);
  const scale = 1 / Math.sqrt(s);
  for (let k = 0; k < s; k++) {
    let c: number;
    do c = Math.floor(rand() * dims);
    while (columns.subarray(0, k).includes(c));
    columns[k] = c;
    signs[k] = rand() < 0.5 ? -scale : scale;
  }
  return { columns, signs };
}

function unit(row: Float64Array): Float64Array {
  let ss = 0;
  for (let j = 0; j < row.length; j++) ss += row[j]! * row[j]!;
  if (ss > 0) {
    const inv = 1 / Math.sqrt(ss);
    for (let j = 0; j < row.length; j++) row[j] = row[j]! * inv;
  }
  return row;
}

export interface DenseOptions {
  method: Representation;
  dims: number;
  nonZeros: number;
  seed: number;
}

/**
 * Dense unit rows of the sparse vectors; `terms` names the vector indices and `df` gives their
 * document frequencies (both from the TF-IDF vectoriser). Returns the width actually used.
 */
export function denseRows(vectors: readonly SparseVector[], terms: readonly string[], df: readonly number[], o: DenseOptions): { rows: Float64Array[]; dims: number } {
  if (o.method === 'vocabulary') {
    const dims = Math.min(o.dims, terms.length);
    // Most frequent first; ties by index (the vectoriser's code-unit order), so the cut is stable.
    const order = Array.from(terms, (_, i) => i).sort((a, b) => df[b]! - df[a]! || a - b);
    const column = new Int32Array(terms.length).fill(-1);
    order.slice(0, dims).forEach((t, j) => (column[t] = j));
    const rows = vectors.map((v) => {
      const row = new Float64Array(dims);
      for (let k = 0; k < v.indices.length; k++) {
        const j = column[v.indices[k]!]!;
        if (j >= 0) row[j] = v.values[k]!;
      }
      return unit(row);
    });
    return { rows, dims };
  }
  const dims = o.dims;
  const cache = new Map<number, { columns: Int32Array; signs: Float64Array }>();
  const rows = vectors.map((v) => {
    const row = new Float64Array(dims);
    for (let k = 0; k < v.indices.length; k++) {
      const t = v.indices[k]!;
      let p = cache.get(t);
      if (!p) cache.set(t, (p = projectionOf(terms[t]!, dims, o.nonZeros, o.seed)));
      for (let q = 0; q < p.columns.length; q++) row[p.columns[q]!] += v.values[k]! * p.signs[q]!;
    }
    return unit(row);
  });
  return { rows, dims };
}
