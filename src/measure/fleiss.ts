/**
 * Fleiss' kappa for a fixed number of coders (Fleiss, J. L. (1971). Measuring nominal scale
 * agreement among many raters. Psychological Bulletin, 76(5), 378-382; bibliographic details
 * recalled from memory).
 *
 * Fleiss' kappa needs every unit rated by the same number of coders, so callers pass only the
 * units every coder rated (Krippendorff's alpha is the figure that takes missing values).
 */

import { defined, undefinedBecause, type Coefficient } from './coefficient.js';

export interface FleissResult extends Coefficient {
  /** Units (subjects) rated, each by `raters` coders. */
  units: number;
  raters: number;
  /** P-bar: mean share of agreeing coder pairs per unit; P-bar-e: the share expected by chance. */
  observed: number | null;
  expected: number | null;
}

/**
 * kappa = (P - Pe) / (1 - Pe) from counts[unit][category], the number of coders who put the
 * unit in the category. P_i = (sum_j n_ij^2 - n) / (n (n - 1)); P is their mean; p_j is the
 * category's share of all ratings and Pe = sum_j p_j^2.
 * Undefined when there are no units, fewer than two coders, or every rating is in one category.
 */
export function fleissKappa(counts: readonly (readonly number[])[]): FleissResult {
  const N = counts.length;
  const none = (reason: string, raters = 0): FleissResult => ({ ...undefinedBecause(reason), units: N, raters, observed: null, expected: null });
  if (N === 0) return none('no unit was rated by every coder');
  const n = counts[0]!.reduce((s, v) => s + v, 0);
  const K = counts[0]!.length;
  for (const row of counts) {
    if (row.length !== K) throw new RangeError('every unit needs a count for every category');
    if (row.reduce((s, v) => s + v, 0) !== n) throw new RangeError("Fleiss' kappa needs the same number of coders on every unit");
  }
  if (n < 2) return none("Fleiss' kappa needs two or more coders on each unit", n);
  const totals = new Array<number>(K).fill(0);
  let pSum = 0;
  for (const row of counts) {
    let sq = 0;
    row.forEach((v, j) => {
      sq += v * v;
      totals[j]! += v;
    });
    pSum += (sq - n) / (n * (n - 1));
  }
  const observed = pSum / N;
  const expected = totals.reduce((s, t) => s + (t / (N * n)) ** 2, 0);
  if (1 - expected < 1e-15) {
    return { ...undefinedBecause('every coder put every unit in the same category, so agreement expected by chance is 1'), units: N, raters: n, observed, expected };
  }
  return { ...defined((observed - expected) / (1 - expected)), units: N, raters: n, observed, expected };
}

/**
 * Fleiss' kappa for one variable given as rows[coder][unit] (null = not rated): the units every
 * coder rated, counted by label.
 */
export function fleissFromRows(rows: readonly (readonly (string | number | null)[])[]): FleissResult {
  const nUnits = rows.length ? rows[0]!.length : 0;
  const labels = new Map<string | number, number>();
  const complete: (string | number)[][] = [];
  for (let u = 0; u < nUnits; u++) {
    const here = rows.map((r) => r[u]);
    if (here.some((v) => v === null || v === undefined)) continue;
    for (const v of here) if (!labels.has(v!)) labels.set(v!, labels.size);
    complete.push(here as (string | number)[]);
  }
  if (rows.length < 2) return { ...undefinedBecause("Fleiss' kappa needs two or more coders"), units: complete.length, raters: rows.length, observed: null, expected: null };
  const counts = complete.map((here) => {
    const c = new Array<number>(labels.size).fill(0);
    for (const v of here) c[labels.get(v)!]!++;
    return c;
  });
  if (!counts.length) return { ...undefinedBecause('no unit was reviewed by every one of the coders'), units: 0, raters: rows.length, observed: null, expected: null };
  return fleissKappa(counts);
}
