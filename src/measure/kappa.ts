/** Two coders, nominal labels: percent agreement and Cohen's kappa. */

import { defined, undefinedBecause, type Coefficient, type Label } from './coefficient.js';

function checkPair(a: readonly Label[], b: readonly Label[]): void {
  if (a.length !== b.length) {
    throw new RangeError(`the two coders' label lists differ in length (${a.length} and ${b.length})`);
  }
}

/** Share of units on which the two coders gave the same label; null when there are no units. */
export function percentAgreement(a: readonly Label[], b: readonly Label[]): number | null {
  checkPair(a, b);
  if (a.length === 0) return null;
  let same = 0;
  for (let i = 0; i < a.length; i++) if (a[i] === b[i]) same++;
  return same / a.length;
}

export interface KappaResult extends Coefficient {
  /** Units compared. */
  n: number;
  /** p_o: observed share of agreement (null when n = 0). */
  observed: number | null;
  /** p_e: agreement expected from the two coders' own label frequencies (null when n = 0). */
  expected: number | null;
}

/**
 * Cohen's kappa, (p_o - p_e) / (1 - p_e), with p_e from each coder's marginal label frequencies
 * (Cohen 1960). Labels are compared with ===, so 1 and '1' are different labels.
 *
 * Undefined (value null) when p_e = 1, which happens exactly when both coders gave one and the
 * same label to every unit: for a theme, both say "absent" everywhere. That is common for a rare
 * theme and is reported as such rather than as a number.
 */
export function cohensKappa(a: readonly Label[], b: readonly Label[]): KappaResult {
  checkPair(a, b);
  const n = a.length;
  if (n === 0) return { ...undefinedBecause('no units to compare'), n, observed: null, expected: null };
  const countA = new Map<Label, number>();
  const countB = new Map<Label, number>();
  let same = 0;
  for (let i = 0; i < n; i++) {
    const x = a[i]!;
    const y = b[i]!;
    countA.set(x, (countA.get(x) ?? 0) + 1);
    countB.set(y, (countB.get(y) ?? 0) + 1);
    if (x === y) same++;
  }
  const observed = same / n;
  let expected = 0;
  for (const [label, ca] of countA) expected += (ca / n) * ((countB.get(label) ?? 0) / n);
  if (countA.size === 1 && countB.size === 1 && countA.keys().next().value === countB.keys().next().value) {
    return {
      ...undefinedBecause('both coders gave the same single label to every unit, so agreement expected by chance is 1'),
      n,
      observed,
      expected: 1,
    };
  }
  return { ...defined((observed - expected) / (1 - expected)), n, observed, expected };
}
