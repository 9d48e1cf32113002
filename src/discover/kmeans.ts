/**
 * k-means with k-means++ initialisation and seeded restarts, the lowest inertia kept (as
 * scikit-learn's KMeans with n_init), on sparse points: dense centres, sparse passages, so a Lloyd
 * step costs n x k x (terms per passage) instead of n x k x vocabulary.
 *
 * Written by hand rather than with ml-kmeans (which the tests keep as the reference for the Lloyd
 * steps): its dense steps needed full rows, so discovery had to cut the vocabulary to 256 terms,
 * and still took about ten times as long (docs/discovery.md, section 2).
 *
 *  - the start is scikit-learn's greedy k-means++ (2 + floor(ln k) candidates per centre, the one
 *    that lowers the potential most kept);
 *  - every restart has its own seed, drawn from `seed`, so a run repeats exactly;
 *  - a restart stops at a fixed point (no point changes cluster), when the centres' summed squared
 *    shift is at most `tolerance` x the mean per-column variance of the points (scikit-learn's
 *    rule), or after `maxIterations` steps; an empty cluster keeps its previous centre;
 *  - the final labels are each point's nearest final centre and the inertia is their summed
 *    squared distance, as scikit-learn reports them.
 */
import { seededRandom } from '../math/random.js';
import { fromDense, type SparseVector } from '../math/sparse.js';

export type DenseInput = readonly (readonly number[] | Float64Array)[];
/** Dense rows, or sparse vectors (term indices and weights). */
export type KMeansInput = DenseInput | readonly SparseVector[];

export interface KMeansOptions {
  /** Restarts from different k-means++ starts (default 5). */
  restarts?: number;
  seed?: number;
  /** Lloyd steps per restart at most (default 300, scikit-learn's). */
  maxIterations?: number;
  /** Relative tolerance on the centres' shift, as scikit-learn's `tol` (default 1e-4). */
  tolerance?: number;
}

export interface KMeansFit {
  /** Cluster of every point, 0 .. k - 1 (a cluster may end up empty). */
  labels: Int32Array;
  centroids: Float64Array[];
  inertia: number;
  /** Lloyd steps of the kept restart, whether it converged, and which restart it was. */
  iterations: number;
  converged: boolean;
  restart: number;
  /** Inertia of every restart, in order. */
  inertias: number[];
}

/** Points as parallel sparse arrays, with their squared norms and the number of columns. */
interface Points {
  idx: Int32Array[];
  val: Float64Array[];
  sq: Float64Array;
  dims: number;
}

function isSparse(x: KMeansInput): x is readonly SparseVector[] {
  return x.length > 0 && 'indices' in (x[0] as object);
}

function toPoints(x: KMeansInput): Points {
  const idx: Int32Array[] = [];
  const val: Float64Array[] = [];
  let dims = 0;
  if (isSparse(x)) {
    for (const v of x) {
      idx.push(v.indices);
      val.push(v.values);
      if (v.indices.length) dims = Math.max(dims, v.indices[v.indices.length - 1]! + 1);
    }
  } else {
    for (const r of x as DenseInput) {
      dims = Math.max(dims, r.length);
      const v = fromDense(r);
      idx.push(v.indices);
      val.push(v.values);
    }
  }
  const sq = Float64Array.from(val, (v) => v.reduce((s, a) => s + a * a, 0));
  return { idx, val, sq, dims };
}

/**
 * Nearest centre of every point and the summed squared distance (the E-step). Centres are held
 * transposed (column-major: `ct[t * k + j]`), so one point's scores against all centres read
 * one contiguous run per term.
 */
