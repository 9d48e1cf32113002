import { describe, expect, it } from 'vitest';
import { chooseQuotes, type QuoteTheme } from '../../src/report/quotes.js';
import { isRoleLabel, looksLikeName, pseudonymiser } from '../../src/report/pseudonyms.js';

const c = (passageId: string, participant: string, score: number, direct = true) => ({ passageId, participant, score, direct });

describe('chooseQuotes', () => {
  // A parent with two sub-themes; participant "ann" said the best passages everywhere.
  const themes: QuoteTheme[] = [
    { id: 'P', depth: 0, candidates: [c('a1', 'ann', 0.9), c('a2', 'ann', 0.8), c('b1', 'ben', 0.7), c('c1', 'cal', 0.2), c('s1', 'ann', 0.95, false)] },
    { id: 'S', depth: 1, candidates: [c('s1', 'ann', 0.95), c('a1', 'ann', 0.9), c('b1', 'ben', 0.5), c('d1', 'dan', 0.1)] },
  ];

  it('takes one quote per participant per theme, and no passage twice, sub-themes first', () => {
    const q = chooseQuotes(themes, [], 3);
    expect(q.get('S')!.map((x) => x.passageId)).toEqual(['s1', 'b1', 'd1']);
    // The parent: a1 (ann), then a2 is ann again, b1 is taken by the sub-theme, so c1; s1 is not
    // the parent's own coding and is shown already.
    expect(q.get('P')!.map((x) => x.passageId)).toEqual(['a1', 'c1']);
  });

  it('puts pins first and never shows a dropped passage', () => {
    const q = chooseQuotes(
      themes,
      [
        { themeId: 'P', passageId: 'b1', choice: 'pin' },
        { themeId: 'P', passageId: 'a1', choice: 'drop' },
        { themeId: 'P', passageId: 'zz', choice: 'pin' }, // no longer coded there: ignored
      ],
      3,
    );
    expect(q.get('P')).toEqual([
      { passageId: 'b1', pinned: true },
      // a1 is dropped, so ann's next best passage may stand for her.
      { passageId: 'a2', pinned: false },
      { passageId: 'c1', pinned: false },
    ]);
    // The sub-theme no longer gets b1: it is on the page under its parent.
    expect(q.get('S')!.map((x) => x.passageId)).toEqual(['s1', 'd1']);
  });
});

describe('pseudonyms', () => {
  it('tells role labels and codes from personal names', () => {
    for (const r of ['Interviewer', 'Participant', 'P01', 'P7', 'Speaker 2', 'R', 'IV', 'Moderator', 'FG1-P3']) expect(isRoleLabel(r), r).toBe(true);
    for (const n of ['Bronwen', 'Mariam', 'Dr Okafor']) expect(looksLikeName(n), n).toBe(true);
    expect(looksLikeName('nurse')).toBe(false); // not capitalised
    expect(looksLikeName(null)).toBe(false);
  });

  it('names by alias, makes codes for the rest, and replaces names in the text as whole words', () => {
    const p = pseudonymiser(
      [
        { kind: 'speaker', name: 'Bronwen', alias: 'P01' },
        { kind: 'transcript', name: 't02-kestrel', alias: 'T01' },
      ],
      ['t01-larch', 't02-kestrel', 't03-harbour'],
      ['Interviewer', 'Bronwen', 'Mariam'],
    );
    expect(p.speaker('Bronwen')).toBe('P01');
    expect(p.speaker('Mariam')).toBe('S01');
    expect(p.speaker('Interviewer')).toBe('Interviewer');
    // T01 is an alias already, so the first transcript gets the next free code.
    expect(p.transcript('t01-larch')).toBe('T02');
    expect(p.transcript('t02-kestrel')).toBe('T01');
    expect(p.transcript('t03-harbour')).toBe('T03');
    expect(p.passage('t01-larch#12')).toBe('T02#12');
    expect(p.text('Thanks, Bronwen. Bronwenny and Mariam’s shift.')).toBe('Thanks, P01. Bronwenny and S01’s shift.');
  });
});
