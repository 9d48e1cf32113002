/**
 * Binary logistic regression with weights shared by all themes and one intercept per theme:
 * P(theme t applies to passage p) = sigmoid(w . f(p, t) + b_t). The signals are the same kind
 * of quantity for every theme, so a handful of shared weights can be learned from a small coded
 * batch where per-theme weights could not. Fitted by Newton's method with a ridge penalty.
 */

import { solveSpd, symmetrise } from '../math/cholesky.js';
import { addRidge, backtrack } from '../math/newton.js';
import { sigmoid, softplus } from '../math/sigmoid.js';

export interface GroupedData {
  /** Row-major features, `k` per row (or `row`). */
  x?: Float64Array;
  /**
   * Instead of `x`: writes row i's k features into out. A large fit need not hold every row's
   * features as doubles at once (80 MB at 20,000 answers); the Newton steps read each row anew.
   */
  row?: (i: number, out: Float64Array) => void;
  k: number;
  /** 0/1 outcome of each row. */
  y: Uint8Array;
  /** Group (theme) of each row, 0..groups-1. */
  group: Int32Array;
  groups: number;
}

export interface GroupedModel {
  weights: number[];
  intercepts: number[];
}

/**
 * @param ridge penalty on the shared weights (features should be standardised)
 * @param interceptRidge small penalty keeping intercepts finite for a theme with no positives
 */
/**
 * @param tol stop when the objective changes by less than this share of it
 * @param start weights and intercepts to start from (a nearby earlier fit), else zero weights and base rates
 */
export function fitGrouped(d: GroupedData, ridge = 1, interceptRidge = 1e-3, tol = 1e-8, start?: GroupedModel): GroupedModel {
  const { k, groups } = d;
  const n = d.y.length;
  const dim = k + groups;
  const beta = new Float64Array(dim);
  // Start intercepts at each group's base rate.
  const pos = new Float64Array(groups);
  const cnt = new Float64Array(groups);
  for (let i = 0; i < n; i++) {
    cnt[d.group[i]!]!++;
    if (d.y[i]) pos[d.group[i]!]!++;
  }
  for (let g = 0; g < groups; g++) beta[k + g] = Math.log((pos[g]! + 0.5) / (cnt[g]! - pos[g]! + 0.5));
  if (start && start.weights.length === k && start.intercepts.length === groups) {
    start.weights.forEach((w, j) => (beta[j] = w));
    start.intercepts.forEach((b, g) => (beta[k + g] = b));
  }

  const xi = new Float64Array(k);
  const x = d.x;
  const load =
    d.row ??
    ((i: number, out: Float64Array) => {
      for (let j = 0; j < k; j++) out[j] = x![i * k + j]!;
    });
  const model = (): GroupedModel => ({ weights: [...beta.subarray(0, k)], intercepts: [...beta.subarray(k)] });
  const objective = (b: Float64Array): number => {
    let s = 0;
    for (let i = 0; i < n; i++) {
      let z = b[k + d.group[i]!]!;
      load(i, xi);
      for (let j = 0; j < k; j++) z += b[j]! * xi[j]!;
      s += d.y[i] ? softplus(-z) : softplus(z);
    }
    for (let j = 0; j < k; j++) s += 0.5 * ridge * b[j]! * b[j]!;
    for (let g = 0; g < groups; g++) s += 0.5 * interceptRidge * b[k + g]! * b[k + g]!;
    return s;
  };

  let f = objective(beta);
  for (let it = 0; it < 50; it++) {
    const grad = new Float64Array(dim);
    const hess = new Float64Array(dim * dim);
    for (let i = 0; i < n; i++) {
      const g = d.group[i]!;
      let z = beta[k + g]!;
      load(i, xi);
      for (let j = 0; j < k; j++) z += beta[j]! * xi[j]!;
      const p = sigmoid(z);
      const r = p - d.y[i]!;
      const w = Math.max(p * (1 - p), 1e-12);
      const gi = k + g;
      for (let j = 0; j < k; j++) {
        const xj = xi[j]!;
        grad[j] = grad[j]! + r * xj;
        for (let l = 0; l <= j; l++) hess[j * dim + l] = hess[j * dim + l]! + w * xj * xi[l]!;
        hess[gi * dim + j] = hess[gi * dim + j]! + w * xj;
      }
      grad[gi] = grad[gi]! + r;
      hess[gi * dim + gi] = hess[gi * dim + gi]! + w;
    }
    addRidge(grad, hess, beta, k, groups, ridge, interceptRidge);
    const step = solveSpd(symmetrise(hess, dim), grad, dim);
    const gd = step.reduce((s, v, j) => s - v * grad[j]!, 0);
    const nf = backtrack(beta, f, step, gd, objective);
    if (nf === null) break;
    const change = Math.abs(f - nf);
    f = nf;
    if (change < tol * Math.max(1, Math.abs(f))) return model();
  }
  return model();
}
