import { readFileSync } from 'node:fs';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { describe, expect, it } from 'vitest';
import { fitLogit, predictLogit } from '../../src/discover/logit.js';
import { NoveltyModel, aucOf, upperQuantile, type NoveltyPassage } from '../../src/discover/novelty.js';
import { smoothInGroups } from '../../src/discover/smooth.js';
import { seededRandom } from '../../src/measure/random.js';
import type { Candidate, Coding, PassageSuggestions } from '../../src/suggest/types.js';

const DIR = join(dirname(fileURLToPath(import.meta.url)), '..', 'reference', 'discover');

describe('logistic regression against scikit-learn', () => {
  // Source: scikit-learn 1.2.1 LogisticRegression(penalty='l2', C, lbfgs, tol 1e-12) on Fisher's
  // iris, versicolor against virginica (tests/reference/discover/make_logit_fixture.py).
  const f = JSON.parse(readFileSync(join(DIR, 'logit.json'), 'utf8')) as { x: number[][]; y: number[]; fits: Record<string, { intercept: number; coef: number[]; proba: number[] }> };
  it.each(['0.1', '1.0', '10.0'])('C = %s: the same coefficients and probabilities', (c) => {
    const fit = fitLogit(f.x, f.y, Number(c));
    const ref = f.fits[c]!;
    expect(fit.converged).toBe(true);
    // Relative to size: lbfgs stops within about 1e-5 of the optimum that Newton reaches.
    const near = (a: number, b: number) => expect(Math.abs(a - b) / Math.max(1, Math.abs(b))).toBeLessThan(1e-4);
    near(fit.coef[0]!, ref.intercept);
    ref.coef.forEach((w, j) => near(fit.coef[j + 1]!, w));
    f.x.forEach((row, i) => expect(predictLogit(fit, row)).toBeCloseTo(ref.proba[i]!, 5));
  });
});

describe('smoothing over the transcript', () => {
  const rand = seededRandom(9);
  const n = 40;
  const values = Array.from({ length: n }, () => rand());
  const groups = Array.from({ length: n }, () => (rand() < 0.5 ? 'a' : 'b'));
  const positions = Array.from({ length: n }, (_, i) => (i * 7) % n); // not in input order

  it('is the weighted mean with weights decay^distance (checked by the direct sum)', () => {
    for (const decay of [0.3, 0.5, 0.9]) {
      const got = smoothInGroups(values, groups, positions, decay);
      for (let i = 0; i < n; i++) {
        const same = Array.from({ length: n }, (_, j) => j).filter((j) => groups[j] === groups[i]).sort((a, b) => positions[a]! - positions[b]!);
        const r = same.indexOf(i);
        let num = 0;
        let den = 0;
        same.forEach((j, q) => {
          const w = decay ** Math.abs(q - r);
          num += w * values[j]!;
          den += w;
        });
        expect(got[i]).toBeCloseTo(num / den, 12);
      }
    }
  });

  it('gives the transcript mean at decay 1 and the values at decay 0', () => {
    const mean = (g: string) => values.filter((_, i) => groups[i] === g).reduce((a, b) => a + b, 0) / groups.filter((x) => x === g).length;
    smoothInGroups(values, groups, positions, 1).forEach((v, i) => expect(v).toBeCloseTo(mean(groups[i]!), 12));
    expect(Array.from(smoothInGroups(values, groups, positions, 0))).toEqual(values);
    expect(() => smoothInGroups(values, groups, positions, 1.5)).toThrow(RangeError);
  });
});

describe('AUC and the batch quantile', () => {
  it('is the share of (novel, familiar) pairs ordered right, ties half (checked by counting pairs)', () => {
    const rand = seededRandom(3);
    const a = Array.from({ length: 30 }, () => Math.round(rand() * 10));
    const b = Array.from({ length: 25 }, () => Math.round(rand() * 8));
    let s = 0;
    for (const x of a) for (const y of b) s += x > y ? 1 : x === y ? 0.5 : 0;
    expect(aucOf(a, b)).toBeCloseTo(s / (a.length * b.length), 12);
  });

  it('puts the threshold where the chosen share of values lies at or above it', () => {
    const v = Array.from({ length: 100 }, (_, i) => i / 100);
    expect(v.filter((x) => x >= upperQuantile(v, 0.1)).length).toBe(10);
    expect(upperQuantile(v, 0)).toBe(0.99);
  });
});

// An invented study: themes a, b, c with their own words; coded transcripts t1-t6 talk about one
// theme each for a stretch; uncoded transcripts u1-u4 hold the same themes and a fourth topic
// (d words) that the template lacks.
const WORDS: Record<string, string[]> = {
  a: ['rota', 'shift', 'cover', 'agency', 'staff', 'night', 'short'],
  b: ['screen', 'login', 'password', 'tablet', 'frozen', 'typing', 'click'],
  c: ['allergy', 'wristband', 'banner', 'drug', 'chart', 'dose', 'missed'],
  d: ['paper', 'sheet', 'print', 'pocket', 'fold', 'scrap', 'shred'],
};
const COMMON = ['ward', 'patient', 'think', 'work', 'time', 'day'];

