/**
 * discover(): clusters the unclaimed pool into possible new themes.
 *
 *  1. TF-IDF vectors of the pool (fitted on the pool, sublinear tf, unit length);
 *  2. k-means on those sparse vectors, with k-means++ starts and seeded restarts, the lowest
 *     inertia kept (kmeans.ts); the dense bounded rows of represent.ts remain as options, for
 *     the measurements of docs/discovery.md;
 *  4. k by the mean cosine silhouette of the TF-IDF vectors over a range of k, with fewer restarts
 *     per k (a large pool sweeps k on a seeded sample); then every passage with the chosen k;
 *  5. per cluster: log-odds terms against the rest of the study, central passages, spread over
 *     transcripts and speakers, cohesion; clusters made mostly of dismissed passages held back.
 *
 * Deterministic: the pool is put in natural id order first, and every random choice is seeded,
 * so the same pool gives the same clusters whatever order it came in.
 */
import { sampleIndices } from '../math/random.js';
import { silhouetteScore } from '../measure/silhouette.js';
import { logOdds } from '../math/logodds.js';
import { TfidfVectorizer } from '../text/tfidf.js';
import { dot, fromDense, norm, type SparseVector } from '../math/sparse.js';
import { dismissedIndex, judgeCluster } from './dismissals.js';
import { distinctRows, kmeansRestarts, type KMeansFit } from './kmeans.js';
import { naturalCompare } from './order.js';
import { denseRows } from './represent.js';
import type { Cluster, DiscoverItem, DiscoverOptions, DiscoverResult, SuppressedCluster, TermScore } from './types.js';

type Resolved = Required<Omit<DiscoverOptions, 'k' | 'kRange' | 'dismissals'>> & Pick<DiscoverOptions, 'k' | 'kRange'> & { dismissals: NonNullable<DiscoverOptions['dismissals']> };

export function resolveDiscoverOptions(o: DiscoverOptions = {}): Resolved {
  return {
    k: o.k,
    kRange: o.kRange,
    restarts: o.restarts ?? 5,
    seed: o.seed ?? 0,
    maxIterations: o.maxIterations ?? 300,
    representation: o.representation ?? 'sparse',
    dims: o.dims ?? 256,
    maxCells: o.maxCells ?? 8_000_000,
    projectionNonZeros: o.projectionNonZeros ?? 4,
    sweepSample: o.sweepSample ?? 2000,
    sweepRestarts: o.sweepRestarts ?? 2,
    silhouetteSample: o.silhouetteSample ?? 20000,
    terms: o.terms ?? 10,
    central: o.central ?? 3,
    priorStrength: o.priorStrength ?? 500,
    dismissals: o.dismissals ?? [],
    minNewShare: o.minNewShare ?? 0.3,
    minNew: o.minNew ?? 3,
  };
}

/** Mean cosine silhouette, or null when the labels have fewer than 2 or more than n - 1 groups. */
function silhouetteOf(vectors: readonly SparseVector[], labels: ArrayLike<number>, sample: number, seed: number): number | null {
  const labs = Array.from(labels);
  const k = new Set(labs).size;
  if (k < 2 || k > vectors.length - 1) return null;
  return silhouetteScore(vectors, labs, 'cosine', vectors.length > sample ? { sampleSize: sample, seed } : {});
}

/**
 * @param pool the unclaimed passages (PoolEntry or the same fields)
 * @param background the content lemmas of every passage of the study, pool passages included:
 *   the "rest of the study" a cluster's terms are compared with
 */
