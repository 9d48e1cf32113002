/**
 * A chance-corrected coefficient that can be undefined. Kappa and alpha divide by the agreement
 * (or disagreement) expected by chance, which is zero when the data show no variation: then the
 * value is null and `reason` says why, so that no NaN reaches a report or a JSON file.
 */
export interface Coefficient {
  value: number | null;
  /** Why `value` is null; null whenever `value` is a number. */
  reason: string | null;
}

export function defined(value: number): Coefficient {
  return { value, reason: null };
}

export function undefinedBecause(reason: string): Coefficient {
  return { value: null, reason };
}

/** A label a coder gave a unit (a theme id, a category, or 0/1 for absent/present). */
export type Label = string | number;
