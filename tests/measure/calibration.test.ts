import { describe, expect, it } from 'vitest';
import { calibrationTable, confidenceBin, expectedCalibrationError } from '../../src/measure/calibration.js';
import { referenceJson } from './reference.js';

interface Case {
  name: string;
  bins: number;
  confidences: number[];
  outcomes: boolean[];
  nonempty_bins: number[];
  counts: number[];
  prob_true: number[];
  prob_pred: number[];
  ece: number;
}
const cases = referenceJson<{ cases: Case[] }>('calibration.json').cases;

describe('expectedCalibrationError', () => {
  it('matches a hand-worked example', () => {
    // Hand-worked, 8 decisions in 10 equal-width bins:
    //   bin 0.0-0.1: {0.05: no}              acc 0,   conf 0.05 -> |0 - 0.05|     = 0.05, weight 1/8
    //   bin 0.1-0.2: {0.15: no, 0.15: yes}   acc 0.5, conf 0.15 -> 0.35,                weight 2/8
    //   bin 0.4-0.5: {0.45: no, yes, yes}    acc 2/3, conf 0.45 -> 0.21667,             weight 3/8
    //   bin 0.8-0.9: {0.85: yes}             acc 1,   conf 0.85 -> 0.15,                weight 1/8
    //   bin 0.9-1.0: {0.95: yes}             acc 1,   conf 0.95 -> 0.05,                weight 1/8
    //   ECE = (0.05 + 2 * 0.35 + 3 * 0.21667 + 0.15 + 0.05) / 8 = (0.05 + 0.70 + 0.65 + 0.15 + 0.05) / 8 = 0.2
    const conf = [0.05, 0.15, 0.15, 0.45, 0.45, 0.45, 0.85, 0.95];
    const out = [false, false, true, false, true, true, true, true];
    expect(expectedCalibrationError(conf, out)).toBeCloseTo(0.2, 12);
    // The same example through the reference script (scikit-learn's calibration_curve).
    expect(cases.find((c) => c.name === 'hand-worked example')!.ece).toBeCloseTo(0.2, 12);
  });

  // Source: scikit-learn 1.2.1 calibration_curve (uniform bins) with numpy bin counts, via
  // tests/reference/measure/make_calibration_fixtures.py.
  it.each(cases.map((c) => [c.name, c] as const))('matches scikit-learn\'s calibration_curve: %s', (_, c) => {
    expect(expectedCalibrationError(c.confidences, c.outcomes, c.bins)!).toBeCloseTo(c.ece, 12);
    const table = calibrationTable(c.confidences, c.outcomes, c.bins);
    expect(table.map((b) => b.count)).toEqual(c.counts);
    const nonempty = table.filter((b) => b.count > 0);
    expect(nonempty.length).toBe(c.nonempty_bins.length);
    nonempty.forEach((b, i) => {
      expect(b.rate!).toBeCloseTo(c.prob_true[i]!, 12);
      expect(b.meanConfidence!).toBeCloseTo(c.prob_pred[i]!, 12);
    });
  });

  it('is null with no decisions and refuses confidences outside [0, 1]', () => {
    expect(expectedCalibrationError([], [])).toBeNull();
    expect(() => expectedCalibrationError([1.2], [true])).toThrow(RangeError);
    expect(() => expectedCalibrationError([0.5], [])).toThrow(RangeError);
  });
});

describe('confidenceBin', () => {
  it('closes bins on the right and the first on both sides, as scikit-learn does', () => {
    expect(confidenceBin(0)).toBe(0);
    expect(confidenceBin(0.1)).toBe(0);
    expect(confidenceBin(0.1000001)).toBe(1);
    expect(confidenceBin(0.5)).toBe(4);
    expect(confidenceBin(1)).toBe(9);
  });

  it('labels the bands', () => {
    expect(calibrationTable([], []).map((b) => b.band)).toEqual([
      '0.0-0.1', '0.1-0.2', '0.2-0.3', '0.3-0.4', '0.4-0.5', '0.5-0.6', '0.6-0.7', '0.7-0.8', '0.8-0.9', '0.9-1.0',
    ]);
  });
});
