/**
 * Score-to-probability maps, fitted on cross-validated scores of the coded batch.
 *
 * Platt scaling: p = 1 / (1 + exp(a*s + b)), fitted by maximum likelihood on Platt's smoothed
 * targets (t+ = (N+ + 1)/(N+ + 2), t- = 1/(N- + 2)), with the Newton method of Lin, Lin & Weng
 * (Machine Learning 68, 2007). scikit-learn's sigmoid calibration minimises the same objective.
 *
 * Isotonic regression: the pool-adjacent-violators fit of a non-decreasing step function,
 * predicted by linear interpolation between its points and clipped outside them (as
 * scikit-learn's IsotonicRegression(out_of_bounds="clip")).
 */

export interface Platt {
  kind: 'platt';
  a: number;
  b: number;
}

export interface Isotonic {
  kind: 'isotonic';
  /** Increasing scores and the fitted probability at each. */
  x: number[];
  y: number[];
}

export type Calibrator = Platt | Isotonic;

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

/**
 * Weighted pool-adjacent-violators on (score, label) pairs. Equal scores are merged first
 * (their labels averaged), then adjacent blocks that break monotonicity are pooled.
 */
export function fitIsotonic(scores: ArrayLike<number>, labels: ArrayLike<number>, weights?: ArrayLike<number>): Isotonic {
  const order = Array.from({ length: scores.length }, (_, i) => i).sort((i, j) => scores[i]! - scores[j]! || i - j);
  const xs: number[] = [];
  const ys: number[] = [];
  const ws: number[] = [];
  for (const i of order) {
    const w = weights ? weights[i]! : 1;
    const last = xs.length - 1;
    if (last >= 0 && xs[last] === scores[i]) {
      ys[last] = (ys[last]! * ws[last]! + labels[i]! * w) / (ws[last]! + w);
      ws[last] = ws[last]! + w;
    } else {
      xs.push(scores[i]!);
      ys.push(labels[i]!);
      ws.push(w);
    }
  }
  // Blocks: value, weight and the range of points they cover.
  const bv: number[] = [];
  const bw: number[] = [];
  const bstart: number[] = [];
  for (let i = 0; i < xs.length; i++) {
    bv.push(ys[i]!);
    bw.push(ws[i]!);
    bstart.push(i);
    while (bv.length > 1 && bv[bv.length - 2]! >= bv[bv.length - 1]!) {
      const v2 = bv.pop()!;
      const w2 = bw.pop()!;
      bstart.pop();
      const k = bv.length - 1;
      bv[k] = (bv[k]! * bw[k]! + v2 * w2) / (bw[k]! + w2);
      bw[k] = bw[k]! + w2;
    }
  }
  const fitted = new Array<number>(xs.length);
  for (let k = 0; k < bv.length; k++) {
    const end = k + 1 < bv.length ? bstart[k + 1]! : xs.length;
    for (let i = bstart[k]!; i < end; i++) fitted[i] = bv[k]!;
  }
  // Keep only the points needed for interpolation: the first and last of every flat run.
  const x: number[] = [];
  const y: number[] = [];
  for (let i = 0; i < xs.length; i++) {
    const flatBefore = i > 0 && fitted[i - 1] === fitted[i];
    const flatAfter = i + 1 < xs.length && fitted[i + 1] === fitted[i];
    if (flatBefore && flatAfter) continue;
    x.push(xs[i]!);
    y.push(fitted[i]!);
  }
  return { kind: 'isotonic', x, y };
}

export function calibrate(c: Calibrator, s: number): number {
  if (c.kind === 'platt') {
    const z = c.a * s + c.b;
    return z >= 0 ? Math.exp(-z) / (1 + Math.exp(-z)) : 1 / (1 + Math.exp(z));
  }
  const { x, y } = c;
  if (x.length === 0) return 0;
  if (s <= x[0]!) return y[0]!;
  if (s >= x[x.length - 1]!) return y[y.length - 1]!;
  let lo = 0;
  let hi = x.length - 1;
  while (hi - lo > 1) {
    const mid = (lo + hi) >> 1;
    if (x[mid]! <= s) lo = mid;
    else hi = mid;
  }
  return y[lo]! + ((y[hi]! - y[lo]!) * (s - x[lo]!)) / (x[hi]! - x[lo]!);
}
