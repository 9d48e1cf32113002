/** Words for the size of a kappa or alpha, and the caution that goes with every agreement figure. */

export interface Band {
  label: 'poor' | 'slight' | 'fair' | 'moderate' | 'substantial' | 'almost perfect';
  /** The range as Landis and Koch print it. */
  range: string;
  /** Upper bound: exclusive for 'poor' (values below 0), inclusive for the others. */
  upTo: number;
}

/**
 * Landis and Koch's benchmarks. Their table is printed to two decimals; for values in between,
 * each band runs up to and including its printed upper bound (0.205 is fair), and 0 is slight.
 */
export const LANDIS_KOCH_BANDS: readonly Band[] = [
  { label: 'poor', range: '< 0.00', upTo: 0 },
  { label: 'slight', range: '0.00-0.20', upTo: 0.2 },
  { label: 'fair', range: '0.21-0.40', upTo: 0.4 },
  { label: 'moderate', range: '0.41-0.60', upTo: 0.6 },
  { label: 'substantial', range: '0.61-0.80', upTo: 0.8 },
  { label: 'almost perfect', range: '0.81-1.00', upTo: 1 },
];

// Bibliographic details recalled from memory.
export const LANDIS_KOCH_SOURCE =
  'Landis, J. R., & Koch, G. G. (1977). The measurement of observer agreement for categorical data. Biometrics, 33(1), 159-174.';

/** The band of a kappa or alpha; null for an undefined coefficient. */
export function agreementBand(value: number | null): Band['label'] | null {
  if (value === null || Number.isNaN(value)) return null;
  if (value < 0) return 'poor';
  // A hair of tolerance: 0.6 computed as 0.6000000000000001 is still on the printed bound.
  for (const band of LANDIS_KOCH_BANDS.slice(1)) if (value <= band.upTo + 1e-12) return band.label;
  return 'almost perfect'; // above 1 only through rounding
}

export const AGREEMENT_CAUTION =
  'Agreement figures support, but do not replace, the team\'s discussion of the passages on which ' +
  'coders disagreed: what each coder understood by the theme, and whether its definition needs ' +
  'revising. The bands are conventions, not tests, and a rare theme can show low kappa with high ' +
  'percent agreement.';