function eStep(p: Points, ct: Float64Array, cn: Float64Array, k: number, labels: Int32Array, dist: Float64Array): { inertia: number; changed: number } {
  const scores = new Float64Array(k);
  let inertia = 0;
  let changed = 0;
  for (let i = 0; i < p.idx.length; i++) {
    scores.fill(0);
    const ix = p.idx[i]!;
    const vx = p.val[i]!;
    for (let t = 0; t < ix.length; t++) {
      const v = vx[t]!;
      const o = ix[t]! * k;
      for (let j = 0; j < k; j++) scores[j] += v * ct[o + j]!;
    }
    let best = Infinity;
    let arg = 0;
    for (let j = 0; j < k; j++) {
      const d = p.sq[i]! + cn[j]! - 2 * scores[j]!;
      if (d < best) (best = d), (arg = j);
    }
    best = Math.max(0, best);
    if (labels[i] !== arg) (changed++, (labels[i] = arg));
    dist[i] = best;
    inertia += best;
  }
  return { inertia, changed };
}

function centreNorms(ct: Float64Array, k: number): Float64Array {
  const cn = new Float64Array(k);
  for (let o = 0; o < ct.length; o += k) for (let j = 0; j < k; j++) cn[j] += ct[o + j]! * ct[o + j]!;
  return cn;
}

/**
 * The points by term (an inverted index): for each column, the points with a non-zero entry
 * there, in point order, and their values. k-means++ compares each candidate centre with every
 * point; through the index it touches only the points that share a term with the candidate.
 */
interface Postings {
  start: Int32Array; // column c's entries are start[c] .. start[c + 1] - 1
  point: Int32Array;
  value: Float64Array;
}

function postingsOf(p: Points): Postings {
  const start = new Int32Array(p.dims + 1);
  for (const ix of p.idx) for (let t = 0; t < ix.length; t++) start[ix[t]! + 1]++;
  for (let c = 0; c < p.dims; c++) start[c + 1] += start[c]!;
  const fill = start.slice(0, p.dims);
  const point = new Int32Array(start[p.dims]!);
  const value = new Float64Array(start[p.dims]!);
  for (let i = 0; i < p.idx.length; i++) {
    const ix = p.idx[i]!;
    const vx = p.val[i]!;
    for (let t = 0; t < ix.length; t++) {
      const at = fill[ix[t]!]!++;
      point[at] = i;
      value[at] = vx[t]!;
    }
  }
  return { start, point, value };
}

/**
 * Squared distance of every point to point q (for k-means++). The dot products add the shared
 * terms' products in ascending column order, as a walk over each point's own terms would (its
 * other terms add exact zeros), so the distances are the same to the last bit.
 */
function distancesTo(p: Points, post: Postings, q: number, dot: Float64Array): Float64Array {
  const iq = p.idx[q]!;
  const vq = p.val[q]!;
  dot.fill(0);
  for (let t = 0; t < iq.length; t++) {
    const c = iq[t]!;
    const w = vq[t]!;
    for (let e = post.start[c]!; e < post.start[c + 1]!; e++) dot[post.point[e]!] += post.value[e]! * w;
  }
  const out = new Float64Array(p.idx.length);
  for (let i = 0; i < p.idx.length; i++) out[i] = Math.max(0, p.sq[i]! + p.sq[q]! - 2 * dot[i]!);
  return out;
}

/** Squared distance of every point to point q, as k-means++ computes it (for the tests). */
export function squaredDistancesTo(rows: KMeansInput, q: number): Float64Array {
  const p = toPoints(rows);
  return distancesTo(p, postingsOf(p), q, new Float64Array(p.idx.length));
}

