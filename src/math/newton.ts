/** Pieces of a penalised Newton iteration shared by the logistic fits. */

/**
 * The penalty's part of a Newton step for weights 0..k-1 (ridge) and k intercepts after them
 * (interceptRidge): added to the gradient and the Hessian's diagonal.
 */
export function addRidge(grad: Float64Array, hess: Float64Array, beta: Float64Array, k: number, intercepts: number, ridge: number, interceptRidge: number): void {
  const dim = k + intercepts;
  for (let j = 0; j < k; j++) {
    grad[j] = grad[j]! + ridge * beta[j]!;
    hess[j * dim + j] = hess[j * dim + j]! + ridge;
  }
  for (let t = 0; t < intercepts; t++) {
    grad[k + t] = grad[k + t]! + interceptRidge * beta[k + t]!;
    hess[(k + t) * dim + k + t] = hess[(k + t) * dim + k + t]! + interceptRidge;
  }
}

/**
 * Backtracking (Armijo) line search from `beta` (objective `f`) along -`step`, whose directional
 * derivative is `gd`: halves the step until the objective falls enough. Moves `beta` and returns
 * the new objective, or null when no step of at least 1e-8 does.
 */
export function backtrack(beta: Float64Array, f: number, step: Float64Array, gd: number, objective: (b: Float64Array) => number): number | null {
  for (let t = 1; t > 1e-8; t /= 2) {
    const next = beta.map((v, j) => v - t * step[j]!);
    const nf = objective(next);
    if (nf <= f + 1e-4 * t * gd) {
      beta.set(next);
      return nf;
    }
  }
  return null;
}
