/** Dense symmetric positive definite systems: the Newton steps of the small logistic fits. */

/** Copies the filled lower triangle of a square matrix to its upper one; returns the matrix. */
export function symmetrise(m: Float64Array, dim: number): Float64Array {
  for (let a = 0; a < dim; a++) for (let b = 0; b < a; b++) m[b * dim + a] = m[a * dim + b]!;
  return m;
}

/** Solves A x = b for a symmetric positive definite A (Cholesky). */
export function solveSpd(a: Float64Array, b: Float64Array, n: number): Float64Array {
  const l = new Float64Array(n * n);
  for (let i = 0; i < n; i++) {
    for (let j = 0; j <= i; j++) {
      let s = a[i * n + j]!;
      for (let m = 0; m < j; m++) s -= l[i * n + m]! * l[j * n + m]!;
      if (i === j) l[i * n + i] = Math.sqrt(Math.max(s, 1e-12));
      else l[i * n + j] = s / l[j * n + j]!;
    }
  }
  const y = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    let s = b[i]!;
    for (let m = 0; m < i; m++) s -= l[i * n + m]! * y[m]!;
    y[i] = s / l[i * n + i]!;
  }
  const x = new Float64Array(n);
  for (let i = n - 1; i >= 0; i--) {
    let s = y[i]!;
    for (let m = i + 1; m < n; m++) s -= l[m * n + i]! * x[m]!;
    x[i] = s / l[i * n + i]!;
  }
  return x;
}