/** scikit-learn's greedy k-means++: the indices of the k starting points. */
function kmeansPlusPlus(p: Points, post: Postings, k: number, rand: () => number): number[] {
  const n = p.idx.length;
  const buf = new Float64Array(n);
  const chosen = [Math.floor(rand() * n)];
  let closest = distancesTo(p, post, chosen[0]!, buf);
  const trials = 2 + Math.floor(Math.log(k));
  for (let c = 1; c < k; c++) {
    let pot = 0;
    for (let i = 0; i < n; i++) pot += closest[i]!;
    let best: { q: number; pot: number; d: Float64Array } | null = null;
    for (let t = 0; t < trials; t++) {
      let u = rand() * pot;
      let q = 0;
      // The first point whose cumulative weight passes u (numpy's searchsorted on the cumsum).
      while (q < n - 1 && (u -= closest[q]!) >= 0) q++;
      const d = distancesTo(p, post, q, buf);
      let np = 0;
      for (let i = 0; i < n; i++) np += Math.min(closest[i]!, d[i]!);
      if (!best || np < best.pot) best = { q, pot: np, d };
    }
    chosen.push(best!.q);
    const d = best!.d;
    for (let i = 0; i < n; i++) if (d[i]! < closest[i]!) closest[i] = d[i]!;
  }
  return chosen;
}

/** Mean over columns of the points' variance: the scale of scikit-learn's relative tolerance. */
function meanVariance(p: Points): number {
  const n = p.idx.length;
  const sum = new Float64Array(p.dims);
  let sq = 0;
  for (let i = 0; i < n; i++) {
    const ix = p.idx[i]!;
    const vx = p.val[i]!;
    for (let t = 0; t < ix.length; t++) sum[ix[t]!] += vx[t]!;
    sq += p.sq[i]!;
  }
  let means = 0;
  for (let j = 0; j < p.dims; j++) means += (sum[j]! / n) ** 2;
  return p.dims ? (sq / n - means) / p.dims : 0;
}

/** Lloyd steps from the given transposed centres, until a fixed point, the tolerance or the cap. */
function lloydSteps(p: Points, start: Float64Array, k: number, maxIterations: number, tol: number) {
  let ct: Float64Array = start;
  const n = p.idx.length;
  const labels = new Int32Array(n).fill(-1);
  const dist = new Float64Array(n);
  const counts = new Float64Array(k);
  let next: Float64Array = new Float64Array(ct.length);
  let iterations = 0;
  let converged = false;
  // The E-step that found no label changing ran on the final centres: its inertia is the answer.
  let fixedPoint: number | null = null;
  while (iterations < maxIterations) {
    const { changed, inertia } = eStep(p, ct, centreNorms(ct, k), k, labels, dist);
    if (changed === 0) {
      converged = true;
      fixedPoint = inertia;
      break;
    }
    iterations++;
    counts.fill(0);
    next.fill(0);
    for (let i = 0; i < n; i++) {
      const l = labels[i]!;
      counts[l]++;
      const ix = p.idx[i]!;
      const vx = p.val[i]!;
      for (let t = 0; t < ix.length; t++) next[ix[t]! * k + l] += vx[t]!;
    }
    let shift = 0;
    for (let o = 0; o < next.length; o += k) {
      for (let j = 0; j < k; j++) {
        const v = counts[j] ? next[o + j]! / counts[j]! : ct[o + j]!;
        next[o + j] = v;
        shift += (v - ct[o + j]!) ** 2;
      }
    }
    [ct, next] = [next, ct];
    if (shift <= tol) {
      converged = true;
      break;
    }
  }
  const inertia = fixedPoint ?? eStep(p, ct, centreNorms(ct, k), k, labels, dist).inertia;
  return { labels, inertia, ct, iterations, converged };
}

function untranspose(ct: Float64Array, k: number, dims: number): Float64Array[] {
  return Array.from({ length: k }, (_, j) => {
    const c = new Float64Array(dims);
    for (let t = 0; t < dims; t++) c[t] = ct[t * k + j]!;
    return c;
  });
}

function transpose(centres: readonly ArrayLike<number>[], dims: number): Float64Array {
  const k = centres.length;
  const ct = new Float64Array(dims * k);
  centres.forEach((c, j) => {
    for (let t = 0; t < Math.min(dims, c.length); t++) ct[t * k + j] = c[t]!;
  });
  return ct;
}

