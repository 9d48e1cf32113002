/**
 * Per-theme thresholds from cross-validated confidences: the lowest confidence at which the
 * suggestions above it would have reached the target precision on the coded batch, with the
 * precision and recall they had there.
 */

export interface ThresholdChoice {
  threshold: number;
  precision: number;
  recall: number;
  /** False when no cut reached the target; the threshold is then the target itself. */
  reached: boolean;
}

export function precisionRecallAt(conf: ArrayLike<number>, labels: ArrayLike<number>, threshold: number): { precision: number; recall: number } {
  let tp = 0;
  let fp = 0;
  let pos = 0;
  for (let i = 0; i < conf.length; i++) {
    if (labels[i]) pos++;
    if (conf[i]! >= threshold) labels[i] ? tp++ : fp++;
  }
  return { precision: tp + fp ? tp / (tp + fp) : 0, recall: pos ? tp / pos : 0 };
}

/**
 * @param minAbove cuts leaving fewer suggestions above them are not trusted (a precision
 * measured on two passages says little)
 */
export function chooseThreshold(conf: ArrayLike<number>, labels: ArrayLike<number>, target: number, minAbove = 3): ThresholdChoice {
  const order = Array.from({ length: conf.length }, (_, i) => i).sort((a, b) => conf[b]! - conf[a]! || a - b);
  let pos = 0;
  for (let i = 0; i < labels.length; i++) if (labels[i]) pos++;
  let tp = 0;
  let best: ThresholdChoice | null = null;
  for (let r = 0; r < order.length; r++) {
    if (labels[order[r]!]) tp++;
    // Only cut between distinct confidences.
    if (r + 1 < order.length && conf[order[r + 1]!] === conf[order[r]!]) continue;
    const above = r + 1;
    const precision = tp / above;
    if (above >= minAbove && precision >= target) best = { threshold: conf[order[r]!]!, precision, recall: pos ? tp / pos : 0, reached: true };
  }
  if (best) return best;
  const at = precisionRecallAt(conf, labels, target);
  return { threshold: target, ...at, reached: false };
}
