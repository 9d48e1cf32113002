import { describe, expect, it } from 'vitest';
import { triage } from '../../src/discover/triage.js';
import type { PoolCandidate } from '../../src/discover/types.js';
import { scoreTable } from './scores.js';

// Invented: t1 is coded; t2 and t3 are not. Words are given explicitly.
const TERMS = ['rota', 'short', 'staff', 'shift', 'cover', 'agency', 'nurse', 'ward'];
const p = (id: string, words: number, role: 'participant' | 'interviewer' = 'participant', terms = TERMS): PoolCandidate => ({
  id,
  transcript: id.split('#')[0]!,
  speaker: role === 'participant' ? 'P' : 'I',
  role,
  terms,
  words,
});
const passages = [
  p('t1#1', 50),
  p('t2#1', 10, 'interviewer'),
  p('t2#2', 100),
  p('t2#3', 300),
  p('t2#4', 40, 'participant', ['thank', 'fine']), // small talk: in neither share
  p('t3#1', 200),
  p('t3#2', 200),
  p('t3#3', 100),
];
// Every chosen theme at 0.9: the order of a transcript's themes is by count, then id.
const s = (id: string, chosen: string[]) => ({ id, conf: Object.fromEntries(chosen.map((t) => [t, 0.9])), chosen });
const scores = scoreTable(['staff', 'pay'], [s('t2#2', ['staff']), s('t2#3', []), s('t3#1', ['staff', 'pay']), s('t3#2', ['pay']), s('t3#3', []), s('t2#1', ['pay'])]);
const none = scoreTable(['staff', 'pay'], []);

describe('triage of uncoded transcripts', () => {
  const out = triage({
    passages,
    done: ['t1#1'],
    scores,
    unclaimed: ['t2#3', 't3#3'],
    clusters: [
      { id: 'C1', passageIds: ['t2#3', 't3#3', 'x#1', 'x#2'] },
      { id: 'C2', passageIds: ['t9#1'] },
    ],
  });

  it('ranks by the unclaimed share of substantive words', () => {
    // t2: 300 of 400 words; t3: 100 of 500.
    expect(out.map((t) => [t.transcript, t.unclaimedShare, t.unclaimedWords, t.substantiveWords, t.unclaimedPassages, t.substantivePassages])).toEqual([
      ['t2', 0.75, 300, 400, 1, 2],
      ['t3', 0.2, 100, 500, 1, 3],
    ]);
  });

  it("gives each transcript's chosen themes and its part of each open cluster", () => {
    expect(out[0]!.themes).toEqual([
      { themeId: 'pay', passages: 1 },
      { themeId: 'staff', passages: 1 },
    ]);
    expect(out[1]!.themes).toEqual([
      { themeId: 'pay', passages: 2 },
      { themeId: 'staff', passages: 1 },
    ]);
    expect(out[0]!.clusters).toEqual([{ clusterId: 'C1', passages: 1, shareOfCluster: 0.25, shareOfTranscript: 0.75 }]);
    expect(out[1]!.clusters).toEqual([{ clusterId: 'C1', passages: 1, shareOfCluster: 0.25, shareOfTranscript: 0.2 }]);
  });

  it('ranks a partly coded transcript by its uncoded part, and leaves out one with nothing left', () => {
    // t3#1 (200 words) is coded and t3#2 judged nothing to code: t3's uncoded part is t3#3
    // alone (100 words, unclaimed), so it ranks first at 100%; t1 has nothing left.
    const partly = triage({ passages, done: ['t1#1', 't3#1', 't3#2'], scores, unclaimed: ['t2#3', 't3#3'], clusters: [] });
    expect(partly.map((t) => [t.transcript, t.unclaimedShare, t.substantiveWords, t.coded_passages, t.partly_coded])).toEqual([
      ['t3', 1, 100, 2, true],
      ['t2', 0.75, 400, 0, false],
    ]);
    // The themes of done passages are not the transcript's open themes.
    expect(partly[0]!.themes).toEqual([]);
  });

  it('breaks ties by unclaimed words, then name', () => {
    const tie = triage({ passages: [p('b#1', 10), p('a#1', 10), p('c#1', 20)], done: [], scores: none, unclaimed: ['a#1', 'b#1', 'c#1'], clusters: [] });
    expect(tie.map((t) => t.transcript)).toEqual(['c', 'a', 'b']);
  });
});