/** @param progress told the share of the k sweep done (0 to 1); it does not change the result */
export function discover(pool: readonly DiscoverItem[], background: readonly (readonly string[])[], opts: DiscoverOptions = {}, progress: (done: number) => void = () => {}): DiscoverResult {
  const o = resolveDiscoverOptions(opts);
  const items = pool.slice().sort((a, b) => naturalCompare(a.id, b.id));
  for (let i = 1; i < items.length; i++) if (items[i]!.id === items[i - 1]!.id) throw new RangeError(`passage ${items[i]!.id} is in the pool twice`);
  if (o.k !== undefined && (!Number.isInteger(o.k) || o.k < 1)) throw new RangeError(`k must be a positive integer; got ${o.k}`);

  const vec = new TfidfVectorizer();
  const all = vec.fitTransform(items.map((p) => p.terms));
  // A passage with no term has no direction; it stays unclaimed without a cluster.
  const live = all.map((v, i) => (v.indices.length ? i : -1)).filter((i) => i >= 0);
  const empty = items.filter((_, i) => all[i]!.indices.length === 0).map((p) => p.id);
  const members = live.map((i) => items[i]!);
  const vectors = live.map((i) => all[i]!);
  const n = members.length;
  const { rows, dims } = clusteringRows(vectors, vec, o);
  const base: Omit<DiscoverResult, 'k' | 'chosenBy' | 'clusters' | 'suppressed' | 'unclustered' | 'dropped'> = {
    silhouette: [],
    sweep: { passages: 0, sampled: false },
    finalSilhouette: null,
    inertia: 0,
    representation: { method: o.representation, dims, vocabulary: vec.size },
  };
  if (n === 0) return { ...base, k: 0, chosenBy: 'none', clusters: [], suppressed: [], unclustered: empty, dropped: [] };

  const distinct = distinctRows(rows);
  const km = (r: readonly SparseVector[], k: number, restarts = o.restarts) => kmeansRestarts(r, k, { restarts, seed: o.seed * 1000 + k, maxIterations: o.maxIterations });

  let k: number;
  let chosenBy: DiscoverResult['chosenBy'];
  let fit: KMeansFit | null = null;
  if (o.k !== undefined) {
    k = Math.min(o.k, distinct);
    chosenBy = 'option';
  } else {
    const [lo, hiWanted] = o.kRange ?? [2, Math.min(12, Math.floor(n / 5))];
    const sampled = n > o.sweepSample;
    const idx = sampled ? sampleIndices(n, o.sweepSample, o.seed).sort((a, b) => a - b) : live.map((_, i) => i);
    const sRows = sampled ? idx.map((i) => rows[i]!) : rows;
    const sVecs = sampled ? idx.map((i) => vectors[i]!) : vectors;
    const hi = Math.min(hiWanted, sampled ? distinctRows(sRows) : distinct, idx.length - 1);
    base.sweep = { passages: idx.length, sampled };
    if (Math.max(lo, 2) > hi) {
      k = 1;
      chosenBy = 'small-pool';
    } else {
      let best: { k: number; score: number; fit: KMeansFit } | null = null;
      for (let kk = Math.max(lo, 2); kk <= hi; kk++) {
        const f = km(sRows, kk, Math.min(o.sweepRestarts, o.restarts));
        const score = silhouetteOf(sVecs, f.labels, o.silhouetteSample, o.seed) ?? -1;
        base.silhouette.push({ k: kk, score });
        // Ties keep the smaller k.
        if (!best || score > best.score + 1e-12) best = { k: kk, score, fit: f };
        // The final fit at the chosen k costs about one more step of the sweep.
        progress((kk - Math.max(lo, 2) + 1) / (hi - Math.max(lo, 2) + 2));
      }
      k = best!.k;
      chosenBy = 'silhouette';
      // The sweep's restarts are the first of the final fit's (same seeds), so refit only for more.
      if (!sampled && o.sweepRestarts >= o.restarts) fit = best!.fit;
    }
  }
  fit ??= km(rows, k);
  base.inertia = fit.inertia;
  base.finalSilhouette = silhouetteOf(vectors, fit.labels, o.silhouetteSample, o.seed);

  // Groups in order of their first member (the pool is in natural id order).
  const groups = new Map<number, number[]>();
  fit.labels.forEach((l, i) => (groups.get(l) ?? groups.set(l, []).get(l)!).push(i));
  const dismissed = dismissedIndex(o.dismissals);
  const studyCounts = termCounts(background);
  for (const [t, c] of termCounts(members.map((m) => m.terms))) if ((studyCounts.get(t) ?? 0) < c) studyCounts.set(t, c);
  let studyTotal = 0;
  for (const c of studyCounts.values()) studyTotal += c;

  const shown: { group: number[]; verdict: ReturnType<typeof judgeCluster> }[] = [];
  const suppressed: SuppressedCluster[] = [];
  const unclustered = [...empty];
  const dropped: string[] = [];
  for (const group of groups.values()) {
    const ids = group.map((i) => members[i]!.id);
    const verdict = judgeCluster(ids, dismissed, { minNewShare: o.minNewShare, minNew: o.minNew });
    if (verdict.show) shown.push({ group, verdict });
    else {
      suppressed.push({ size: ids.length, passageIds: ids, newPassageIds: verdict.newIds, dismissalIds: verdict.dismissalIds });
      unclustered.push(...verdict.newIds);
      dropped.push(...verdict.dismissedBefore);
    }
  }
  // Largest first; equal sizes keep the order of their first passage (stable sort).
  shown.sort((a, b) => b.group.length - a.group.length);
  const clusters: Cluster[] = shown.map(({ group, verdict }, c) => ({
    id: `C${c + 1}`,
    size: group.length,
    terms: distinctiveTerms(group.map((i) => members[i]!.terms), studyCounts, studyTotal, o.priorStrength, o.terms),
    ...centrality(group, vectors, members, o.central),
    transcripts: spread(group.map((i) => members[i]!.transcript)),
    speakers: spread(group.map((i) => members[i]!.speaker ?? '(no speaker)')).names,
    passageIds: group.map((i) => members[i]!.id),
    dismissedBefore: verdict.dismissedBefore,
  }));
  unclustered.sort(naturalCompare);
  dropped.sort(naturalCompare);
  return { ...base, k, chosenBy, clusters, suppressed, unclustered, dropped };
}

