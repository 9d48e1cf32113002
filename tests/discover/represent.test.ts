import { describe, expect, it } from 'vitest';
import { denseRows, projectionOf } from '../../src/discover/represent.js';
import { seededRandom } from '../../src/math/random.js';
import { TfidfVectorizer } from '../../src/text/tfidf.js';
import { cosine } from '../../src/math/sparse.js';

// Invented passages.
const DOCS = [
  ['rota', 'shift', 'night', 'rota'],
  ['shift', 'cover', 'agency'],
  ['canteen', 'food', 'shift'],
  ['parking', 'permit'],
];

describe('dense rows for ml-kmeans', () => {
  const vec = new TfidfVectorizer().fit(DOCS);
  const X = vec.transform(DOCS);
  const df = vec.state.df;
  const len = (r: Float64Array) => Math.sqrt(r.reduce((s, v) => s + v * v, 0));

  it('with the whole vocabulary, are the TF-IDF vectors themselves', () => {
    const { rows, dims } = denseRows(X, vec.vocabulary, df, { method: 'vocabulary', dims: 100, nonZeros: 4, seed: 0 });
    expect(dims).toBe(vec.size);
    // Columns are in document-frequency order, so compare what k-means sees: lengths and cosines.
    rows.forEach((r, i) => {
      const mine = Array.from(r).filter((v) => v !== 0).sort();
      const theirs = Array.from(X[i]!.values).sort();
      expect(mine).toHaveLength(theirs.length);
      mine.forEach((v, k) => expect(v).toBeCloseTo(theirs[k]!, 12));
      rows.forEach((q, j) => expect(r.reduce((s, v, t) => s + v * q[t]!, 0)).toBeCloseTo(cosine(X[i]!, X[j]!), 12));
    });
  });

  it('keep the terms in most passages (ties by term order), re-scaled to unit length', () => {
    // df: shift 3, every other term 1.
    const { rows, dims } = denseRows(X, vec.vocabulary, df, { method: 'vocabulary', dims: 2, nonZeros: 4, seed: 0 });
    expect(dims).toBe(2);
    // Column 0 is "shift" (df 3), column 1 "agency" (df 1, first in code-unit order).
    const x1 = X[1]!;
    const at = (term: string) => x1.values[Array.from(x1.indices).indexOf(vec.termIndex(term))]!;
    const n = Math.hypot(at('shift'), at('agency'));
    expect(Array.from(rows[1]!)).toEqual([at('shift') / n, at('agency') / n]);
    expect(Array.from(rows[0]!)).toEqual([1, 0]);
    expect(Array.from(rows[3]!)).toEqual([0, 0]); // none of the kept terms: a zero row
  });

  it('project each term onto the same columns whatever the vocabulary', () => {
    const a = projectionOf('rota', 64, 4, 7);
    const b = projectionOf('rota', 64, 4, 7);
    expect(Array.from(a.columns)).toEqual(Array.from(b.columns));
    expect(new Set(a.columns).size).toBe(4);
    expect(Array.from(a.signs).every((s) => Math.abs(Math.abs(s) - 0.5) < 1e-12)).toBe(true);
    expect(Array.from(projectionOf('rota', 64, 4, 8).columns)).not.toEqual(Array.from(a.columns));
    const { rows } = denseRows(X, vec.vocabulary, df, { method: 'projection', dims: 64, nonZeros: 4, seed: 7 });
    for (const r of rows) expect(len(r)).toBeCloseTo(1, 12);
  });

  it('keep cosines roughly (sparse Johnson-Lindenstrauss): seeded random passages, 1024 columns', () => {
    const rand = seededRandom(3);
    const words = Array.from({ length: 400 }, (_, i) => `w${i}`);
    const docs = Array.from({ length: 40 }, (_, d) => Array.from({ length: 30 }, () => words[Math.floor(rand() * (d % 2 ? 100 : 400))]!));
    const v = new TfidfVectorizer().fit(docs);
    const xs = v.transform(docs);
    const { rows } = denseRows(xs, v.vocabulary, v.state.df, { method: 'projection', dims: 1024, nonZeros: 8, seed: 1 });
    let err = 0;
    let pairs = 0;
    for (let i = 0; i < docs.length; i++) {
      for (let j = i + 1; j < docs.length; j++) {
        let d = 0;
        for (let t = 0; t < 1024; t++) d += rows[i]![t]! * rows[j]![t]!;
        err += Math.abs(d - cosine(xs[i]!, xs[j]!));
        pairs++;
      }
    }
    expect(err / pairs).toBeLessThan(0.05);
  });
});
