import { describe, expect, it } from 'vitest';
import { UserError } from '../../src/errors.js';
import { ThemeSuggester } from '../../src/suggest/suggester.js';
import { THEMES, tinyStudy } from './study.js';

describe('compact scores', () => {
  const { passages, codings } = tinyStudy();
  const model = new ThemeSuggester().fit(passages, codings, THEMES);
  const ids = passages.filter((p) => Number(p.transcript.slice(1)) >= 5).map((p) => p.id);

  it("give predict()'s confidences, thresholds, ranking and chosen themes, passage by passage", () => {
    const table = model.scores(ids);
    const predicted = model.predict(ids, { reasons: 0 });
    expect(table.themeIds).toEqual(THEMES.map((t) => t.id));
    expect(table.passages.map((s) => s.passageId)).toEqual(ids);
    let chosen = 0;
    predicted.forEach((p, i) => {
      const s = table.passages[i]!;
      expect(s.transcript).toBe(p.transcript);
      // The candidates are the scored themes, best first, ties by theme order.
      const ranked = table.scored.slice().sort((a, b) => s.confidence[b]! - s.confidence[a]! || a - b);
      expect(p.candidates.map((c) => c.themeId)).toEqual(ranked.map((t) => table.themeIds[t]));
      for (const c of p.candidates) {
        const t = table.themeIds.indexOf(c.themeId);
        expect(s.confidence[t]).toBe(c.confidence);
        expect(s.confidence[t]! >= table.thresholds[t]!).toBe(c.aboveThreshold);
      }
      expect(s.chosen.map((t) => table.themeIds[t])).toEqual(p.candidates.filter((c) => c.chosen).map((c) => c.themeId));
      chosen += s.chosen.length;
    });
    // Something was chosen, and something left unclaimed: the comparison covers both.
    expect(chosen).toBeGreaterThan(0);
    expect(predicted.some((p) => p.unclaimed)).toBe(true);
  });

  it('are the same from a model rebuilt from its state, and for every passage by default', () => {
    const again = ThemeSuggester.fromState(model.state, THEMES, passages, model.fingerprint);
    const a = model.scores();
    const b = again.scores();
    expect(a.passages.map((s) => s.passageId)).toEqual(passages.map((p) => p.id));
    expect(b.passages.map((s) => [s.passageId, [...s.confidence], s.chosen])).toEqual(a.passages.map((s) => [s.passageId, [...s.confidence], s.chosen]));
  });

  it('refuse a passage the model was not fitted on', () => {
    expect(() => model.scores(['t9#1'])).toThrow(UserError);
  });
});
