/**
 * Context signals. In an interview, talk on one theme runs over several turns and answers the
 * question before it, so a passage's neighbours carry evidence about it. Given a per-passage
 * base score u (one value per theme), these give for every passage:
 *   adjacent   - the mean of u over the passages just before and after;
 *   transcript - the mean of u over the other passages of the transcript, weighted by
 *                decay^(distance - 1) (decay 1 = the whole transcript alike);
 *   question   - u of the last interviewer passage before it.
 * A passage with no such neighbour gets its own u, so a missing neighbour adds no evidence.
 * Linear time: the distance-weighted sums are running sums in both directions.
 */
import type { Role } from './types.js';

export interface ContextInput {
  /** [passage][theme] base scores, flattened. */
  u: Float64Array;
  themes: number;
  /** Each transcript's passages (indices) in order. */
  members: number[][];
  role: Role[];
}

export function adjacent({ u, themes, members }: ContextInput): Float64Array {
  const out = new Float64Array(u.length);
  for (const m of members) {
    for (let i = 0; i < m.length; i++) {
      const p = m[i]!;
      const prev = i > 0 ? m[i - 1]! : -1;
      const next = i + 1 < m.length ? m[i + 1]! : -1;
      for (let t = 0; t < themes; t++) {
        let s = 0;
        let n = 0;
        if (prev >= 0) (s += u[prev * themes + t]!), n++;
        if (next >= 0) (s += u[next * themes + t]!), n++;
        out[p * themes + t] = n ? s / n : u[p * themes + t]!;
      }
    }
  }
  return out;
}

/**
 * @param scale 'mean' the weighted mean; 'sqrt' the mean times the square root of the total
 * weight, so a long stretch of consistent talk counts as more evidence than a short one.
 */
export function transcript({ u, themes, members }: ContextInput, decay: number, scale: 'mean' | 'sqrt' = 'mean'): Float64Array {
  const out = new Float64Array(u.length);
  for (const m of members) {
    const n = m.length;
    if (n === 1) {
      for (let t = 0; t < themes; t++) out[m[0]! * themes + t] = u[m[0]! * themes + t]!;
      continue;
    }
    // fwd[i] = sum_{j<i} decay^(i-j-1) u_j, with the same recursion for the weights.
    const fwd = new Float64Array(n * themes);
    const bwd = new Float64Array(n * themes);
    const wf = new Float64Array(n);
    const wb = new Float64Array(n);
    for (let i = 1; i < n; i++) {
      wf[i] = 1 + decay * wf[i - 1]!;
      const prev = m[i - 1]!;
      for (let t = 0; t < themes; t++) fwd[i * themes + t] = u[prev * themes + t]! + decay * fwd[(i - 1) * themes + t]!;
    }
    for (let i = n - 2; i >= 0; i--) {
      wb[i] = 1 + decay * wb[i + 1]!;
      const next = m[i + 1]!;
      for (let t = 0; t < themes; t++) bwd[i * themes + t] = u[next * themes + t]! + decay * bwd[(i + 1) * themes + t]!;
    }
    for (let i = 0; i < n; i++) {
      const w = wf[i]! + wb[i]!;
      const p = m[i]!;
      const f = scale === 'sqrt' ? Math.sqrt(w) / w : 1 / w;
      for (let t = 0; t < themes; t++) out[p * themes + t] = (fwd[i * themes + t]! + bwd[i * themes + t]!) * f;
    }
  }
  return out;
}

export function question({ u, themes, members, role }: ContextInput): Float64Array {
  const out = new Float64Array(u.length);
  for (const m of members) {
    let last = -1;
    for (const p of m) {
      const src = role[p] === 'participant' && last >= 0 ? last : p;
      for (let t = 0; t < themes; t++) out[p * themes + t] = u[src * themes + t]!;
      if (role[p] === 'interviewer') last = p;
    }
  }
  return out;
}
