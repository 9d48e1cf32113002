import { describe, expect, it } from 'vitest';
import { cohensKappa, percentAgreement } from '../../src/measure/kappa.js';
import { referenceJson } from './reference.js';

interface KappaPair {
  name: string;
  a: (number | string)[];
  b: (number | string)[];
  kappa: number | null;
}
const fixture = referenceJson<{ kappa_pairs: KappaPair[] }>('agreement.json');

describe('cohensKappa', () => {
  // Source: scikit-learn 1.2.1 cohen_kappa_score, via tests/reference/measure/make_agreement_fixtures.py.
  it.each(fixture.kappa_pairs.map((p) => [p.name, p] as const))('matches scikit-learn: %s', (_, p) => {
    const k = cohensKappa(p.a, p.b);
    if (p.kappa === null) {
      expect(k.value).toBeNull();
      expect(k.reason).toMatch(/same single label/);
    } else {
      expect(k.value).not.toBeNull();
      expect(k.value!).toBeCloseTo(p.kappa, 12);
      expect(k.reason).toBeNull();
    }
  });

  it('is worked by hand on a 2 x 2 table', () => {
    // Hand-worked: 10 passages; both present 4, both absent 3, only A 2, only B 1.
    // p_o = 7/10; A present 6/10, B present 5/10; p_e = 0.6*0.5 + 0.4*0.5 = 0.5;
    // kappa = (0.7 - 0.5) / (1 - 0.5) = 0.4.
    const a = [1, 1, 1, 1, 0, 0, 0, 1, 1, 0];
    const b = [1, 1, 1, 1, 0, 0, 0, 0, 0, 1];
    const k = cohensKappa(a, b);
    expect(k.observed).toBeCloseTo(0.7, 12);
    expect(k.expected).toBeCloseTo(0.5, 12);
    expect(k.value).toBeCloseTo(0.4, 12);
  });

  it('returns null, never NaN, when there is nothing to compare', () => {
    const k = cohensKappa([], []);
    expect(k.value).toBeNull();
    expect(k.reason).toBe('no units to compare');
  });

  it('keeps 1 and "1" apart', () => {
    expect(cohensKappa([1, 0] as (number | string)[], ['1', '0']).observed).toBe(0);
  });

  it('rejects lists of different lengths', () => {
    expect(() => cohensKappa([1, 0], [1])).toThrow(RangeError);
  });
});

describe('percentAgreement', () => {
  it('is the share of equal labels', () => {
    // Same hand-worked table as above: 7 of 10 agree.
    expect(percentAgreement([1, 1, 1, 1, 0, 0, 0, 1, 1, 0], [1, 1, 1, 1, 0, 0, 0, 0, 0, 1])).toBeCloseTo(0.7, 12);
    expect(percentAgreement([], [])).toBeNull();
  });
});
