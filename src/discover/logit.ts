/**
 * Binary logistic regression with an L2 penalty on the weights (the intercept is free), fitted by
 * Newton's method: the same objective as scikit-learn's LogisticRegression(penalty='l2', C),
 * i.e. sum of log-losses + ||w||^2 / (2 C). Small and dense: the novelty model has a handful of
 * features and a few thousand rows.
 */
// The same sigmoid, symmetrising and Cholesky solve as the suggester's logistic regressions.
import { sigmoid, solveSpd as solve, symmetrise } from '../suggest/logistic.js';

export interface LogitState {
  /** Intercept first, then one weight per feature. */
  coef: number[];
  /** Newton steps taken, and whether the step size fell below the tolerance. */
  iterations: number;
  converged: boolean;
}

/**
 * @param x rows of features (all the same length)
 * @param y 0/1 labels
 * @param c inverse penalty strength, as scikit-learn's C (default 1)
 */
export function fitLogit(x: readonly (readonly number[])[], y: readonly number[], c = 1, maxIterations = 100, tolerance = 1e-10): LogitState {
  if (x.length !== y.length || x.length === 0) throw new RangeError('fitLogit: need as many labels as rows, and at least one row');
  const d = x[0]!.length + 1;
  const w = new Float64Array(d);
  let iterations = 0;
  let converged = false;
  for (; iterations < maxIterations && !converged; iterations++) {
    const g = new Float64Array(d);
    const h = new Float64Array(d * d);
    for (let j = 1; j < d; j++) (g[j] = w[j]! / c), (h[j * d + j] = 1 / c);
    x.forEach((row, i) => {
      let z = w[0]!;
      for (let j = 1; j < d; j++) z += w[j]! * row[j - 1]!;
      const p = sigmoid(z);
      const r = p - y[i]!;
      const s = p * (1 - p);
      for (let a = 0; a < d; a++) {
        const xa = a ? row[a - 1]! : 1;
        g[a] += r * xa;
        for (let b = 0; b <= a; b++) h[a * d + b] += s * xa * (b ? row[b - 1]! : 1);
      }
    });
    symmetrise(h, d);
    // A tiny ridge on the intercept's diagonal keeps a separable or one-class batch solvable.
    h[0] += 1e-9;
    const step = solve(h, g, d);
    let size = 0;
    for (let j = 0; j < d; j++) (w[j] -= step[j]!), (size = Math.max(size, Math.abs(step[j]!)));
    converged = size < tolerance;
  }
  return { coef: Array.from(w), iterations, converged };
}

export function predictLogit(state: LogitState, row: readonly number[]): number {
  let z = state.coef[0]!;
  for (let j = 1; j < state.coef.length; j++) z += state.coef[j]! * row[j - 1]!;
  return sigmoid(z);
}
