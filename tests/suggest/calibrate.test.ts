import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { chooseThreshold, precisionRecallAt } from '../../src/suggest/thresholds.js';
import { sigmoid } from '../../src/math/sigmoid.js';
import { fitGrouped } from '../../src/suggest/logistic.js';

const fx = JSON.parse(readFileSync(new URL('../reference/calibration.json', import.meta.url), 'utf8'));

describe('thresholds for a target precision', () => {
  const conf = [0.95, 0.9, 0.85, 0.8, 0.7, 0.6, 0.5, 0.4, 0.3, 0.2];
  const y = [1, 1, 1, 0, 1, 0, 1, 0, 0, 0];
  it('takes the lowest cut whose precision reaches the target', () => {
    // cut at 0.7: 4 of 5 = 0.8 >= 0.75; at 0.5: 5 of 7 = 0.714 < 0.75
    const c = chooseThreshold(conf, y, 0.75);
    expect(c).toEqual({ threshold: 0.7, precision: 0.8, recall: 0.8, reached: true });
    expect(precisionRecallAt(conf, y, 0.5)).toEqual({ precision: 5 / 7, recall: 1 });
  });
  it('falls back to the target itself when no cut reaches it', () => {
    const c = chooseThreshold([0.9, 0.8, 0.7], [0, 1, 0], 0.9);
    expect(c.reached).toBe(false);
    expect(c.threshold).toBe(0.9);
  });
});

describe('shared-weight logistic regression', () => {
  it('recovers a known weight from noiseless-ish data', () => {
    // y = 1 exactly when 2x - 1 + b_g > 0 for a deterministic grid: the fit separates the groups.
    const xs: number[] = [];
    const ys: number[] = [];
    const gs: number[] = [];
    for (let g = 0; g < 2; g++)
      for (let i = 0; i < 200; i++) {
        const x = -3 + (6 * i) / 199;
        const p = sigmoid(1.5 * x + (g ? 1 : -1));
        // deterministic "sampling": a fixed pseudo-random sequence
        const u = ((i * 7919 + g * 104729) % 1000) / 1000;
        xs.push(x);
        ys.push(u < p ? 1 : 0);
        gs.push(g);
      }
    const m = fitGrouped({ x: Float64Array.from(xs), k: 1, y: Uint8Array.from(ys), group: Int32Array.from(gs), groups: 2 }, 1e-6, 1e-6);
    expect(m.weights[0]).toBeGreaterThan(1);
    expect(m.weights[0]).toBeLessThan(2.2);
    expect(m.intercepts[1]! - m.intercepts[0]!).toBeGreaterThan(1);
  });
});
