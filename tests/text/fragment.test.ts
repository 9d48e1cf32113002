import { describe, expect, it } from 'vitest';
import { commonForm, matchedFragment } from '../../src/text/fragment.js';

/** Tokens of `text` split on spaces, with their offsets (a hand-made analysis). */
function tokens(text: string, lemma: (w: string) => string) {
  const spans: number[] = [];
  const lemmas: string[] = [];
  for (const m of text.matchAll(/\S+/g)) {
    spans.push(m.index!, m.index! + m[0].length);
    lemmas.push(lemma(m[0]));
  }
  return { lemmas, spans };
}

describe('matchedFragment', () => {
  // Invented passage; lemmas by hand: "Colours" -> colour, "organised" -> organise.
  const text = 'At first it was fine. Later the Colours on the ward were organised by the new manager, and nobody asked us.';
  const lemmaOf = (w: string) => ({ Colours: 'colour', organised: 'organise', manager: 'manager', ward: 'ward' })[w.replace(/[,.]$/, '')] ?? w.toLowerCase();
  const { lemmas, spans } = tokens(text, lemmaOf);

  it('gives each matched lemma as the passage writes it (spelling and case kept)', () => {
    const f = matchedFragment(text, lemmas, spans, ['colour', 'organise']);
    expect(f.written).toEqual({ colour: 'Colours', organise: 'organised' });
  });

  it('cuts the stretch holding the most matched terms, at word boundaries, with ellipses', () => {
    // By hand: "Colours" starts at 32, "manager," ends at 86; 54 characters, so 46 more are shared
    // out around it, and the cut is moved inwards to whole words.
    const f = matchedFragment(text, lemmas, spans, ['colour', 'ward', 'organise', 'manager'], 60);
    expect(f.fragment.startsWith('…')).toBe(true);
    expect(f.fragment).toContain('Colours on the ward were organised by the new manager');
    expect(f.fragment.length).toBeLessThanOrEqual(62);
    for (const w of f.fragment.replace(/…/g, '').split(' ')) expect(text.split(' ')).toContain(w);
  });

  it('says nothing when no term matches', () => {
    expect(matchedFragment(text, lemmas, spans, ['salary'])).toEqual({ written: {}, fragment: '' });
  });
});

describe('commonForm', () => {
  // Worked by hand from invented counts.
  it('keeps the lemma where the study writes it so', () => {
    expect(commonForm('ward', new Map([['ward', 2], ['wards', 5], ['Ward', 9]]))).toBe('ward');
  });
  it("gives the study's own spelling where the analysis spells the lemma otherwise", () => {
    expect(commonForm('center', new Map([['centre', 3], ['Centre', 4], ['centres', 1]]))).toBe('centre');
  });
  it('keeps capitals only for a word never written in lower case', () => {
    expect(commonForm('hcas', new Map([['HCAs', 4], ['HCAS', 1]]))).toBe('HCAs');
    expect(commonForm('salary', undefined)).toBe('salary');
  });
});
