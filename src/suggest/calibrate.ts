/**
 * Score-to-probability maps, fitted on cross-validated scores of the coded batch.
 *
 * Platt scaling: p = 1 / (1 + exp(a*s + b)), fitted by maximum likelihood on Platt's smoothed
 * targets (t+ = (N+ + 1)/(N+ + 2), t- = 1/(N- + 2)), with the Newton method of Lin, Lin & Weng
 * (Machine Learning 68, 2007). scikit-learn's sigmoid calibration minimises the same objective.
 */

export interface Platt {
  kind: 'platt';
  a: number;
  b: number;
}

export type Calibrator = Platt;

export function fitPlatt(scores: ArrayLike<number>, labels: ArrayLike<number>): Platt {
  const n = scores.length;
  let pos = 0;
  for (let i = 0; i < n; i++) if (labels[i]! > 0) pos++;
  const neg = n - pos;
  const hi = (pos + 1) / (pos + 2);
  const lo = 1 / (neg + 2);
  const t = new Float64Array(n);
  for (let i = 0; i < n; i++) t[i] = labels[i]! > 0 ? hi : lo;

  let a = 0;
  let b = Math.log((neg + 1) / (pos + 1));
  const objective = (a: number, b: number) => {
    let f = 0;
    for (let i = 0; i < n; i++) {
      const z = a * scores[i]! + b;
      // -(t log p + (1-t) log(1-p)) with p = 1/(1+e^z), written to avoid overflow
      f += z >= 0 ? t[i]! * z + Math.log1p(Math.exp(-z)) : (t[i]! - 1) * z + Math.log1p(Math.exp(z));
    }
    return f;
  };
  let f = objective(a, b);
  const sigma = 1e-12;
  for (let it = 0; it < 100; it++) {
    let h11 = sigma;
    let h22 = sigma;
    let h21 = 0;
    let g1 = 0;
    let g2 = 0;
    for (let i = 0; i < n; i++) {
      const z = a * scores[i]! + b;
      const p = z >= 0 ? Math.exp(-z) / (1 + Math.exp(-z)) : 1 / (1 + Math.exp(z));
      const q = 1 - p;
      const d2 = p * q;
      const s = scores[i]!;
      h11 += s * s * d2;
      h22 += d2;
      h21 += s * d2;
      const d1 = t[i]! - p;
      g1 += s * d1;
      g2 += d1;
    }
    if (Math.abs(g1) < 1e-10 && Math.abs(g2) < 1e-10) break;
    const det = h11 * h22 - h21 * h21;
    const da = -(h22 * g1 - h21 * g2) / det;
    const db = -(-h21 * g1 + h11 * g2) / det;
    const gd = g1 * da + g2 * db;
    let step = 1;
    let moved = false;
    while (step >= 1e-10) {
      const na = a + step * da;
      const nb = b + step * db;
      const nf = objective(na, nb);
      if (nf < f + 1e-4 * step * gd) {
        a = na;
        b = nb;
        f = nf;
        moved = true;
        break;
      }
      step /= 2;
    }
    if (!moved) break;
  }
  return { kind: 'platt', a, b };
}

export function calibrate(c: Calibrator, s: number): number {
  // Platt maps only: the product fits no other kind.
  const z = c.a * s + c.b;
  return z >= 0 ? Math.exp(-z) / (1 + Math.exp(-z)) : 1 / (1 + Math.exp(z));
}
