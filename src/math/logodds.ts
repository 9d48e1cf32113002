/**
 * Weighted log-odds ratio with an informative Dirichlet prior (Monroe, Colaresi & Quinn,
 * "Fightin' Words", Political Analysis 16(4), 2008, eqs. 16-17): how much more a term is used
 * in one group of texts (a theme's passages) than in another (the rest of the coded batch),
 * shrunk towards the term's frequency in the whole study so rare terms do not dominate.
 */

export interface LogOdds {
  /** The log-odds ratio delta (theme minus rest). */
  delta: number;
  /** delta divided by its approximate standard deviation. */
  z: number;
}

/**
 * @param yt count of the term in the theme's passages; nt all terms counted there
 * @param yr count of the term in the other passages; nr all terms counted there
 * @param aw the term's prior pseudo-count; a0 the prior's total pseudo-count
 */
export function logOdds(yt: number, nt: number, yr: number, nr: number, aw: number, a0: number): LogOdds {
  const delta = Math.log((yt + aw) / (nt + a0 - yt - aw)) - Math.log((yr + aw) / (nr + a0 - yr - aw));
  const variance = 1 / (yt + aw) + 1 / (yr + aw);
  return { delta, z: delta / Math.sqrt(variance) };
}

/** Only the delta, without allocating (the inner loop of scoring). */
export function logOddsDelta(yt: number, nt: number, yr: number, nr: number, aw: number, a0: number): number {
  return Math.log((yt + aw) / (nt + a0 - yt - aw)) - Math.log((yr + aw) / (nr + a0 - yr - aw));
}
