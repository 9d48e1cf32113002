import { describe, expect, it } from 'vitest';
import { acceptanceReport, type DecisionRecord } from '../../src/measure/acceptance.js';
import { expectedCalibrationError } from '../../src/measure/calibration.js';
import { referenceJson } from './reference.js';

const d = (over: Partial<DecisionRecord>): DecisionRecord => ({
  action: 'accept',
  themeId: 'W',
  confidence: 0.8,
  rank: 1,
  transcript: 'int-01',
  coder: 'ana',
  at: '2024-03-01T10:00:00.000Z',
  ...over,
});

// A small log, hand-counted in the comments below.
const LOG: DecisionRecord[] = [
  d({ action: 'accept', themeId: 'W', confidence: 0.92, at: '2024-03-01T09:00:00.000Z' }),
  d({ action: 'reject', themeId: 'W', confidence: 0.55, at: '2024-03-01T09:05:00.000Z' }),
  d({ action: 'recode', themeId: 'W', chosenThemeId: 'S', confidence: 0.61, at: '2024-03-01T09:10:00.000Z', rank: 2 }),
  d({ action: 'defer', themeId: 'S', confidence: 0.4, at: '2024-03-01T09:15:00.000Z' }),
  d({ action: 'accept', themeId: 'S', confidence: 0.71, at: '2024-03-02T14:00:00.000Z', transcript: 'int-02', coder: 'ben' }),
  d({ action: 'recode', themeId: 'W', chosenThemeId: 'S', confidence: 0.33, at: '2024-03-02T14:01:00.000Z', transcript: 'int-02', coder: 'ben', rank: 2 }),
  d({ action: 'accept', themeId: 'M', confidence: 0.95, at: '2024-03-02T14:02:00.000Z', transcript: 'int-02', coder: 'ben', bulk: true }),
  d({ action: 'recode', themeId: 'M', chosenThemeId: 'W', confidence: 0.52, at: '2024-03-02T14:03:00.000Z', transcript: 'int-02', coder: 'ben' }),
];

describe('acceptanceReport', () => {
  const r = acceptanceReport(LOG);

  it('counts accepted / decided with defers left out', () => {
    // 8 decisions: 3 accept, 1 reject, 3 recode, 1 defer -> decided 7, rate 3/7.
    expect(r.overall).toEqual({ decided: 7, accepted: 3, rejected: 1, recoded: 3, deferred: 1, rate: 3 / 7 });
  });

  it('groups by theme, transcript, coder and rank', () => {
    // W: accept, reject, recode, recode -> 1/4. S: defer, accept -> 1/1. M: accept, recode -> 1/2.
    expect(r.perTheme.map((g) => [g.key, g.decided, g.accepted, g.deferred])).toEqual([
      ['M', 2, 1, 0],
      ['S', 1, 1, 1],
      ['W', 4, 1, 0],
    ]);
    expect(r.perTranscript.map((g) => [g.key, g.rate])).toEqual([
      ['int-01', 1 / 3],
      ['int-02', 2 / 4],
    ]);
    expect(r.perCoder.map((g) => g.key)).toEqual(['ana', 'ben']);
    expect(r.perRank.map((g) => [g.key, g.decided, g.accepted])).toEqual([
      ['1', 5, 3],
      ['2', 2, 0],
    ]);
  });

  it('follows the rate over days and decision by decision', () => {
    expect(r.perDay.map((g) => [g.day, g.decided, g.accepted, g.deferred])).toEqual([
      ['2024-03-01', 3, 1, 1],
      ['2024-03-02', 4, 2, 0],
    ]);
    // Decided, in time order: A R C | A C A C -> cumulative accepted 1 1 1 2 2 3 3.
    expect(r.cumulative.map((p) => p.accepted)).toEqual([1, 1, 1, 2, 2, 3, 3]);
    expect(r.cumulative.map((p) => p.index)).toEqual([1, 2, 3, 4, 5, 6, 7]);
    expect(r.cumulative[6]!.rate).toBeCloseTo(3 / 7, 12);
  });

  it('orders by time whatever order the log comes in', () => {
    const shuffled = [...LOG].reverse();
    expect(acceptanceReport(shuffled).cumulative.map((p) => p.accepted)).toEqual([1, 1, 1, 2, 2, 3, 3]);
  });

  it('tabulates re-codes: suggested x chosen', () => {
    expect(r.recodes).toEqual([
      { themeId: 'W', chosenThemeId: 'S', count: 2 },
      { themeId: 'M', chosenThemeId: 'W', count: 1 },
    ]);
  });

  it('builds the calibration table over decided suggestions', () => {
    // Decided confidences: 0.92 A, 0.55 R, 0.61 C, 0.71 A, 0.33 C, 0.95 A, 0.52 C.
    const band = (label: string) => r.calibration.find((b) => b.band === label)!;
    expect(band('0.9-1.0')).toMatchObject({ count: 2, positives: 2, rate: 1 });
    expect(band('0.9-1.0').meanConfidence).toBeCloseTo(0.935, 12);
    expect(band('0.5-0.6')).toMatchObject({ count: 2, positives: 0, rate: 0 });
    expect(band('0.0-0.1')).toMatchObject({ count: 0, rate: null, meanConfidence: null });
    expect(r.calibration.reduce((s, b) => s + b.count, 0)).toBe(7);
    expect(r.expectedCalibrationError).toBeCloseTo(
      expectedCalibrationError([0.92, 0.55, 0.61, 0.71, 0.33, 0.95, 0.52], [true, false, false, true, false, true, false])!,
      12,
    );
  });

  it('can leave out bulk decisions', () => {
    const nb = acceptanceReport(LOG, { excludeBulk: true });
    expect(r.bulkCounted).toBe(1);
    expect(nb.bulkExcluded).toBe(1);
    expect(nb.overall).toMatchObject({ decided: 6, accepted: 2 });
  });

  it('gives null rates, not NaN, when nothing was decided', () => {
    const only = acceptanceReport([d({ action: 'defer' })]);
    expect(only.overall.rate).toBeNull();
    expect(only.expectedCalibrationError).toBeNull();
    expect(only.cumulative).toEqual([]);
  });

  it('rejects a decision time that is not a timestamp', () => {
    expect(() => acceptanceReport([d({ at: 'yesterday' })])).toThrow(RangeError);
  });

  it('reports the same ECE as scikit-learn\'s calibration curve for a logged run', () => {
    // Source: scikit-learn 1.2.1 calibration_curve via tests/reference/measure/make_calibration_fixtures.py;
    // each (confidence, outcome) becomes an accept or a reject.
    const c = referenceJson<{ cases: { name: string; confidences: number[]; outcomes: boolean[]; ece: number }[] }>('calibration.json').cases.find((x) => x.name === 'over-confident')!;
    const log = c.confidences.map((conf, i) => d({ action: c.outcomes[i] ? 'accept' : 'reject', confidence: conf }));
    expect(acceptanceReport(log).expectedCalibrationError!).toBeCloseTo(c.ece, 12);
  });
});
