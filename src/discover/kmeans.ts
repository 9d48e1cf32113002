/**
 * k-means with k-means++ initialisation and seeded restarts, the lowest inertia kept (as
 * scikit-learn's KMeans with n_init). The Lloyd steps and the greedy k-means++ start are
 * ml-kmeans'; around them:
 *  - every restart has its own seed, drawn from `seed`, so a run repeats exactly;
 *  - a restart stops when no point changes cluster (a fixed point: the next step would repeat
 *    it), besides ml-kmeans' own test on how far the centres moved;
 *  - the final labels are each point's nearest final centre and the inertia is their summed
 *    squared distance, as scikit-learn reports them.
 * Measured (docs/discovery.md): ml-kmeans' dense Lloyd steps are most of discovery's time, about
 * ten times a Lloyd step on the sparse TF-IDF vectors; replacing them is proposed, not done.
 */
import { kmeansGenerator } from 'ml-kmeans';
import { seededRandom } from '../measure/random.js';

export type DenseInput = readonly (readonly number[] | Float64Array)[];

export interface KMeansOptions {
  /** Restarts from different k-means++ starts (default 5). */
  restarts?: number;
  seed?: number;
  /** Lloyd steps per restart at most (default 300, scikit-learn's). */
  maxIterations?: number;
  /** Squared distance every centre must move less than for convergence (default 1e-6). */
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

function squared(a: ArrayLike<number>, b: ArrayLike<number>): number {
  let s = 0;
  for (let j = 0; j < a.length; j++) {
    const d = a[j]! - b[j]!;
    s += d * d;
  }
  return s;
}

/** Nearest centre of every point and the summed squared distance (the E-step). */
export function assign(rows: DenseInput, centroids: readonly ArrayLike<number>[]): { labels: Int32Array; inertia: number } {
  const labels = new Int32Array(rows.length);
  let inertia = 0;
  rows.forEach((r, i) => {
    let best = Infinity;
    let arg = 0;
    centroids.forEach((c, j) => {
      const d = squared(r, c);
      if (d < best) (best = d), (arg = j);
    });
    labels[i] = arg;
    inertia += best;
  });
  return { labels, inertia };
}

/**
 * Distinct points, counted by two seeded random weightings of each row (rows that collide are
 * counted once, so this never over-counts). k-means++ cannot place more centres than there are
 * distinct points: its sampling weights would all be zero.
 */
export function distinctRows(rows: DenseInput, seed = 0): number {
  if (!rows.length) return 0;
  const rand = seededRandom(seed);
  const d = rows[0]!.length;
  const w1 = Float64Array.from({ length: d }, () => rand() - 0.5);
  const w2 = Float64Array.from({ length: d }, () => rand() - 0.5);
  const keys = new Set<string>();
  for (const r of rows) {
    let a = 0;
    let b = 0;
    for (let j = 0; j < d; j++) (a += w1[j]! * r[j]!), (b += w2[j]! * r[j]!);
    keys.add(`${a.toPrecision(12)} ${b.toPrecision(12)}`);
  }
  return keys.size;
}

/** One k-means++ start and its Lloyd steps, with ml-kmeans. */
function oneRun(rows: DenseInput, k: number, seed: number, maxIterations: number, tolerance: number) {
  // ml-kmeans reads rows by index only, so Float64Array rows serve as number[] ones.
  const data = rows as unknown as number[][];
  let previous: Int32Array | null = null;
  let centroids: number[][] = [];
  let iterations = 0;
  let converged = false;
  for (const step of kmeansGenerator(data, k, { seed, initialization: 'kmeans++', maxIterations, tolerance })) {
    iterations = step.iterations;
    centroids = step.centroids;
    const labels = Int32Array.from(step.clusters);
    const same = previous !== null && labels.every((l, i) => l === previous![i]);
    previous = labels;
    if (step.converged || same) {
      converged = true;
      break;
    }
  }
  const fit = assign(rows, centroids);
  return { ...fit, centroids: centroids.map((c) => Float64Array.from(c)), iterations, converged };
}

export function kmeansRestarts(rows: DenseInput, k: number, opts: KMeansOptions = {}): KMeansFit {
  const restarts = opts.restarts ?? 5;
  const maxIterations = opts.maxIterations ?? 300;
  const tolerance = opts.tolerance ?? 1e-6;
  if (!Number.isInteger(k) || k < 1) throw new RangeError(`k must be a positive integer; got ${k}`);
  if (k > rows.length) throw new RangeError(`k = ${k} is more than the ${rows.length} points`);
  if (restarts < 1) throw new RangeError(`restarts must be at least 1; got ${restarts}`);
  const rand = seededRandom(opts.seed ?? 0);
  const seeds = Array.from({ length: restarts }, () => Math.floor(rand() * 2 ** 31));
  let best: (ReturnType<typeof oneRun> & { restart: number }) | null = null;
  const inertias: number[] = [];
  seeds.forEach((seed, restart) => {
    const run = oneRun(rows, k, seed, maxIterations, tolerance);
    inertias.push(run.inertia);
    // Strictly lower only, so a tie keeps the earlier restart.
    if (!best || run.inertia < best.inertia - 1e-12 * Math.max(1, Math.abs(best.inertia))) best = { ...run, restart };
  });
  const b = best!;
  return { labels: b.labels, centroids: b.centroids, inertia: b.inertia, iterations: b.iterations, converged: b.converged, restart: b.restart, inertias };
}
