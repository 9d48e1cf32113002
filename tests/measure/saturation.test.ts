import { describe, expect, it } from 'vitest';
import { saturationCurve, type RevisionRecord, type TranscriptStart } from '../../src/measure/saturation.js';

// Bookkeeping, not a statistic: the expected counts are worked by hand beside each check.
const added = (id: string, path: string) => ({ kind: 'added', id, path });

const REVISIONS: RevisionRecord[] = [
  // Initial template, before any coding: 2 themes, 1 sub-theme.
  { rev: 1, created_at: '2024-01-10T09:00:00Z', changes: [added('t1', 'Workload'), added('t2', 'Wellbeing'), added('t3', 'Workload > Staffing')] },
  // While int-01 is being coded: 1 sub-theme, plus a rename that adds nothing.
  { rev: 2, created_at: '2024-01-11T12:00:00Z', changes: [added('t4', 'Wellbeing > Stress'), { kind: 'renamed', id: 't1', path: undefined }] },
  // Still int-01: a new theme with a sub-sub-theme.
  { rev: 3, created_at: '2024-01-11T15:00:00Z', changes: [added('t5', 'Management'), added('t6', 'Management > Style > Distant')] },
  // Exactly when int-03 starts: credited to int-03 (first coding at or before the revision).
  { rev: 4, created_at: '2024-01-13T08:00:00Z', changes: [added('t7', 'Training')] },
  // A split: the source is reshaped, its two parts are reported as added.
  { rev: 5, created_at: '2024-01-13T10:00:00Z', changes: [{ kind: 'split', id: 't7' }, added('t8', 'Training > Formal'), added('t9', 'Training > Informal')] },
];

// Given out of coding order on purpose; int-02 brings nothing new.
const TRANSCRIPTS: TranscriptStart[] = [
  { transcript: 'int-03', firstCodedAt: '2024-01-13T08:00:00Z' },
  { transcript: 'int-01', firstCodedAt: '2024-01-11T09:00:00Z' },
  { transcript: 'int-02', firstCodedAt: '2024-01-12T09:00:00Z' },
  { transcript: 'int-04', firstCodedAt: '2024-01-14T09:00:00Z' },
];

describe('saturationCurve', () => {
  const r = saturationCurve(REVISIONS, TRANSCRIPTS);

  it('puts the initial template apart', () => {
    expect(r.beforeCoding.themes).toBe(2);
    expect(r.beforeCoding.subThemes).toBe(1);
  });

  it('credits each revision to the transcript most recently begun, in coding order', () => {
    expect(r.curve.map((p) => [p.transcript, p.order, p.newThemes, p.newSubThemes])).toEqual([
      ['int-01', 1, 1, 2], // rev 2 (Stress), rev 3 (Management; Management > Style > Distant)
      ['int-02', 2, 0, 0],
      ['int-03', 3, 1, 2], // rev 4 (Training), rev 5 (Formal, Informal)
      ['int-04', 4, 0, 0],
    ]);
    expect(r.curve[0]!.added.map((a) => a.id)).toEqual(['t4', 't5', 't6']);
  });

  it('accumulates', () => {
    expect(r.curve.map((p) => [p.cumulativeThemes, p.cumulativeSubThemes, p.cumulative])).toEqual([
      [1, 2, 3],
      [1, 2, 3],
      [2, 4, 6],
      [2, 4, 6],
    ]);
  });

  it('does not depend on the order revisions are given in', () => {
    expect(saturationCurve([...REVISIONS].reverse(), TRANSCRIPTS).curve.map((p) => p.cumulative)).toEqual([3, 3, 6, 6]);
  });

  it('compares instants, not strings, across time-zone offsets', () => {
    // 10:30+02:00 is 08:30Z: after int-01 began (08:00Z), so it belongs to int-01.
    const s = saturationCurve(
      [{ created_at: '2024-01-11T10:30:00+02:00', changes: [added('x', 'New')] }],
      [{ transcript: 'int-01', firstCodedAt: '2024-01-11T08:00:00Z' }],
    );
    expect(s.beforeCoding.themes).toBe(0);
    expect(s.curve[0]!.newThemes).toBe(1);
  });

  it('rejects a time that is not a timestamp', () => {
    expect(() => saturationCurve([], [{ transcript: 'a', firstCodedAt: 'soon' }])).toThrow(RangeError);
  });
});
