// The review screen with a passage longer than the terminal: a window onto it that the arrow
// keys move, with lines saying what is above and below. Pure: a screen model in, text out.
import { describe, expect, it } from 'vitest';
import { layoutScreen, type ScreenModel, type Style } from '../../src/cli/review-screen.js';

// An invented passage of 40 numbered sentences; each wraps to its own line at this width.
const SENTENCES = Array.from({ length: 40 }, (_, i) => `Sentence ${String(i + 1).padStart(2, '0')} of the long answer about the night handover.`);
const TEXT = SENTENCES.join(' ');
const STYLE: Style = { colour: false, dumb: false, width: 64, rows: 30 };

function model(scroll: number, rows = STYLE.rows): { screen: string; maxScroll: number } {
  const m: ScreenModel = {
    coder: 'ana',
    order: 'transcript',
    filters: [],
    showing: {
      item: { passageId: 't09#4', transcript: 't09', transcriptIndex: 1, ordinal: 4, candidates: [] },
      view: {
        passage: { id: 't09#4', transcript: 't09', ordinal: 4, turn: 2, speaker: 'P', role: 'participant', question: null, start: null, end: null, text: TEXT, words: 400 },
        tokens: { text: TEXT, lemmas: [], spans: new Int32Array(0) },
        before: null,
        after: null,
        passages: 9,
      },
      rejected: new Set(),
      position: 1,
    },
    total: 3,
    remaining: 3,
    accepted: 0,
    decided: 0,
    deferred: 0,
    message: '',
    note: undefined,
    mode: { kind: 'main' },
    matches: [],
    snippets: new Map(),
    scroll,
  };
  return layoutScreen(m, { ...STYLE, rows });
}

const shownSentences = (screen: string) => [...screen.matchAll(/Sentence (\d\d)/g)].map((m) => Number(m[1]));

describe('review: a passage longer than the screen', () => {
  it('shows a window from the start, fitting the rows, and says how much is below', () => {
    const { screen, maxScroll } = model(0);
    expect(screen.split('\n').length).toBeLessThanOrEqual(30);
    const seen = shownSentences(screen);
    expect(seen[0]).toBe(1);
    expect(screen).toContain('(start of the passage)');
    const below = Number(/↓ (\d+) lines? more \(down arrow scrolls\)/.exec(screen)![1]);
    // Every line of the passage is either shown or counted below.
    const lines = screen.split('\n').filter((l) => /Sentence \d\d/.test(l)).length;
    expect(maxScroll).toBe(below);
    const all = model(0, 200).screen.split('\n').filter((l) => /Sentence \d\d/.test(l)).length;
    expect(lines + below).toBe(all);
  });

  it('moves the window by the scroll, and stops at the end of the passage', () => {
    const first = model(0);
    const three = model(3);
    expect(shownSentences(three.screen)[0]).toBe(shownSentences(first.screen)[0]! + 3);
    expect(three.screen).toMatch(/↑ 3 lines above \(up arrow\)/);
    const end = model(first.maxScroll + 50); // past the end: held at the last window
    expect(shownSentences(end.screen).at(-1)).toBe(40);
    expect(end.screen).toContain('(end of the passage)');
    expect(end.screen).toBe(model(first.maxScroll).screen);
  });

  it('does not scroll a passage that fits', () => {
    const tall = model(5, 200);
    expect(tall.maxScroll).toBe(0);
    expect(shownSentences(tall.screen)).toEqual(Array.from({ length: 40 }, (_, i) => i + 1));
    expect(tall.screen).not.toContain('↓');
  });
});
