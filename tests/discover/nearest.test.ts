import { describe, expect, it } from 'vitest';
import { byNovelty, clusterNearness } from '../../src/discover/nearest.js';

// Invented: three unclaimed passages of a hospital-handover study and their candidates.
const candidates = new Map([
  ['t5#1', [{ themeId: 'staff', confidence: 0.4 }, { themeId: 'tools', confidence: 0.1 }]],
  ['t5#2', [{ themeId: 'staff', confidence: 0.2 }, { themeId: 'tools', confidence: 0.3 }]],
  ['t6#1', [{ themeId: 'tools', confidence: 0.05 }]],
]);
const noneFits = new Map([
  ['t5#1', 0.6],
  ['t5#2', 0.7],
  ['t6#1', 0.95],
]);

describe('a cluster\'s nearest theme', () => {
  it('is the theme of the highest mean confidence over the members, with the share it comes first', () => {
    const n = clusterNearness(['t5#1', 't5#2', 't6#1'], { candidates, noneFits });
    // staff: (0.4 + 0.2 + 0) / 3 = 0.2; tools: (0.1 + 0.3 + 0.05) / 3 = 0.15.
    expect(n.themeId).toBe('staff');
    expect(n.closeness).toBeCloseTo(0.2, 12);
    expect(n.topShare).toBeCloseTo(1 / 3, 12);
    expect(n.novelty).toBeCloseTo((0.6 + 0.7 + 0.95) / 3, 12);
    expect(clusterNearness(['t6#1'], { candidates, noneFits }).themeId).toBe('tools');
    expect(clusterNearness(['x#1'], { candidates, noneFits })).toEqual({ themeId: null, closeness: 0, topShare: 0, novelty: 1 });
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