/**
 * What k-means runs on: the sparse TF-IDF vectors, or on request (the lab's measurements) the
 * dense bounded rows of represent.ts, whose cell bound keeps memory flat.
 */
function clusteringRows(vectors: SparseVector[], vec: TfidfVectorizer, o: Resolved): { rows: readonly SparseVector[]; dims: number } {
  if (o.representation === 'sparse') return { rows: vectors, dims: vec.size };
  const width = Math.max(1, Math.min(o.dims, Math.floor(o.maxCells / Math.max(1, vectors.length))));
  const dense = denseRows(vectors, vec.vocabulary, vec.state.df, { method: o.representation, dims: width, nonZeros: o.projectionNonZeros, seed: o.seed });
  return { rows: dense.rows.map((r) => fromDense(r)), dims: dense.dims };
}

function termCounts(lists: readonly (readonly string[])[]): Map<string, number> {
  const out = new Map<string, number>();
  for (const l of lists) for (const t of l) out.set(t, (out.get(t) ?? 0) + 1);
  return out;
}

/**
 * Terms used more in the cluster than in the rest of the study: weighted log-odds with an
 * informative Dirichlet prior (the study's term shares times a0), positive delta, by z.
 */
function distinctiveTerms(lists: readonly (readonly string[])[], study: ReadonlyMap<string, number>, total: number, priorStrength: number, top: number): TermScore[] {
  const mine = termCounts(lists);
  let nt = 0;
  for (const c of mine.values()) nt += c;
  const nr = Math.max(0, total - nt);
  // As the suggester's profiles: a0 at most a tenth of the text, so a small study is not drowned.
  const a0 = Math.min(priorStrength, 0.1 * total);
  const out: TermScore[] = [];
  for (const [term, yt] of mine) {
    const all = study.get(term)!;
    const aw = (a0 * all) / total;
    const lo = logOdds(yt, nt, Math.max(0, all - yt), nr, aw, a0);
    if (lo.delta > 0) out.push({ term, weight: round(lo.delta), z: round(lo.z) });
  }
  return out.sort((a, b) => b.z - a.z || (a.term < b.term ? -1 : a.term > b.term ? 1 : 0)).slice(0, top);
}

/** Cohesion (mean cosine to the TF-IDF centroid) and the passages nearest the centroid. */
function centrality(group: readonly number[], vectors: readonly SparseVector[], members: readonly DiscoverItem[], top: number): Pick<Cluster, 'cohesion' | 'central'> {
  const acc = new Map<number, number>();
  for (const i of group) {
    const v = vectors[i]!;
    for (let t = 0; t < v.indices.length; t++) acc.set(v.indices[t]!, (acc.get(v.indices[t]!) ?? 0) + v.values[t]! / group.length);
  }
  const keys = [...acc.keys()].sort((a, b) => a - b);
  const centroid: SparseVector = { indices: Int32Array.from(keys), values: Float64Array.from(keys, (t) => acc.get(t)!) };
  const cn = norm(centroid);
  const sims = group.map((i) => ({ i, s: cn > 0 ? dot(vectors[i]!, centroid) / cn : 0 }));
  const cohesion = sims.reduce((s, x) => s + x.s, 0) / Math.max(1, sims.length);
  // Ties keep natural id order (the group is in that order and the sort is stable).
  const central = sims
    .slice()
    .sort((a, b) => b.s - a.s)
    .slice(0, top)
    .map((x) => ({ passageId: members[x.i]!.id, similarity: round(x.s) }));
  return { cohesion: round(cohesion), central };
}

/** Names with their counts, most first, ties in natural order. */
function spread(names: readonly string[]): { count: number; names: { name: string; passages: number }[] } {
  const m = new Map<string, number>();
  for (const n of names) m.set(n, (m.get(n) ?? 0) + 1);
  const list = [...m].map(([name, passages]) => ({ name, passages })).sort((a, b) => b.passages - a.passages || naturalCompare(a.name, b.name));
  return { count: list.length, names: list };
}

function round(v: number): number {
  return Math.round(v * 1e4) / 1e4;
}
