import { describe, expect, it } from 'vitest';
import { claimingThemes, isSubstantive, substantiveCheck, topicTerms, unclaimedPool } from '../../src/discover/pool.js';
import type { PoolCandidate } from '../../src/discover/types.js';
import { scoreTable } from './scores.js';

// All passages and themes here are invented. The template:
//   Workload > Staffing, Workload > Admin, Support (a root with no sub-theme: a leaf).
const THEMES = [
  { id: 'work', parentId: null },
  { id: 'staff', parentId: 'work' },
  { id: 'admin', parentId: 'work' },
  { id: 'support', parentId: null },
];

const TALK = ['rota', 'short', 'staff', 'shift', 'cover', 'agency', 'nurse', 'ward', 'night'];

function passage(id: string, terms: string[] = TALK, role: 'participant' | 'interviewer' = 'participant'): PoolCandidate {
  return { id, transcript: id.split('#')[0]!, speaker: role === 'participant' ? 'P' : 'Interviewer', role, terms, words: terms.length * 2 };
}


describe('substantive passages', () => {
  it('needs a participant, 7 topic lemmas and less than half small talk', () => {
    expect(substantiveCheck({ role: 'interviewer', terms: TALK })).toBe('interviewer');
    expect(substantiveCheck({ role: 'participant', terms: TALK.slice(0, 6) })).toBe('short');
    expect(substantiveCheck({ role: 'participant', terms: TALK.slice(0, 7) })).toBeNull();
    // Small talk does not count towards the 7: "thank", "laugh", "fine" and "i'm" are not topic.
    expect(substantiveCheck({ role: 'participant', terms: [...TALK.slice(0, 6), 'thank', "i'm"] })).toBe('short');
    const chatty = ['thank', 'lovely', 'laugh', 'fine', 'sure', 'great', 'cheers', 'sorry', ...TALK.slice(0, 7)];
    expect(substantiveCheck({ role: 'participant', terms: chatty })).toBe('small-talk');
    expect(isSubstantive({ role: 'participant', terms: chatty.slice(2) })).toBe(true); // 6 of 13
  });

  it('takes other limits', () => {
    expect(isSubstantive({ role: 'participant', terms: TALK.slice(0, 3) }, { minTerms: 3 })).toBe(true);
    expect(isSubstantive({ role: 'participant', terms: ['thank', ...TALK] }, { maxSmallTalkShare: 0.1 })).toBe(false);
  });

  it('strips pronoun contractions and small talk only', () => {
    expect(topicTerms(["i'm", 'rota', 'laugh', "that\u2019s", "'s", 'problem', "o'clock"])).toEqual(['rota', 'problem', "o'clock"]);
  });
});

