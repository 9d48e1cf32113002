import { describe, expect, it } from 'vitest';
import { templateGrowth, type GrowthTheme, type TranscriptStart } from '../../src/measure/growth.js';

// Bookkeeping, not a statistic: the expected counts are worked by hand beside each check.
const theme = (id: string, path: string, addedAt: string): GrowthTheme => ({ id, path, topLevel: !path.includes(' > '), addedAt });
const BEFORE = '2024-01-10T09:00:00Z'; // the initial template, before any coding

const THEMES: GrowthTheme[] = [
  theme('t1', 'Workload', BEFORE),
  theme('t2', 'Workload > Staffing', BEFORE),
  theme('t3', 'Wellbeing', BEFORE), // a priori, never coded: not on the curve
  theme('t4', 'Management', '2024-01-12T10:00:00Z'), // added while int-02 is coded ...
  theme('t5', 'Management > Style', '2024-01-12T11:00:00Z'), // ... and coded later, in int-04
  theme('t6', 'Training', '2024-01-13T08:00:00Z'), // added exactly when int-03 starts: credited to int-03
];

// Given out of coding order on purpose.
const TRANSCRIPTS: TranscriptStart[] = [
  { transcript: 'int-03', firstCodedAt: '2024-01-13T08:00:00Z' },
  { transcript: 'int-01', firstCodedAt: '2024-01-11T09:00:00Z' },
  { transcript: 'int-02', firstCodedAt: '2024-01-12T09:00:00Z' },
  { transcript: 'int-04', firstCodedAt: '2024-01-14T09:00:00Z' },
];

const CODED = [
  { themeId: 't2', transcript: 'int-02' },
  { themeId: 't2', transcript: 'int-01' }, // first coded in int-01 (earlier in coding order)
  { themeId: 't1', transcript: 'int-02' },
  { themeId: 't5', transcript: 'int-04' }, // added during int-02: that comes first
  { themeId: 't6', transcript: 'int-03' },
  { themeId: 'gone', transcript: 'int-01' }, // a theme no longer in the template
  { themeId: 't1', transcript: 'elsewhere' }, // a transcript not coded: ignored
];

describe('templateGrowth', () => {
  const r = templateGrowth({ themes: THEMES, transcripts: TRANSCRIPTS, coded: CODED });

  it('credits each theme to the first transcript that coded it or was being coded when it was added', () => {
    expect(r.curve.map((p) => [p.transcript, p.order, p.new_themes, p.new_sub_themes, p.cumulative])).toEqual([
      ['int-01', 1, 0, 1, 1], // Workload > Staffing, first coded here (initial template)
      ['int-02', 2, 2, 1, 4], // Workload (coded), Management, Management > Style (added)
      ['int-03', 3, 1, 0, 5], // Training: added at the moment int-03 began
      ['int-04', 4, 0, 0, 5],
    ]);
    expect(r.curve[1]!.entered.map((e) => [e.path, e.how])).toEqual([
      ['Workload', 'coded'],
      ['Management', 'added'],
      ['Management > Style', 'added'],
    ]);
  });

  it('reports the initial themes no passage carries yet apart, and carries the caveat', () => {
    expect(r.not_yet_coded).toEqual([{ id: 't3', path: 'Wellbeing', topLevel: true }]);
    expect(r.curve.at(-1)!.cumulative + r.not_yet_coded.length).toBe(THEMES.length);
    expect(r.note).toMatch(/not proof that the template is complete/);
  });

  it('has no curve before coding, and refuses a bad timestamp', () => {
    expect(templateGrowth({ themes: THEMES, transcripts: [], coded: [] }).curve).toEqual([]);
    expect(() => templateGrowth({ themes: THEMES, transcripts: [{ transcript: 'x', firstCodedAt: 'soon' }], coded: [] })).toThrow(/not an ISO 8601/);
  });
});
