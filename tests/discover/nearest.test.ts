import { describe, expect, it } from 'vitest';
import { byNovelty, clusterNearness } from '../../src/discover/nearest.js';
import { scoreTable } from './scores.js';

// Invented: three unclaimed passages of a hospital-handover study and their confidences
// (t6#1 barely fits anything: 0 for staff).
const table = scoreTable(['staff', 'tools'], [
  { id: 't5#1', conf: { staff: 0.4, tools: 0.1 } },
  { id: 't5#2', conf: { staff: 0.2, tools: 0.3 } },
  { id: 't6#1', conf: { tools: 0.05 } },
]);
const scores = new Map(table.passages.map((s) => [s.passageId, s]));
const noneFits = new Map([
  ['t5#1', 0.6],
  ['t5#2', 0.7],
  ['t6#1', 0.95],
]);

describe('a cluster\'s nearest theme', () => {
  it('is the theme of the highest mean confidence over the members, with the share it comes first', () => {
    const n = clusterNearness(['t5#1', 't5#2', 't6#1'], { scores, themes: table, noneFits });
    // staff: (0.4 + 0.2 + 0) / 3 = 0.2; tools: (0.1 + 0.3 + 0.05) / 3 = 0.15.
    expect(n.themeId).toBe('staff');
    expect(n.closeness).toBeCloseTo(0.2, 12);
    expect(n.topShare).toBeCloseTo(1 / 3, 12);
    expect(n.novelty).toBeCloseTo((0.6 + 0.7 + 0.95) / 3, 12);
    expect(clusterNearness(['t6#1'], { scores, themes: table, noneFits }).themeId).toBe('tools');
    expect(clusterNearness(['x#1'], { scores, themes: table, noneFits })).toEqual({ themeId: null, closeness: 0, topShare: 0, novelty: 1 });
  });

  it('settles equal means by the share of members a theme comes first for, then by theme id', () => {
    const tie = scoreTable(['a', 'b'], [
      { id: 'm#1', conf: { a: 0.5, b: 0.1 } },
      { id: 'm#2', conf: { a: 0.1, b: 0.3 } },
      { id: 'm#3', conf: { a: 0.1, b: 0.3 } },
      { id: 'm#4', conf: { a: 0.2, b: 0.2 } },
    ]);
    const byId = new Map(tie.passages.map((s) => [s.passageId, s]));
    // a and b both sum to 0.7 over m#1..m#3; b comes first for two of them.
    const n = clusterNearness(['m#1', 'm#2', 'm#3'], { scores: byId, themes: tie, noneFits: new Map() });
    expect([n.themeId, n.topShare]).toEqual(['b', 2 / 3]);
    // One member with equal confidences: its best is the first id, and so is the nearest theme.
    expect(clusterNearness(['m#4'], { scores: byId, themes: tie, noneFits: new Map() })).toMatchObject({ themeId: 'a', topShare: 1 });
  });

  it('sorts clusters most novel first, then the larger', () => {
    const sorted = byNovelty([
      { id: 'a', novelty: 0.6, size: 9 },
      { id: 'b', novelty: 0.9, size: 3 },
      { id: 'c', novelty: 0.6, size: 12 },
    ]);
    expect(sorted.map((x) => x.id)).toEqual(['b', 'c', 'a']);
  });
});
