import { describe, expect, it } from 'vitest';
import { discover } from '../../src/discover/discover.js';
import { dismissedIndex, judgeCluster } from '../../src/discover/dismissals.js';
import type { DiscoverItem } from '../../src/discover/types.js';
import { kmeansFixture } from './reference.js';

const ids = (prefix: string, n: number, from = 1) => Array.from({ length: n }, (_, i) => `${prefix}#${i + from}`);

describe('the dismissal rule', () => {
  const dismissed = dismissedIndex([
    { id: 'D1', passageIds: ['a#1', 'a#2', 'a#3', 'a#4', 'a#5', 'a#6', 'a#7'] },
    { id: 'D2', passageIds: ['a#7', 'b#1'] },
  ]);

  it('always shows a cluster with no dismissed passage', () => {
    expect(judgeCluster(ids('c', 2), dismissed)).toEqual({ show: true, dismissedBefore: [], newIds: ['c#1', 'c#2'], dismissalIds: [] });
  });

  it('holds back a cluster of dismissed passages that nothing new joined', () => {
    const v = judgeCluster(ids('a', 7), dismissed);
    expect(v.show).toBe(false);
    expect(v.dismissalIds).toEqual(['D1', 'D2']);
  });

  it('shows it again once at least 3 new passages and 30% of it are new', () => {
    expect(judgeCluster([...ids('a', 7), ...ids('n', 3)], dismissed).show).toBe(true); // 3 of 10
    expect(judgeCluster([...ids('a', 7), ...ids('n', 2)], dismissed).show).toBe(false); // 2 new only
    expect(judgeCluster([...ids('a', 7), 'b#1', ...ids('n', 3)], dismissed).show).toBe(false); // 3 of 11 < 30%
    const v = judgeCluster([...ids('a', 7), ...ids('n', 3)], dismissed, { minNewShare: 0.5 });
    expect(v.show).toBe(false);
    expect(judgeCluster([...ids('a', 2), ...ids('n', 1)], dismissed, { minNew: 1, minNewShare: 0.3 }).show).toBe(true);
  });
});

describe('discover with dismissals', () => {
  const f = kmeansFixture();
  const pool: DiscoverItem[] = f.text.passages.map((p, i) => ({ id: p.id, transcript: `t${(i % 4) + 1}`, speaker: 'P', terms: p.terms }));
  const study = pool.map((p) => p.terms);
  const first = discover(pool, study);
  const rota = first.clusters.find((c) => c.passageIds[0]!.startsWith('rota'))!;
  const dismissals = [{ id: 'D1', passageIds: rota.passageIds }];

  it('does not bring a dismissed cluster back when nothing new joins it', () => {
    const again = discover(pool, study, { dismissals });
    expect(again.clusters.map((c) => c.passageIds[0])).toEqual(['canteen#1', 'parking#1']);
    expect(again.suppressed).toEqual([{ size: 12, passageIds: rota.passageIds, newPassageIds: [], dismissalIds: ['D1'] }]);
    expect(again.dropped).toEqual(rota.passageIds);
    expect(again.unclustered).toEqual([]);
  });

  it('brings it back, flagged, when new material joins it', () => {
    // Eight new rota passages (invented from the same topic words): 8 of 20 = 40% new.
    const words = ['rota', 'shift', 'swap', 'week', 'request', 'leave', 'night', 'roster', 'pattern', 'late'];
    const fresh = Array.from({ length: 8 }, (_, i) => ({
      id: `rota#${100 + i}`,
      transcript: 't9',
      speaker: 'Q',
      terms: Array.from({ length: 7 }, (_, j) => words[(i * 3 + j * 7) % words.length]!),
    }));
    const res = discover([...pool, ...fresh], [...study, ...fresh.map((p) => p.terms)], { dismissals });
    const back = res.clusters.find((c) => c.passageIds.includes('rota#100'))!;
    expect(back.size).toBe(20);
    expect(back.dismissedBefore).toEqual(rota.passageIds);
    expect(res.suppressed).toEqual([]);
    expect(res.dropped).toEqual([]);
  });
});
