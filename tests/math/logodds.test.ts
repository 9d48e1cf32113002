import { describe, expect, it } from 'vitest';
import { logOdds } from '../../src/math/logodds.js';

describe('weighted log-odds with an informative Dirichlet prior (Monroe, Colaresi & Quinn 2008)', () => {
  it('is antisymmetric between the two groups', () => {
    const a = logOdds(12, 400, 3, 900, 0.5, 50);
    const b = logOdds(3, 900, 12, 400, 0.5, 50);
    expect(a.delta).toBeCloseTo(-b.delta, 12);
    expect(a.z).toBeCloseTo(-b.z, 12);
  });
  it('tends to the plain log odds ratio as the prior vanishes (eq. 16 with alpha -> 0)', () => {
    const lo = logOdds(12, 400, 3, 900, 1e-9, 1e-7);
    expect(lo.delta).toBeCloseTo(Math.log(12 / 388) - Math.log(3 / 897), 6);
    // eq. 17: variance ~ 1/y_i + 1/y_j
    expect(lo.z).toBeCloseTo(lo.delta / Math.sqrt(1 / 12 + 1 / 3), 6);
  });
  it('shrinks a rare term towards zero more than a common one', () => {
    const rare = logOdds(1, 400, 0, 900, 0.2, 50);
    const common = logOdds(40, 400, 0, 900, 0.2, 50);
    expect(common.z).toBeGreaterThan(rare.z);
    expect(rare.delta).toBeLessThan(Math.log((1 + 0.2) / 399) - Math.log(0.2 / 900) + 1e-9);
  });
});
