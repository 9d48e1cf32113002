import { describe, expect, it } from 'vitest';
import { fleissFromRows, fleissKappa } from '../../src/measure/fleiss.js';
import { krippendorffAlpha } from '../../src/measure/alpha.js';
import { agreementReport } from '../../src/measure/agreement.js';

// The worked example on Wikipedia's "Fleiss' kappa" page (10 subjects, 14 raters, 5
// categories). Table and printed results recalled from memory: P-bar = 0.378, P-bar-e = 0.213,
// kappa = 0.210 (all to three decimals). The table is consistent with the page's printed
// category totals (20, 28, 39, 21, 32 of 140 ratings), which the test checks too.
const WIKIPEDIA = [
  [0, 0, 0, 0, 14],
  [0, 2, 6, 4, 2],
  [0, 0, 3, 5, 6],
  [0, 3, 9, 2, 0],
  [2, 2, 8, 1, 1],
  [7, 7, 0, 0, 0],
  [3, 2, 6, 3, 0],
  [2, 5, 3, 2, 2],
  [6, 5, 2, 1, 0],
  [0, 2, 2, 3, 7],
];

describe("Fleiss' kappa", () => {
  it('reproduces the published worked example', () => {
    const totals = [0, 1, 2, 3, 4].map((j) => WIKIPEDIA.reduce((s, r) => s + r[j]!, 0));
    expect(totals).toEqual([20, 28, 39, 21, 32]);
    const k = fleissKappa(WIKIPEDIA);
    expect(k.units).toBe(10);
    expect(k.raters).toBe(14);
    expect(k.observed!).toBeCloseTo(0.378, 3);
    expect(k.expected!).toBeCloseTo(0.213, 3);
    expect(k.value!).toBeCloseTo(0.21, 3);
  });

  it('agrees with Krippendorff on complete data through the identity between them', () => {
    // For complete nominal data with N units and n coders, D_o = 1 - P-bar and
    // D_e = (1 - P-bar-e) n.. / (n.. - 1) with n.. = N n (Krippendorff 2011, coincidence matrix),
    // so alpha = 1 - (1 - P)(n.. - 1) / (n.. (1 - Pe)): an independent route to the same pieces.
    const rows: number[][] = Array.from({ length: 14 }, () => []);
    WIKIPEDIA.forEach((counts) => {
      const labels = counts.flatMap((c, j) => Array<number>(c).fill(j));
      labels.forEach((l, r) => rows[r]!.push(l));
    });
    const f = fleissFromRows(rows);
    const a = krippendorffAlpha(rows, 'nominal');
    const nn = 140;
    expect(a.value!).toBeCloseTo(1 - ((1 - f.observed!) * (nn - 1)) / (nn * (1 - f.expected!)), 12);
    expect(f.value!).toBeCloseTo(fleissKappa(WIKIPEDIA).value!, 12);
  });

  it('is undefined, with a reason, when it cannot be computed', () => {
    expect(fleissKappa([]).value).toBeNull();
    expect(fleissKappa([[3, 0], [3, 0]]).reason).toMatch(/same category/);
    expect(() => fleissKappa([[3, 0], [2, 0]])).toThrow(/same number of coders/);
    // A unit a coder did not review is left out: Fleiss needs the same coders on every unit.
    expect(fleissFromRows([[1, 0, null], [1, 0, 1], [1, 1, 1]]).units).toBe(2);
  });
});

describe('agreement with three coders', () => {
  it("reports Fleiss' kappa, Krippendorff's alpha and every pair, never Cohen's kappa for three", () => {
    // Four passages, one theme, coders a, b, c: (1,1,1) (0,0,0) (1,1,0) (0,0,1).
    // Worked by hand: P_i = 1, 1, 1/3, 1/3, so P = 2/3; p(present) = 6/12, Pe = 1/2;
    // kappa = (2/3 - 1/2) / (1/2) = 1/3. Alpha: n.. = 12, D_o = 4/12, D_e = 2 x 6 x 6 / (12 x 11);
    // alpha = 1 - (1/3) / (6/11) = 7/18.
    const passages = ['p1', 'p2', 'p3', 'p4'];
    const coders = ['a', 'b', 'c'];
    const present: Record<string, string[]> = { a: ['p1', 'p3'], b: ['p1', 'p3'], c: ['p1', 'p4'] };
    const r = agreementReport({
      passages,
      coders,
      themes: ['T1'],
      codings: coders.flatMap((c) => present[c]!.map((p) => ({ coder: c, passageId: p, themeId: 'T1' }))),
      coded: coders.flatMap((c) => passages.map((p) => ({ coder: c, passageId: p }))),
    });
    const t = r.themes[0]!;
    expect(t.fleiss.value!).toBeCloseTo(1 / 3, 12);
    expect(t.fleiss.units).toBe(4);
    expect(t.fleiss.band).toBe('fair');
    expect(t.alpha.value!).toBeCloseTo(7 / 18, 12);
    expect(t.kappa.value).toBeNull();
    expect(r.meanOfThemes.fleiss!).toBeCloseTo(1 / 3, 12);
    // Pairs by hand. a-b agree everywhere: kappa 1. a-c: a = (1,0,1,0), c = (1,0,0,1):
    // p_o = 1/2, p_e = 1/2, kappa 0. b-c the same as a-c.
    expect(r.pairwise.map((p) => p.coders.join('-'))).toEqual(['a-b', 'a-c', 'b-c']);
    expect(r.pairwise.map((p) => p.passages)).toEqual([4, 4, 4]);
    expect(r.pairwise[0]!.kappa.value!).toBeCloseTo(1, 12);
    expect(r.pairwise[1]!.kappa.value!).toBeCloseTo(0, 12);
    expect(r.pairwise[1]!.percent_agreement!).toBeCloseTo(0.5, 12);
    expect(r.pairwise[2]!.mean_kappa!).toBeCloseTo(0, 12);
  });
});
