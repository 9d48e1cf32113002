/**
 * Conditional (multinomial) logit with a "none of these" alternative: within a choice set (one
 * passage against the themes at one depth of the template), P(theme j) = e^z_j / (1 + sum e^z),
 * z_j = w . x_j + b_theme(j), and "none" has utility 0. Shared weights, one intercept per theme,
 * ridge-penalised, fitted by Newton's method (McFadden's conditional logit).
 *
 * Three kinds of observation: a set with coded themes counts each as one draw; a fully coded set
 * with none counts one draw of "none"; a set marked partial says only that its `y = 1` rows were
 * NOT chosen (a coder rejected them), i.e. the draw fell among the others or "none".
 *
 * Fitting the themes jointly, rather than each as an independent yes/no, makes the best
 * candidate's probability honest: a rival's weakness is evidence for it.
 */
import { solveSpd, symmetrise } from '../math/cholesky.js';
import { addRidge, backtrack } from '../math/newton.js';

export interface ChoiceData {
  /** Row-major features, `k` per row; rows of one set are contiguous. */
  x: Float64Array;
  k: number;
  /** Theme of each row. */
  theme: Int32Array;
  /** 1 when the row's theme was coded (in a partial set: when it was rejected). */
  y: Uint8Array;
  /** Set boundaries: rows setStart[s] .. setStart[s+1]-1 (length sets + 1). */
  setStart: Int32Array;
  /** 1 for a partial set (rejections only). Optional: all sets are full. */
  partial?: Uint8Array;
  themes: number;
}

export interface ChoiceModel {
  weights: number[];
  intercepts: number[];
}

/** Utilities of a set's rows under parameters beta, into `z`. */
function utilities(beta: Float64Array, d: ChoiceData, from: number, to: number, z: Float64Array): void {
  const { k, x, theme } = d;
  for (let r = from; r < to; r++) {
    let v = beta[k + theme[r]!]!;
    for (let j = 0; j < k; j++) v += beta[j]! * x[r * k + j]!;
    z[r - from] = v;
  }
}

/** log(1 + sum e^z) over z[0..n-1] (skipping rows where `skip` is 1), stably. */
function logOnePlusSumExp(z: Float64Array, n: number, skip?: Uint8Array, offset = 0): number {
  let mx = 0;
  for (let i = 0; i < n; i++) if (!(skip && skip[offset + i]) && z[i]! > mx) mx = z[i]!;
  let s = Math.exp(-mx);
  for (let i = 0; i < n; i++) if (!(skip && skip[offset + i])) s += Math.exp(z[i]! - mx);
  return mx + Math.log(s);
}

function maxSetSize(d: ChoiceData): number {
  let m = 0;
  for (let s = 0; s + 1 < d.setStart.length; s++) m = Math.max(m, d.setStart[s + 1]! - d.setStart[s]!);
  return m;
}

/** Negative log-likelihood of one set given its utilities, and its number of draws. */
function setLoss(d: ChoiceData, s: number, z: Float64Array, from: number, to: number): [number, number] {
  const lse = logOnePlusSumExp(z, to - from);
  if (d.partial?.[s]) return [lse - logOnePlusSumExp(z, to - from, d.y, from), 1];
  let pos = 0;
  let l = 0;
  for (let r = from; r < to; r++) if (d.y[r]) (pos++, (l -= z[r - from]!));
  const e = Math.max(pos, 1);
  return [l + e * lse, e];
}

/** Mean negative log-likelihood per draw. */
export function choiceLoss(m: ChoiceModel, d: ChoiceData): number {
  const beta = Float64Array.from([...m.weights, ...m.intercepts]);
  const z = new Float64Array(maxSetSize(d));
  let loss = 0;
  let draws = 0;
  for (let s = 0; s + 1 < d.setStart.length; s++) {
    const from = d.setStart[s]!;
    const to = d.setStart[s + 1]!;
    utilities(beta, d, from, to, z);
    const [l, e] = setLoss(d, s, z, from, to);
    loss += l;
    draws += e;
  }
  return draws ? loss / draws : 0;
}

/**
 * @param ridge penalty on the shared weights (features should be standardised)
 * @param interceptRidge penalty on the intercepts, keeping them finite
 * @param start warm start (e.g. the fit of a neighbouring candidate)
 * @param maxIter Newton steps at most (a few suffice to compare candidates from a warm start)
 */
