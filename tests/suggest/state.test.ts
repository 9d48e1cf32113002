// The suggestion model as data: fit returns a plain state, and a model rebuilt from that state
// alone (after a round trip through the bytes the study stores) predicts what the fitted model predicted,
// for passages it saw and for passages added after the fit.
import { describe, expect, it } from 'vitest';
import { decodeState, encodeState } from '../../src/suggest/state-codec.js';
import { ThemeSuggester, type SuggesterState } from '../../src/suggest/suggester.js';
import type { Coding, ModelPassage, PassageSuggestions } from '../../src/suggest/types.js';
import { theme } from '../helpers/themes.js';


// Invented handover interviews: t1-t3 coded, t4-t5 to code.
const lines: Record<string, string[][]> = {
  t1: [['rota', 'shift', 'late', 'night'], ['handover', 'sheet', 'paper', 'print'], ['manager', 'support', 'listen', 'help']],
  t2: [['shift', 'rota', 'night', 'swap'], ['sheet', 'handover', 'print', 'pocket'], ['tired', 'busy', 'shift', 'late']],
  t3: [['support', 'manager', 'help', 'listen'], ['paper', 'sheet', 'pocket', 'fold'], ['rota', 'swap', 'weekend', 'shift']],
  t4: [['rota', 'weekend', 'shift', 'swap'], ['handover', 'print', 'sheet', 'fold'], ['listen', 'help', 'manager'], ['busy', 'night', 'tired']],
  t5: [['pocket', 'paper', 'fold', 'sheet'], ['swap', 'shift', 'late', 'rota'], ['support', 'listen', 'manager']],
};
const toPassages = (src: Record<string, string[][]>): ModelPassage[] =>
  Object.entries(src).flatMap(([t, docs]) => docs.map((terms, i): ModelPassage => ({ id: `${t}-${i}`, transcript: t, ordinal: i + 1, role: 'participant', terms, words: terms.length })));
const passages = toPassages(lines);
const themes = [
  theme('Workload'),
  theme('Rota', 'Workload', { path: 'Workload > Rota', nameTerms: ['rota'] }),
  theme('Paper'),
  theme('Support'),
  theme('Pay', null, { apriori: true, definition: 'money', seeds: ['salary'], definitionTerms: ['money', 'salary'] }),
];
const codings: Coding[] = [
  ['t1-0', 'Rota'], ['t1-1', 'Paper'], ['t1-2', 'Support'],
  ['t2-0', 'Rota'], ['t2-1', 'Paper'], ['t2-2', 'Workload'],
  ['t3-0', 'Support'], ['t3-1', 'Paper'], ['t3-2', 'Rota'],
].map(([passageId, themeId]) => ({ passageId: passageId!, themeId: themeId! }));
const negatives: Coding[] = [{ passageId: 't5-1', themeId: 'Support' }];
const toDo = passages.filter((p) => p.transcript === 't4' || p.transcript === 't5').map((p) => p.id);

/** Candidates with confidences and scores to 12 places (the two routes may differ in the last bits). */
const rounded = (ps: PassageSuggestions[]) =>
  ps.map((p) => ({ ...p, candidates: p.candidates.map((c) => ({ ...c, confidence: Number(c.confidence.toFixed(12)), score: Number(c.score.toFixed(9)) })) }));

describe('the suggestion model as data', () => {
  const fitted = new ThemeSuggester().fit(passages, codings, themes, { negatives });
  const stored = decodeState<SuggesterState>(encodeState(fitted.state));

  it('reloads from its stored state to the same predictions, reasons and theme reports', () => {
    const again = ThemeSuggester.fromState(stored, themes, passages, fitted.fingerprint);
    const before = rounded(fitted.predict(toDo, { reasons: 3 }));
    expect(before.some((p) => p.candidates.some((c) => c.reasons.length > 0))).toBe(true);
    expect(rounded(again.predict(toDo, { reasons: 3 }))).toEqual(before);
    expect(again.themeReports()).toEqual(fitted.themeReports());
    expect(again.fingerprint).toBe(fitted.fingerprint);
  });

  it('predicts the coded transcripts as the fit did too (each without its own codings)', () => {
    const again = ThemeSuggester.fromState(stored, themes, passages, fitted.fingerprint);
    const coded = passages.filter((p) => p.transcript <= 't3').map((p) => p.id);
    expect(rounded(again.predict(coded))).toEqual(rounded(fitted.predict(coded)));
  });

  it('predicts a transcript added after the fit, which the fitted model cannot', () => {
    const later = toPassages({ t6: [['rota', 'swap', 'weekend', 'night'], ['sheet', 'pocket', 'paper']] });
    expect(() => fitted.predict(['t6-0'])).toThrow(/not in the study the model was fitted on/);
    const again = ThemeSuggester.fromState(stored, themes, [...passages, ...later], fitted.fingerprint);
    const [rota, paper] = again.predict(['t6-0', 't6-1']);
    expect(rota!.candidates[0]!.themeId).toBe('Rota');
    expect(paper!.candidates[0]!.themeId).toBe('Paper');
    // The passages the fit saw are scored as before: a new transcript does not move them.
    expect(rounded(again.predict(toDo))).toEqual(rounded(fitted.predict(toDo)));
  });

  it('keeps settings apart from what it learned, and refuses a state fitted on other themes', () => {
    expect(stored.options.targetPrecision).toBe(0.7);
    expect(stored.fewshot.calibration.weights.length).toBeGreaterThan(0);
    expect(() => ThemeSuggester.fromState(stored, themes.slice(0, 4), passages, fitted.fingerprint)).toThrow(/other themes/);
    expect(() => ThemeSuggester.fromState({ ...stored, version: 3 }, themes, passages, fitted.fingerprint)).toThrow(/fit again/);
  });

  it('lets go of its scores when asked, keeping its state, fingerprint and reports', () => {
    const m = new ThemeSuggester().fit(passages, codings, themes, { negatives });
    const reports = m.themeReports();
    m.dropScores();
    expect(() => m.predict(toDo)).toThrow(/after dropScores/);
    expect(() => m.scores(toDo)).toThrow(/after dropScores/);
    expect(m.fingerprint).toBe(fitted.fingerprint);
    expect(m.themeReports()).toEqual(reports);
    // The state still scores: a model rebuilt from it predicts what the fitted one did.
    const again = ThemeSuggester.fromState(decodeState<SuggesterState>(encodeState(m.state)), themes, passages, m.fingerprint);
    expect(rounded(again.predict(toDo))).toEqual(rounded(fitted.predict(toDo)));
  });
});
