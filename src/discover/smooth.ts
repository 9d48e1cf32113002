/**
 * Smoothing over the neighbourhood of a passage in its transcript: talk on one topic runs over
 * several turns (and several paragraphs of a written answer), so a passage whose neighbours are
 * unlike every theme is more likely new material than one alone among familiar talk.
 */

/**
 * Weighted means of `values` over each passage's neighbours in the same group (transcript), by
 * position in `order`: weight decay^distance (distance in passages of the group, itself 0).
 * decay 1 gives the group's mean; decay 0 the values themselves.
 *
 * @param groups group of every item (transcript), the same length as values
 * @param positions position of every item inside its group (e.g. its ordinal)
 */
export function smoothInGroups(values: ArrayLike<number>, groups: readonly string[], positions: ArrayLike<number>, decay: number): Float64Array {
  if (decay < 0 || decay > 1) throw new RangeError(`decay must be in [0, 1]; got ${decay}`);
  const byGroup = new Map<string, number[]>();
  groups.forEach((g, i) => (byGroup.get(g) ?? byGroup.set(g, []).get(g)!).push(i));
  const out = new Float64Array(values.length);
  for (const members of byGroup.values()) {
    members.sort((a, b) => positions[a]! - positions[b]! || a - b);
    const m = members.length;
    if (decay === 1) {
      let s = 0;
      for (const i of members) s += values[i]!;
      for (const i of members) out[i] = s / m;
      continue;
    }
    // Two passes of a geometric filter: sum_j decay^|r - j| v_j and the same sum of weights.
    const fwd = new Float64Array(m);
    const fwdW = new Float64Array(m);
    for (let r = 0; r < m; r++) {
      fwd[r] = values[members[r]!]! + (r ? decay * fwd[r - 1]! : 0);
      fwdW[r] = 1 + (r ? decay * fwdW[r - 1]! : 0);
    }
    let bwd = 0;
    let bwdW = 0;
    for (let r = m - 1; r >= 0; r--) {
      const num = fwd[r]! + decay * bwd;
      const den = fwdW[r]! + decay * bwdW;
      out[members[r]!] = num / den;
      bwd = values[members[r]!]! + decay * bwd;
      bwdW = 1 + decay * bwdW;
    }
  }
  return out;
}