function study() {
  const rand = seededRandom(5);
  const passages: NoveltyPassage[] = [];
  const topic = new Map<string, string>();
  const add = (tr: string, topics: string[]) =>
    topics.forEach((t, i) => {
      const id = `${tr}#${i + 1}`;
      const terms = [...Array.from({ length: 6 }, () => WORDS[t]![Math.floor(rand() * 7)]!), ...Array.from({ length: 4 }, () => COMMON[Math.floor(rand() * 6)]!)];
      passages.push({ id, transcript: tr, ordinal: i + 1, role: 'participant', terms });
      topic.set(id, t);
    });
  const runs = (...xs: [string, number][]) => xs.flatMap(([t, n]) => Array<string>(n).fill(t));
  add('t1', runs(['a', 4], ['b', 4]));
  add('t2', runs(['b', 4], ['c', 4]));
  add('t3', runs(['c', 4], ['a', 4]));
  add('t4', runs(['a', 3], ['c', 3], ['b', 3]));
  add('t5', runs(['b', 3], ['a', 3]));
  add('t6', runs(['c', 3], ['b', 3]));
  add('u1', runs(['a', 3], ['d', 4], ['b', 3]));
  add('u2', runs(['d', 3], ['c', 4]));
  add('u3', runs(['b', 4], ['a', 3], ['d', 3]));
  add('u4', runs(['c', 4], ['a', 3]));
  const themes = ['a', 'b', 'c'].map((id) => ({ id, parentId: null }));
  const codings: Coding[] = passages.filter((p) => p.transcript.startsWith('t')).map((p) => ({ passageId: p.id, themeId: topic.get(p.id)! }));
  // Suggestions as a suggester would give them: the passage's own theme likely, others not; the
  // new topic gets middling confidences spread over the themes.
  const cand = (themeId: string, confidence: number): Candidate => ({ themeId, score: 0, confidence, aboveThreshold: confidence > 0.5, chosen: confidence > 0.5, reasons: [] });
  const suggestions: PassageSuggestions[] = passages.map((p) => {
    const t = topic.get(p.id)!;
    const cs = ['a', 'b', 'c'].map((th) => cand(th, t === 'd' ? 0.2 + 0.1 * rand() : th === t ? 0.6 + 0.3 * rand() : 0.05 + 0.1 * rand()));
    return { passageId: p.id, transcript: p.transcript, candidates: cs.sort((x, y) => y.confidence - x.confidence), unclaimed: false };
  });
  return { input: { passages, themes, codings, suggestions }, topic };
}

describe('NoveltyModel', () => {
  const { input, topic } = study();
  const model = new NoveltyModel().fit(input);
  const uncoded = input.passages.filter((p) => p.transcript.startsWith('u'));
  const scores = new Map(model.predict(uncoded.map((p) => p.id)).map((x) => [x.passageId, x.novelty]));

  it('learns from the batch by leaving each theme out, and scores new material above the familiar', () => {
    const st = model.state;
    expect(st.training.heldOutThemes).toEqual(['a', 'b', 'c']);
    expect(st.training.novelRows).toBe(st.training.familiarRows);
    expect(st.training.auc).toBeGreaterThan(0.8);
    const novel = uncoded.filter((p) => topic.get(p.id) === 'd').map((p) => scores.get(p.id)!);
    const familiar = uncoded.filter((p) => topic.get(p.id) !== 'd').map((p) => scores.get(p.id)!);
    expect(aucOf(novel, familiar)).toBeGreaterThan(0.9);
    // All of the new topic reaches the pool. (So does much of the rest: the batch here is
    // separable, so its 10% quantile sits close to the familiar passages.)
    expect(novel.filter((s) => s >= st.threshold).length / novel.length).toBe(1);
    expect(familiar.filter((s) => s >= st.threshold).length / familiar.length).toBeLessThan(0.75);
  });

  it('sets the threshold so that the chosen share of the coded batch would be pooled', () => {
    for (const batchShare of [0.05, 0.2]) {
      const m = new NoveltyModel({ batchShare, features: ['conf', 'unseen'] }).fit(input);
      const coded = m.predict(input.codings.map((c) => c.passageId)).map((x) => x.novelty);
      // The coded passages' own scores here are leave-one-transcript-out, as in fit.
      const share = coded.filter((s) => s >= m.state.threshold).length / coded.length;
      expect(share).toBeGreaterThanOrEqual(batchShare - 1e-9);
      expect(share).toBeLessThan(batchShare + 0.05);
    }
  });

  it('is deterministic, with plain learned state', () => {
    const again = new NoveltyModel().fit(input);
    expect(again.state).toEqual(model.state);
    expect(JSON.parse(JSON.stringify(model.state))).toEqual(model.state);
    expect(model.state.features).toHaveLength(9);
  });

  it('needs enough themes, and scores interviewer turns 0', () => {
    expect(NoveltyModel.trainable(input)).toBe(true);
    expect(NoveltyModel.trainable({ ...input, codings: input.codings.filter((c) => c.themeId !== 'c') })).toBe(false);
    const withQ = { ...input, passages: input.passages.map((p) => (p.id === 'u1#2' ? { ...p, role: 'interviewer' as const } : p)) };
    expect(new NoveltyModel().fit(withQ).predict(['u1#2'])[0]!.novelty).toBe(0);
  });
});