export function fitChoice(d: ChoiceData, ridge = 1, interceptRidge = 1e-3, start?: ChoiceModel, maxIter = 100): ChoiceModel {
  const { k, themes, x, theme, y, setStart } = d;
  const dim = k + themes;
  const nSets = setStart.length - 1;
  const beta = new Float64Array(dim);
  if (start && start.weights.length === k) beta.set([...start.weights, ...start.intercepts]);
  const z = new Float64Array(maxSetSize(d));
  const p = new Float64Array(z.length);
  const q = new Float64Array(z.length);

  const objective = (b: Float64Array): number => {
    let f = 0;
    for (let s = 0; s < nSets; s++) {
      const from = setStart[s]!;
      const to = setStart[s + 1]!;
      utilities(b, d, from, to, z);
      f += setLoss(d, s, z, from, to)[0];
    }
    for (let j = 0; j < k; j++) f += 0.5 * ridge * b[j]! * b[j]!;
    for (let t = 0; t < themes; t++) f += 0.5 * interceptRidge * b[k + t]! * b[k + t]!;
    return f;
  };
  const model = (): ChoiceModel => ({ weights: [...beta.subarray(0, k)], intercepts: [...beta.subarray(k)] });

  let f = objective(beta);
  const grad = new Float64Array(dim);
  const hess = new Float64Array(dim * dim);
  const mean = new Float64Array(dim); // sum_j p_j a_j of one set
  const used = new Int32Array(k + z.length);
  for (let it = 0; it < maxIter; it++) {
    grad.fill(0);
    hess.fill(0);
    for (let s = 0; s < nSets; s++) {
      const from = setStart[s]!;
      const to = setStart[s + 1]!;
      const n = to - from;
      utilities(beta, d, from, to, z);
      const lse = logOnePlusSumExp(z, n);
      const partial = d.partial?.[s] === 1;
      // Gradient in z: e p - y for a full set; p - q for a partial one, q the probabilities
      // among the alternatives left. The curvature used is e Cov_p, which bounds the partial
      // set's true (possibly indefinite) Hessian from above: steps stay safe, line search does
      // the rest.
      let e = 1;
      if (partial) {
        const lseA = logOnePlusSumExp(z, n, y, from);
        for (let i = 0; i < n; i++) q[i] = y[from + i] ? 0 : Math.exp(z[i]! - lseA);
      } else {
        let pos = 0;
        for (let r = from; r < to; r++) pos += y[r]!;
        e = Math.max(pos, 1);
      }
      mean.fill(0);
      for (let i = 0; i < n; i++) {
        const r = from + i;
        const pi = (p[i] = Math.exp(z[i]! - lse));
        const gi = partial ? pi - q[i]! : e * pi - y[r]!;
        const ti = k + theme[r]!;
        for (let j = 0; j < k; j++) {
          const xj = x[r * k + j]!;
          grad[j] = grad[j]! + gi * xj;
          mean[j] = mean[j]! + pi * xj;
          const row = j * dim;
          const ep = e * pi * xj;
          for (let l = 0; l <= j; l++) hess[row + l] = hess[row + l]! + ep * x[r * k + l]!;
          hess[ti * dim + j] = hess[ti * dim + j]! + ep;
        }
        grad[ti] = grad[ti]! + gi;
        mean[ti] = mean[ti]! + pi;
        hess[ti * dim + ti] = hess[ti * dim + ti]! + e * pi;
      }
      // - e (sum p a)(sum p a)^T over the entries that are not zero.
      let nu = 0;
      for (let j = 0; j < k; j++) used[nu++] = j;
      for (let i = 0; i < n; i++) used[nu++] = k + theme[from + i]!;
      for (let a = 0; a < nu; a++) {
        const ia = used[a]!;
        const ma = e * mean[ia]!;
        for (let b = 0; b <= a; b++) {
          const ib = used[b]!;
          const at = ia >= ib ? ia * dim + ib : ib * dim + ia;
          hess[at] = hess[at]! - ma * mean[ib]!;
        }
      }
    }
    addRidge(grad, hess, beta, k, themes, ridge, interceptRidge);
    const step = solveSpd(symmetrise(hess, dim), grad, dim);
    let gd = 0;
    for (let j = 0; j < dim; j++) gd -= step[j]! * grad[j]!;
    if (-gd < 1e-12 * Math.max(1, Math.abs(f))) break;
    const nf = backtrack(beta, f, step, gd, objective);
    if (nf === null) break;
    const change = f - nf;
    f = nf;
    // Newton converges quadratically: a change this small means the next step is negligible.
    if (change < 1e-7 * Math.max(1, Math.abs(f))) return model();
  }
  return model();
}
