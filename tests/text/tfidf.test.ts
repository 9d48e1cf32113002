import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { idfWeight, TfidfVectorizer } from '../../src/text/tfidf.js';
import { contentLemmas, withBigrams } from '../../src/text/terms.js';
import { analyse } from '../../src/text/nlp.js';
import { cosine, dot, norm, toRecord } from '../../src/math/sparse.js';

const fixture = JSON.parse(readFileSync(new URL('../reference/tfidf.json', import.meta.url), 'utf8')) as {
  train: string[][];
  test: string[][];
  vocabulary: string[];
  idf: number[];
  train_rows: Record<string, number>[];
  test_rows: Record<string, number>[];
};

/** A document holding `term` tf times for each entry. */
function doc(tf: Record<string, number>): string[] {
  return Object.entries(tf).flatMap(([t, n]) => Array<string>(n).fill(t));
}

describe('TF-IDF against Manning, Raghavan & Schutze, Introduction to Information Retrieval (2008), ch. 6', () => {
  // Section 6.3.1, Figs 6.12-6.13: term frequencies in three novels (SaS, PaP, WH), weighted by
  // 1 + log10 tf and cosine-normalised, no idf. Values recalled from memory (they agree with the
  // arithmetic) : SaS 0.789 0.515 0.335 0; PaP 0.832 0.555 0 0; WH 0.524 0.465 0.405 0.588;
  // cos(SaS,PaP) ~ 0.94, cos(SaS,WH) ~ 0.79, cos(PaP,WH) ~ 0.69.
  const novels = [
    doc({ affection: 115, jealous: 10, gossip: 2 }),
    doc({ affection: 58, jealous: 7 }),
    doc({ affection: 20, jealous: 11, gossip: 6, wuthering: 38 }),
  ];
  const v = new TfidfVectorizer({ idf: 'none', logBase: 10 });
  const [sas, pap, wh] = v.fitTransform(novels);
  const w = (x: typeof sas, t: string) => toRecord(x!, v.vocabulary)[t] ?? 0;

  it('gives the log-frequency weights of Fig. 6.13', () => {
    expect(w(sas, 'affection')).toBeCloseTo(0.789, 3);
    expect(w(sas, 'jealous')).toBeCloseTo(0.515, 3);
    expect(w(sas, 'gossip')).toBeCloseTo(0.335, 3);
    expect(w(sas, 'wuthering')).toBe(0);
    expect(w(pap, 'affection')).toBeCloseTo(0.832, 3);
    expect(w(pap, 'jealous')).toBeCloseTo(0.555, 3);
    expect(w(wh, 'affection')).toBeCloseTo(0.524, 3);
    expect(w(wh, 'jealous')).toBeCloseTo(0.465, 3);
    expect(w(wh, 'gossip')).toBeCloseTo(0.405, 3);
    expect(w(wh, 'wuthering')).toBeCloseTo(0.588, 3);
  });

  it('gives the cosine similarities of section 6.3.1', () => {
    expect(dot(sas!, pap!)).toBeCloseTo(0.94, 2);
    expect(dot(sas!, wh!)).toBeCloseTo(0.79, 2);
    expect(dot(pap!, wh!)).toBeCloseTo(0.69, 2);
  });

  it('gives the idf values of Fig. 6.8 (Reuters-RCV1, N = 806,791)', () => {
    // Recalled from memory: car df 18,165 idf 1.65; auto 6,723 2.08; insurance 19,241 1.62;
    // best 25,235 1.5. idf = log10(N / df).
    const n = 806_791;
    expect(idfWeight(n, 18_165, 'plain', 10)).toBeCloseTo(1.65, 2);
    expect(idfWeight(n, 6_723, 'plain', 10)).toBeCloseTo(2.08, 2);
    expect(idfWeight(n, 19_241, 'plain', 10)).toBeCloseTo(1.62, 2);
    expect(idfWeight(n, 25_235, 'plain', 10)).toBeCloseTo(1.5, 1);
  });
});

describe('TF-IDF against scikit-learn TfidfVectorizer(sublinear_tf=True) (tests/reference/tfidf.json)', () => {
  const v = new TfidfVectorizer().fit(fixture.train);

  it('learns the same vocabulary and idf', () => {
    // Fixture made by tests/reference/make_fixtures.py with scikit-learn 1.2.1.
    expect(v.vocabulary).toEqual(fixture.vocabulary);
    fixture.idf.forEach((idf, i) => expect(v.state.idf[i]).toBeCloseTo(idf, 12));
  });

  it('gives the same vectors for fitted and new documents (unseen terms ignored)', () => {
    const check = (docs: string[][], rows: Record<string, number>[]) =>
      v.transform(docs).forEach((x, i) => {
        const got = toRecord(x, v.vocabulary);
        expect(Object.keys(got).sort()).toEqual(Object.keys(rows[i]!).sort());
        for (const [t, val] of Object.entries(rows[i]!)) expect(got[t]).toBeCloseTo(val, 12);
      });
    check(fixture.train, fixture.train_rows);
    check(fixture.test, fixture.test_rows);
  });

  it('round-trips its state as plain data', () => {
    const again = TfidfVectorizer.fromState(JSON.parse(JSON.stringify(v.state)));
    expect(again.transform(fixture.test)).toEqual(v.transform(fixture.test));
  });

  it('drops terms below minDf', () => {
    const m = new TfidfVectorizer({ minDf: 2 }).fit(fixture.train);
    expect(m.vocabulary).toEqual(['manager', 'night shift', 'overtime', 'pay', 'rota', 'shift', 'support']);
  });

  it('fits and vectorises in one pass exactly as fit() then vectorAndCounts()', () => {
    for (const opts of [{}, { minDf: 2 }]) {
      const one = new TfidfVectorizer(opts);
      const both = one.fitVectorise(fixture.train);
      const two = new TfidfVectorizer(opts).fit(fixture.train);
      expect(one.state).toEqual(two.state);
      fixture.train.forEach((d, i) => {
        const ref = two.vectorAndCounts(d);
        expect(toRecord(both.vectors[i]!)).toEqual(toRecord(ref.vector));
        expect(toRecord(both.counts[i]!)).toEqual(toRecord(ref.counts));
      });
    }
    // and the scikit-learn rows of the fixture
    const v = new TfidfVectorizer();
    v.fitVectorise(fixture.train).vectors.forEach((row, i) => {
      const want = fixture.train_rows[i]!;
      const got = toRecord(row, v.vocabulary);
      expect(Object.keys(got).sort()).toEqual(Object.keys(want).sort());
      for (const [t, w] of Object.entries(want)) expect(got[t]).toBeCloseTo(w, 12);
    });
  });
});

describe('passage terms', () => {
  it('keeps the non-stop lemmas of an analysis, and adds bigrams on request', () => {
    const terms = contentLemmas(analyse('The nurses were covering the night shifts again.'));
    expect(terms).toContain('nurse');
    expect(terms).toContain('shift');
    expect(terms).not.toContain('the');
    expect(withBigrams(['night', 'shift', 'cover'], true)).toEqual(['night', 'shift', 'cover', 'night shift', 'shift cover']);
    expect(withBigrams(['night', 'shift'], false)).toEqual(['night', 'shift']);
  });
});