/** Nearest centre of every point and the summed squared distance (the E-step alone). */
export function assign(rows: KMeansInput, centroids: readonly ArrayLike<number>[]): { labels: Int32Array; inertia: number } {
  const p = toPoints(rows);
  const dims = Math.max(p.dims, ...centroids.map((c) => c.length));
  const k = centroids.length;
  const ct = transpose(centroids, dims);
  const labels = new Int32Array(p.idx.length).fill(-1);
  const { inertia } = eStep({ ...p, dims }, ct, centreNorms(ct, k), k, labels, new Float64Array(p.idx.length));
  return { labels, inertia };
}

/**
 * Lloyd's algorithm from given centres, without restarts: the steps the tests compare with
 * ml-kmeans started from the same centres.
 */
export function lloyd(rows: KMeansInput, centres: readonly ArrayLike<number>[], opts: Pick<KMeansOptions, 'maxIterations' | 'tolerance'> = {}): Omit<KMeansFit, 'restart' | 'inertias'> {
  const p = toPoints(rows);
  const dims = Math.max(p.dims, ...centres.map((c) => c.length));
  const q = { ...p, dims };
  const r = lloydSteps(q, transpose(centres, dims), centres.length, opts.maxIterations ?? 300, (opts.tolerance ?? 1e-4) * meanVariance(q));
  return { labels: r.labels, centroids: untranspose(r.ct, centres.length, dims), inertia: r.inertia, iterations: r.iterations, converged: r.converged };
}

/**
 * Distinct points, counted exactly by their non-zero entries. k-means++ cannot place more centres
 * than there are distinct points: its sampling weights would all be zero.
 */
export function distinctRows(rows: KMeansInput): number {
  const p = toPoints(rows);
  // The key is the entries' bytes: two stored non-zero doubles are equal exactly when their bits
  // are (no zeros are stored, so +0 and -0 never meet), and bytes are far quicker than decimals.
  const keys = new Set<string>();
  for (let i = 0; i < p.idx.length; i++) {
    const ix = Int32Array.from(p.idx[i]!);
    const vx = Float64Array.from(p.val[i]!);
    keys.add(`${Buffer.from(ix.buffer).toString('latin1')}|${Buffer.from(vx.buffer).toString('latin1')}`);
  }
  return keys.size;
}

export function kmeansRestarts(rows: KMeansInput, k: number, opts: KMeansOptions = {}): KMeansFit {
  const restarts = opts.restarts ?? 5;
  const maxIterations = opts.maxIterations ?? 300;
  if (!Number.isInteger(k) || k < 1) throw new RangeError(`k must be a positive integer; got ${k}`);
  if (k > rows.length) throw new RangeError(`k = ${k} is more than the ${rows.length} points`);
  if (restarts < 1) throw new RangeError(`restarts must be at least 1; got ${restarts}`);
  const p = toPoints(rows);
  const tol = (opts.tolerance ?? 1e-4) * meanVariance(p);
  const rand = seededRandom(opts.seed ?? 0);
  const seeds = Array.from({ length: restarts }, () => Math.floor(rand() * 2 ** 31));
  let best: (ReturnType<typeof lloydSteps> & { restart: number }) | null = null;
  const inertias: number[] = [];
  const post = postingsOf(p);
  seeds.forEach((seed, restart) => {
    const start = kmeansPlusPlus(p, post, k, seededRandom(seed));
    const ct = new Float64Array(p.dims * k);
    start.forEach((q, j) => {
      const iq = p.idx[q]!;
      for (let t = 0; t < iq.length; t++) ct[iq[t]! * k + j] = p.val[q]![t]!;
    });
    const run = lloydSteps(p, ct, k, maxIterations, tol);
    inertias.push(run.inertia);
    // Strictly lower only, so a tie keeps the earlier restart.
    if (!best || run.inertia < best.inertia - 1e-12 * Math.max(1, Math.abs(best.inertia))) best = { ...run, restart };
  });
  const b = best!;
  return { labels: b.labels, centroids: untranspose(b.ct, k, p.dims), inertia: b.inertia, iterations: b.iterations, converged: b.converged, restart: b.restart, inertias };
}
