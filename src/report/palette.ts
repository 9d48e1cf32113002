/**
 * Colours. Every chart also carries its values as text and tells series apart by marker shape
 * or fill pattern, so colour is never the only cue; the palettes are chosen to stay distinct for
 * the common colour-vision deficiencies and in greyscale print.
 */

/**
 * Categorical colours: the eight-colour set of Okabe, M. & Ito, K. (2008), "Color Universal
 * Design (CUD): How to make figures and presentations that are friendly to colorblind people",
 * as reprinted in Wong, B. (2011), "Points of view: Color blindness", Nature Methods 8:441.
 * (Bibliographic details recalled from memory; the hex values are the published ones.)
 */
export const OKABE_ITO = {
  black: '#000000',
  orange: '#E69F00',
  skyBlue: '#56B4E9',
  bluishGreen: '#009E73',
  yellow: '#F0E442',
  blue: '#0072B2',
  vermillion: '#D55E00',
  reddishPurple: '#CC79A7',
} as const;

/**
 * Single-hue sequential ramp for counts (light = few, dark = many): ColorBrewer "Blues", 7
 * classes, from Harrower, M. & Brewer, C. A. (2003), "ColorBrewer.org: An online tool for
 * selecting colour schemes for maps", The Cartographic Journal 40(1):27-37. Lightness alone
 * carries the order, so the ramp reads in greyscale and for every colour-vision type.
 */
export const BLUES_7 = ['#eff3ff', '#c6dbef', '#9ecae1', '#6baed6', '#4292c6', '#2171b5', '#084594'] as const;

/** Cell colour for zero: lighter than the ramp's first class, so empty cells recede. */
export const ZERO_FILL = '#fbfcfe';

/** Ink and rules of the document. */
export const INK = '#1b2430';
export const MUTED = '#56606b';
export const RULE = '#c9d1da';
export const GRID = '#e6eaef';

/** Text colour that stays legible on a ramp class (white on the three darkest). */
export function inkOn(rampIndex: number): string {
  return rampIndex >= 4 ? '#ffffff' : INK;
}
