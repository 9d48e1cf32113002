import { describe, expect, it } from 'vitest';
import { MIN_OVERLAP, reanchor } from '../../src/ingest/reanchor.js';

const p = (id: string, ordinal: number, text: string) => ({ id, ordinal, text });

describe('reanchor: where codings go when a transcript is edited', () => {
  it('follows the same text (case and spacing aside), to the nearest of several', () => {
    const old = [p('a#2', 2, 'We  queue for the tablets.'), p('a#4', 4, 'Thanks.')];
    const fresh = [p('a#1', 1, 'Intro'), p('a#3', 3, 'we queue for the TABLETS.'), p('a#5', 5, 'Thanks.'), p('a#9', 9, 'Thanks.')];
    const m = reanchor(old, fresh);
    expect(m.get('a#2')).toEqual({ to: 'a#3', how: 'same text', share: 1 });
    expect(m.get('a#4')).toEqual({ to: 'a#5', how: 'same text', share: 1 });
  });

  it('moves to the passage sharing most of its words when at least half are there, else leaves it unplaced', () => {
    // A de-identification edit: the name replaced; 7 of the 9 words remain in one passage.
    const old = [p('b#2', 2, 'Bronwen said the banner never shows on nights'), p('b#3', 3, 'completely different words here')];
    const fresh = [p('b#2', 2, 'She said the banner never shows on nights'), p('b#3', 3, 'the banner is red')];
    const m = reanchor(old, fresh);
    // Hand count: old words {bronwen, said, the, banner, never, shows, on, nights} = 8; the first
    // new passage shares 7 of them (all but "bronwen"): 7/8.
    expect(m.get('b#2')).toEqual({ to: 'b#2', how: 'overlap', share: 7 / 8 });
    expect(m.get('b#3')).toBeNull();
  });

  it('needs at least MIN_OVERLAP of the words: just under stays unplaced, at it moves', () => {
    const old = [p('c#1', 1, 'one two three four')];
    expect(MIN_OVERLAP).toBe(0.5);
    expect(reanchor(old, [p('c#1', 1, 'one two five six')]).get('c#1')).toEqual({ to: 'c#1', how: 'overlap', share: 0.5 });
    expect(reanchor(old, [p('c#1', 1, 'one five six seven')]).get('c#1')).toBeNull();
  });
});
