/**
 * Confidence bins and expected calibration error. The bins are those of scikit-learn's
 * `calibration_curve(strategy='uniform')`, so that its output can check ours: edges k / bins,
 * each bin closed on the right ((0.1, 0.2]) and the first one closed on both sides ([0, 0.1]).
 */

export const DEFAULT_BINS = 10;

function checkBins(bins: number): void {
  if (!Number.isInteger(bins) || bins < 1) throw new RangeError(`bins must be a positive whole number, got ${bins}`);
}

/** Inner edges as numpy's linspace(0, 1, bins + 1) makes them (k * (1 / bins)), for exact parity. */
function innerEdges(bins: number): number[] {
  const step = 1 / bins;
  const edges: number[] = [];
  for (let k = 1; k < bins; k++) edges.push(k * step);
  return edges;
}

/** The bin (0 .. bins - 1) of a confidence in [0, 1]. */
export function confidenceBin(confidence: number, bins = DEFAULT_BINS): number {
  checkBins(bins);
  if (!(confidence >= 0 && confidence <= 1)) throw new RangeError(`confidence must lie in [0, 1], got ${confidence}`);
  const edges = innerEdges(bins);
  // First inner edge >= confidence (numpy searchsorted, side 'left').
  let lo = 0;
  let hi = edges.length;
  while (lo < hi) {
    const mid = (lo + hi) >> 1;
    if (edges[mid]! < confidence) lo = mid + 1;
    else hi = mid;
  }
  return lo;
}

export interface CalibrationBin {
  /** Printed range, e.g. "0.1-0.2". */
  band: string;
  lower: number;
  upper: number;
  count: number;
  /** Outcomes that were positive (for suggestions: accepted). */
  positives: number;
  /** positives / count; null for an empty bin. */
  rate: number | null;
  meanConfidence: number | null;
}

/** Every bin, empty ones included, in order. */
export function calibrationTable(confidences: readonly number[], outcomes: readonly boolean[], bins = DEFAULT_BINS): CalibrationBin[] {
  checkBins(bins);
  if (confidences.length !== outcomes.length) {
    throw new RangeError(`${confidences.length} confidences but ${outcomes.length} outcomes`);
  }
  const count = new Array<number>(bins).fill(0);
  const positives = new Array<number>(bins).fill(0);
  const sum = new Array<number>(bins).fill(0);
  confidences.forEach((c, i) => {
    const b = confidenceBin(c, bins);
    count[b]++;
    sum[b] += c;
    if (outcomes[i]) positives[b]++;
  });
  const digits = Math.max(1, Math.ceil(Math.log10(bins)));
  return count.map((n, b) => ({
    band: `${(b / bins).toFixed(digits)}-${((b + 1) / bins).toFixed(digits)}`,
    lower: b / bins,
    upper: (b + 1) / bins,
    count: n,
    positives: positives[b]!,
    rate: n > 0 ? positives[b]! / n : null,
    meanConfidence: n > 0 ? sum[b]! / n : null,
  }));
}

/**
 * Expected calibration error: sum over bins of (n_b / N) |accuracy_b - mean confidence_b|, with
 * equal-width bins (Naeini, Cooper and Hauskrecht 2015; Guo et al. 2017). 0 for a perfectly
 * calibrated model; null when there are no outcomes.
 */
export function expectedCalibrationError(confidences: readonly number[], outcomes: readonly boolean[], bins = DEFAULT_BINS): number | null {
  const table = calibrationTable(confidences, outcomes, bins);
  const N = confidences.length;
  if (N === 0) return null;
  let ece = 0;
  for (const b of table) if (b.count > 0) ece += (b.count / N) * Math.abs(b.rate! - b.meanConfidence!);
  return ece;
}
