/**
 * Krippendorff's alpha by the coincidence-matrix method of Krippendorff, "Computing
 * Krippendorff's Alpha-Reliability" (2011): any number of coders, missing values allowed.
 */

import { defined, undefinedBecause, type Coefficient, type Label } from './coefficient.js';

export type AlphaLevel = 'nominal' | 'interval';

export interface AlphaResult extends Coefficient {
  /** Pairable values n.. : values in units that hold at least two of them. */
  pairableValues: number;
  /** Units with at least two values (the others are dropped: they cannot be paired). */
  pairableUnits: number;
  /** D_o and D_e as the paper defines them (null when there is nothing to pair). */
  observedDisagreement: number | null;
  expectedDisagreement: number | null;
}

/**
 * alpha = 1 - D_o / D_e for a reliability data matrix `data[coder][unit]` (null = missing).
 *
 * For each unit u holding m_u >= 2 values, every ordered pair of values from different coders
 * adds 1 / (m_u - 1) to the coincidence o_ck; n_c are the row sums and n.. their total. Then
 *   D_o = (1 / n..) sum_c sum_k o_ck delta_ck
 *   D_e = (1 / (n.. (n.. - 1))) sum_c sum_k n_c n_k delta_ck
 * with delta = [c != k] for nominal data and (c - k)^2 for interval data.
 * Undefined (null) when no unit is pairable or when every pairable value is the same (D_e = 0).
 */
export function krippendorffAlpha(data: readonly (readonly (Label | null)[])[], level: AlphaLevel = 'nominal'): AlphaResult {
  const nUnits = data.length > 0 ? data[0]!.length : 0;
  for (const row of data) {
    if (row.length !== nUnits) throw new RangeError('every coder row of the reliability data must have one entry per unit');
  }
  // Values are indexed once so that the coincidence matrix is a small dense array.
  const index = new Map<Label, number>();
  const values: Label[] = [];
  const units: number[][] = [];
  for (let u = 0; u < nUnits; u++) {
    const here: number[] = [];
    for (const row of data) {
      const v = row[u];
      if (v === null || v === undefined) continue;
      if (level === 'interval' && (typeof v !== 'number' || !Number.isFinite(v))) {
        throw new RangeError(`interval alpha needs finite numbers; got ${JSON.stringify(v)}`);
      }
      let k = index.get(v);
      if (k === undefined) {
        k = values.length;
        index.set(v, k);
        values.push(v);
      }
      here.push(k);
    }
    if (here.length >= 2) units.push(here);
  }
  const none = { pairableValues: 0, pairableUnits: 0, observedDisagreement: null, expectedDisagreement: null };
  if (units.length === 0) return { ...undefinedBecause('no unit was coded by two or more coders'), ...none };

  const V = values.length;
  const o = new Float64Array(V * V);
  for (const here of units) {
    const w = 1 / (here.length - 1);
    const counts = new Map<number, number>();
    for (const k of here) counts.set(k, (counts.get(k) ?? 0) + 1);
    // Ordered pairs of distinct coders: c with k (c != k) count n_c n_k; c with c count n_c (n_c - 1).
    for (const [c, nc] of counts) {
      for (const [k, nk] of counts) o[c * V + k] += w * (c === k ? nc * (nc - 1) : nc * nk);
    }
  }
  const nc = new Float64Array(V);
  let n = 0;
  for (let c = 0; c < V; c++) {
    for (let k = 0; k < V; k++) nc[c] += o[c * V + k]!;
    n += nc[c]!;
  }
  const delta = (c: number, k: number): number => {
    if (c === k) return 0;
    if (level === 'nominal') return 1;
    const d = (values[c] as number) - (values[k] as number);
    return d * d;
  };
  let observedSum = 0;
  let expectedSum = 0;
  for (let c = 0; c < V; c++) {
    for (let k = 0; k < V; k++) {
      const d = delta(c, k);
      if (d === 0) continue;
      observedSum += o[c * V + k]! * d;
      expectedSum += nc[c]! * nc[k]! * d;
    }
  }
  const pairable = Math.round(n); // n.. is a count; the 1/(m_u - 1) weights only make it look fractional
  const counts = { pairableValues: pairable, pairableUnits: units.length };
  const Do = observedSum / n;
  const De = expectedSum / (n * (n - 1));
  if (expectedSum === 0) {
    return {
      ...undefinedBecause('every pairable value is the same, so no disagreement is expected by chance'),
      ...counts,
      observedDisagreement: Do,
      expectedDisagreement: 0,
    };
  }
  return { ...defined(1 - Do / De), ...counts, observedDisagreement: Do, expectedDisagreement: De };
}