describe('the unclaimed pool', () => {
  it('claims at the levels coders code at: leaves, and parents coded directly', () => {
    expect([...claimingThemes(THEMES, [])].sort()).toEqual(['admin', 'staff', 'support']);
    expect([...claimingThemes(THEMES, [{ passageId: 'x', themeId: 'work' }, { passageId: 'x', themeId: 'gone' }])].sort()).toEqual(['admin', 'staff', 'support', 'work']);
  });

  const passages = [
    passage('t1#1', ['tell', 'day'], 'interviewer'),
    passage('t1#2'), // coded
    passage('t1#3'), // a theme fits: claimed
    passage('t1#4'), // the parent clears its (low) threshold, but no theme is likely: unclaimed
    passage('t1#5', [...TALK, 'laugh']), // nothing clears
    passage('t1#6', TALK.slice(0, 3)), // short
    passage('t1#7'), // not scored
    passage('t1#8'), // its only leaf above threshold was rejected
  ];
  const codings = [{ passageId: 't1#2', themeId: 'staff' }];
  const rejected = [{ passageId: 't1#8', themeId: 'staff' }];
  const thresholds = { staff: 0.7, admin: 0.6, support: 0.5, work: 0.4 };
  const ROWS = [
    { id: 't1#2', conf: { staff: 0.9 } },
    { id: 't1#3', conf: { work: 0.95, staff: 0.8, support: 0.1 } },
    { id: 't1#4', conf: { work: 0.45, admin: 0.35, staff: 0.3 } }, // "work" clears its threshold
    { id: 't1#5', conf: { work: 0.2, support: 0.4, admin: 0.1 } },
    { id: 't1#8', conf: { staff: 0.75, admin: 0.2 } },
  ];
  const ids = THEMES.map((t) => t.id);
  const scores = scoreTable(ids, ROWS, thresholds);

  it('leaves out passages judged "nothing to code", after the coded ones', () => {
    const r = unclaimedPool({ passages, scores, themes: THEMES, codings, rejected, thresholds, nothingToCode: ['t1#5', 't1#2'] });
    expect(r.pool.map((p) => p.id)).toEqual(['t1#4', 't1#8']);
    const why = Object.fromEntries(r.excluded.map((e) => [e.id, e.reason]));
    expect([why['t1#5'], why['t1#2']]).toEqual(['nothing-to-code', 'coded']);
    expect(r.counts['nothing-to-code']).toBe(1);
  });

  it('keeps substantive, uncoded, unclaimed participant passages, with the theme that came nearest', () => {
    const r = unclaimedPool({ passages, scores, themes: THEMES, codings, rejected, thresholds });
    expect(r.pool.map((p) => p.id)).toEqual(['t1#4', 't1#5', 't1#8']);
    const [four, five, eight] = r.pool;
    expect(four!.nearest).toEqual({ themeId: 'admin', confidence: 0.35, threshold: 0.6 });
    expect(four!.noneFits).toBeCloseTo(0.55, 12);
    expect(four!.clearedParents).toEqual(['work']);
    expect(five!.nearest).toEqual({ themeId: 'support', confidence: 0.4, threshold: 0.5 });
    expect(five!.clearedParents).toEqual([]);
    expect(five!.terms).toEqual(TALK); // topic lemmas: "laugh" is gone
    // The rejected theme no longer counts, not even as the nearest.
    expect(eight!.nearest).toEqual({ themeId: 'admin', confidence: 0.2, threshold: 0.6 });
    expect(four!.words).toBe(TALK.length * 2);
    expect(Object.fromEntries(r.excluded.map((e) => [e.id, e.reason]))).toEqual({
      't1#1': 'interviewer',
      't1#2': 'coded',
      't1#3': 'claimed',
      't1#6': 'short',
      't1#7': 'not-scored',
    });
    expect(r.counts).toEqual({ interviewer: 1, short: 1, 'small-talk': 0, coded: 1, 'nothing-to-code': 0, claimed: 1, 'not-scored': 1, unclaimed: 3 });
  });

  it('counts a parent coded directly as a coded level, and lets it claim when the sub-theme chosen over it is rejected', () => {
    const r = unclaimedPool({ passages, scores, themes: THEMES, codings: [...codings, { passageId: 't9#1', themeId: 'work' }], rejected, thresholds });
    expect(r.pool.map((p) => p.id)).toEqual(['t1#4', 't1#5', 't1#8']);
    // "work" is now a level coders code at: the nearest theme, not a parent cleared through its sub-themes.
    expect(r.pool[0]!.nearest).toEqual({ themeId: 'work', confidence: 0.45, threshold: 0.4 });
    expect(r.pool[0]!.clearedParents).toEqual([]);
    // t1#9: "staff" was chosen (it hid its parent) but rejected; "work", above threshold, claims.
    const more = unclaimedPool({
      passages: [...passages, passage('t1#9')],
      scores: scoreTable(ids, [...ROWS, { id: 't1#9', conf: { work: 0.9, staff: 0.8 } }], thresholds),
      themes: THEMES,
      codings: [...codings, { passageId: 't9#1', themeId: 'work' }],
      rejected: [...rejected, { passageId: 't1#9', themeId: 'staff' }],
    });
    expect(more.excluded.find((e) => e.id === 't1#9')?.reason).toBe('claimed');
  });
});
