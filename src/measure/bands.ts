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

/** Krippendorff's own guidance for alpha: which values to rely on. */
export interface AlphaGuidance {
  label: 'reliable' | 'tentative' | 'unreliable';
  /** The rule as Krippendorff states it. */
  rule: string;
  /** Lower bound, inclusive. */
  from: number;
}

export const KRIPPENDORFF_GUIDANCE: readonly AlphaGuidance[] = [
  { label: 'reliable', rule: 'at least 0.800: rely on the theme', from: 0.8 },
  { label: 'tentative', rule: '0.667 to below 0.800: tentative conclusions only', from: 0.667 },
  { label: 'unreliable', rule: 'below 0.667: do not rely on the theme', from: -Infinity },
];

// The thresholds (0.800; 0.667 for tentative conclusions) as Krippendorff states them in this
// book's chapter on reliability; bibliographic details and the wording recalled from memory.
export const KRIPPENDORFF_SOURCE =
  'Krippendorff, K. (2004). Content analysis: An introduction to its methodology (2nd ed.). Sage: rely on variables with alpha of at least .800; consider those between .667 and .800 only for tentative conclusions.';

/** Krippendorff's label for an alpha; null for an undefined coefficient. */
export function alphaGuidance(value: number | null): AlphaGuidance['label'] | null {
  if (value === null || Number.isNaN(value)) return null;
  // The same hair of tolerance as the bands: 0.8 computed as 0.7999999999999999 is on the bound.
  for (const g of KRIPPENDORFF_GUIDANCE) if (value >= g.from - 1e-12) return g.label;
  return 'unreliable';
}

/** Said wherever a coder is compared with the suggestions (the pseudo-coder "trellis"). */
export const CIRCULARITY_NOTE =
  'Agreement between a coder and the suggestions is partly circular: codings the coder made by ' +
  'accepting a suggestion agree with it by construction, and the profiles were fitted on that ' +
  'coder\'s own earlier codings. Read it as how far the suggestions track the coder, not as ' +
  'independent inter-coder agreement.';

export const AGREEMENT_CAUTION =
  'Agreement figures support, but do not replace, the team\'s discussion of the passages on which ' +
  'coders disagreed: what each coder understood by the theme, and whether its definition needs ' +
  'revising. The bands are conventions, not tests, and a rare theme can show low kappa with high ' +
  'percent agreement.';
