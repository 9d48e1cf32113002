import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { fitFewshot, scoreFewshot } from '../../src/suggest/fewshot.js';
import { fitGrouped } from '../../src/suggest/logistic.js';
import { decodeState, encodeState } from '../../src/suggest/state-codec.js';
import { ThemeSuggester } from '../../src/suggest/suggester.js';
import type { Coding, ModelPassage } from '../../src/suggest/types.js';
import { theme } from '../helpers/themes.js';

const ref = JSON.parse(readFileSync(join(import.meta.dirname, '../reference/fewshot.json'), 'utf8'));

/** One passage a transcript, participant turns. */
const passagesOf = (docs: string[][]): ModelPassage[] => docs.map((terms, i) => ({ id: `p${i}`, transcript: `t${i}`, ordinal: 1, role: 'participant', terms }));
const RAW = 4; // signals per cell: mnb, cnb, knn, seed

describe('few-example scorer: Complement Naive Bayes signal', () => {
  it('equals scikit-learn ComplementNB(alpha=0.3, norm=False) on the same TF-IDF vectors', () => {
    // Reference: tests/reference/make_fixtures.py fewshot() (scikit-learn ComplementNB's joint log-likelihood).
    const { docs, labels, classes, jll } = ref.complement_nb as { docs: string[][]; labels: string[]; classes: string[]; jll: number[][] };
    const themes = classes.map((c) => theme(c));
    const codings: Coding[] = labels.map((l, i) => ({ passageId: `p${i}`, themeId: l }));
    const fit = fitFewshot(passagesOf(docs), codings, themes, { em: 0, alpha: 0.3 }, [], undefined, { raw: true });
    const nT = themes.length;
    jll.forEach((row, i) => {
      const p = labels.length + i;
      row.forEach((v, t) => expect(fit.cells.raw![(p * nT + t) * RAW + 1]).toBeCloseTo(v, 9));
    });
  });
});

describe('few-example scorer: shrinkage toward the parent', () => {
  // Worked by hand. Passages of one term each, so every TF-IDF vector is that term at weight 1.
  // Template: P > {C1, C2}, and Q. Coded: ["a"] -> C1, ["b"] -> C2, ["b"] -> Q; scored: ["a"].
  // Counts: C1 {a:1}, C2 {b:1}, P (rolled up) {a:1, b:1}, Q {b:1}; all coded {a:1, b:2}, mass 3.
  // Unit mass = 3 / 3 passages = 1, so mu = 2 (mu is given in passages' worth). V = 2 terms.
  //   top:  theta(a) = (1 + 2 * 1/2) / (3 + 2)     = 0.4
  //   P:    theta(a) = (1 + 2 * 0.4) / (2 + 2)     = 0.45
  //   C1:   theta(a) = (1 + 2 * 0.45) / (1 + 2)    = 1.9 / 3
  //   C2:   theta(a) = (0 + 2 * 0.45) / (1 + 2)    = 0.3
  //   Q:    theta(a) = (0 + 2 * 0.4) / (1 + 2)     = 0.8 / 3
  // The signal is sum_j x_j log theta(j) = log theta(a).
  const themes = [theme('P'), theme('C1', 'P'), theme('C2', 'P'), theme('Q')];
  const codings: Coding[] = [
    { passageId: 'p0', themeId: 'C1' },
    { passageId: 'p1', themeId: 'C2' },
    { passageId: 'p2', themeId: 'Q' },
  ];
  const fit = fitFewshot(passagesOf([['a'], ['b'], ['b'], ['a']]), codings, themes, { em: 0, mu: 2 }, [], undefined, { raw: true });
  const mnb = (t: number) => fit.cells.raw![(3 * 4 + t) * RAW]!;
  it('mixes each theme with its parent by their masses', () => {
    expect(mnb(0)).toBeCloseTo(Math.log(0.45), 12);
    expect(mnb(1)).toBeCloseTo(Math.log(1.9 / 3), 12);
    expect(mnb(2)).toBeCloseTo(Math.log(0.3), 12);
    expect(mnb(3)).toBeCloseTo(Math.log(0.8 / 3), 12);
  });
});

describe('few-example scorer: the shared calibration', () => {
  it("fits a logistic regression as scikit-learn's LogisticRegression(C=1/10) does", () => {
    // Reference: tests/reference/make_fixtures.py fewshot() (sklearn penalises no intercept; ours 1e-3).
    const { x, y, coef, intercept } = ref.logistic as { x: number[][]; y: number[]; coef: number[]; intercept: number };
    const m = fitGrouped({ x: Float64Array.from(x.flat()), k: 3, y: Uint8Array.from(y), group: new Int32Array(y.length), groups: 1 }, 10);
    m.weights.forEach((w, j) => expect(w).toBeCloseTo(coef[j]!, 3));
    expect(m.intercepts[0]!).toBeCloseTo(intercept, 3);
  });
});

describe('few-example scorer: every theme a candidate', () => {
  const docs = [
    ['rota', 'overtime', 'shift'],
    ['shift', 'overtime', 'rota', 'late'],
    ['manager', 'support', 'listen'],
    ['support', 'manager', 'listen', 'help'],
    ['annual', 'leave', 'holiday'], // the only passage of Leave
    ['rota', 'late', 'shift'],
    ['leave', 'annual', 'request'],
    ['salary', 'wage', 'money', 'pay'],
    ['support', 'help', 'manager'],
  ];
  const themes = [
    theme('hours'),
    theme('support'),
    theme('leave'),
    theme('pay', null, { apriori: true, definition: 'money: salary and wages', seeds: ['salary', 'wage'], definitionTerms: ['money', 'salary', 'wage'] }),
  ];
  const codings: Coding[] = [
    { passageId: 'p0', themeId: 'hours' },
    { passageId: 'p1', themeId: 'hours' },
    { passageId: 'p2', themeId: 'support' },
    { passageId: 'p3', themeId: 'support' },
    { passageId: 'p4', themeId: 'leave' },
  ];
  const passages = passagesOf(docs);
  const fit = fitFewshot(passages, codings, themes, {});
  const nT = themes.length;
  const top = (p: number) => [0, 1, 2, 3].sort((a, b) => fit.cells.conf[p * nT + b]! - fit.cells.conf[p * nT + a]!)[0];

  it('ranks a theme with one coded passage first for a passage like it', () => {
    expect(top(6)).toBe(2);
  });
  it('ranks a theme with no coded passage first where its name, definition and seeds match', () => {
    expect(top(7)).toBe(3);
    expect(fit.state.seedCalibration).not.toBeNull();
  });
  it('gives confidences between 0 and 1 to every cell', () => {
    for (const c of fit.cells.conf) {
      expect(Number.isFinite(c)).toBe(true);
      expect(c).toBeGreaterThanOrEqual(0);
      expect(c).toBeLessThanOrEqual(1);
    }
  });

  it('scores from its state alone: the same passages give the same confidences, after a JSON round trip too', () => {
    const plain = fitFewshot(passages, codings, themes, { em: 0 });
    const uncoded = passages.slice(5);
    const again = scoreFewshot(decodeState(encodeState(plain.state)), themes, uncoded);
    uncoded.forEach((_, i) => {
      for (let t = 0; t < nT; t++) expect(again.conf[i * nT + t]).toBeCloseTo(plain.cells.conf[(5 + i) * nT + t]!, 12);
    });
  });
  it('scores a passage added after the fit', () => {
    const later: ModelPassage = { id: 'new', transcript: 'later', ordinal: 1, role: 'participant', terms: ['overtime', 'rota', 'unknownword'] };
    const s = scoreFewshot(fit.state, themes, [later]);
    expect([0, 1, 2, 3].sort((a, b) => s.conf[b]! - s.conf[a]!)[0]).toBe(0);
  });
});

describe('the exact theme first, a parent only where no sub-theme stands out', () => {
  // Invented: Workload (coded itself for general talk of being busy) with sub-themes Staffing
  // and Rota, each coded on talk of its own; transcripts t1-t6 coded, t7 not.
  const talk: Record<string, string[][]> = {
    work: [['busy', 'pressure', 'tired', 'demand'], ['pressure', 'busy', 'exhausted', 'demand'], ['tired', 'busy', 'pressure', 'load']],
    staff: [['agency', 'vacancy', 'short', 'staff'], ['vacancy', 'staff', 'agency', 'bank'], ['short', 'staff', 'bank', 'agency']],
    rota: [['rota', 'shift', 'swap', 'weekend'], ['shift', 'weekend', 'rota', 'night'], ['swap', 'rota', 'night', 'shift']],
  };
  const themes = [theme('work', null, { nameTerms: ['workload'] }), theme('staff', 'work', { nameTerms: ['staffing'] }), theme('rota', 'work', { nameTerms: ['rota'] })];
  const passages: ModelPassage[] = [];
  const codings: Coding[] = [];
  for (let t = 1; t <= 7; t++) {
    for (const th of ['work', 'staff', 'rota']) {
      for (let k = 0; k < 2; k++) {
        const id = `t${t}#${passages.length}`;
        passages.push({ id, transcript: `t${t}`, ordinal: passages.length, role: 'participant', terms: talk[th]![(t + k) % 3]! });
        if (t < 7) codings.push({ passageId: id, themeId: th });
      }
    }
  }
  const model = new ThemeSuggester().fit(passages, codings, themes);
  const fresh = model.predict(passages.filter((p) => p.transcript === 't7').map((p) => p.id));
  const truth = (i: number) => ['work', 'staff', 'rota'][Math.floor(i / 2)]!;

  it('ranks the sub-theme itself first for talk of it, and the parent first for talk of the parent', () => {
    fresh.forEach((p, i) => expect(p.candidates[0]!.themeId, p.passageId).toBe(truth(i)));
  });
  it('says so when it suggests the parent: no sub-theme stands out', () => {
    const parent = fresh.filter((_, i) => truth(i) === 'work').flatMap((p) => p.candidates.filter((c) => c.chosen && c.themeId === 'work'));
    expect(parent.length).toBeGreaterThan(0);
    for (const c of parent) expect(c.reasons).toContainEqual({ kind: 'parent', theme: 'work' });
    // A sub-theme chosen is never explained so.
    for (const p of fresh) for (const c of p.candidates) if (c.themeId !== 'work') expect(c.reasons.some((r) => r.kind === 'parent')).toBe(false);
  });
});

describe('a first batch of one coded transcript', () => {
  // Invented: one interview coded, passage by passage; the second not yet.
  const talk = [
    ['rota', 'overtime', 'shift'],
    ['manager', 'support', 'listen'],
    ['shift', 'rota', 'late'],
    ['support', 'manager', 'help'],
    ['overtime', 'late', 'rota'],
    ['listen', 'help', 'support'],
  ];
  const passages: ModelPassage[] = [
    ...talk.map((terms, i) => ({ id: `a#${i}`, transcript: 'a', ordinal: i, role: 'participant' as const, terms })),
    { id: 'b#0', transcript: 'b', ordinal: 0, role: 'participant', terms: ['rota', 'shift', 'weekend'] },
    { id: 'b#1', transcript: 'b', ordinal: 1, role: 'participant', terms: ['manager', 'listen', 'kind'] },
  ];
  const themes = [theme('hours'), theme('support')];
  const codings: Coding[] = talk.map((_, i) => ({ passageId: `a#${i}`, themeId: i % 2 ? 'support' : 'hours' }));
  const fit = fitFewshot(passages, codings, themes, {});

  it('calibrates on its passages left out in turn, so the text evidence carries weight', () => {
    const w = (n: string) => fit.state.calibration.weights[fit.state.calibration.features.indexOf(n)]!;
    expect(w('cnb_z') + w('mnb_z') + w('knn')).toBeGreaterThan(0.1);
    expect(fit.cells.conf[6 * 2 + 0]!).toBeGreaterThan(fit.cells.conf[6 * 2 + 1]!);
    expect(fit.cells.conf[7 * 2 + 1]!).toBeGreaterThan(fit.cells.conf[7 * 2 + 0]!);
  });
});

describe('few-example scorer: the state alone reproduces the fit', () => {
  // Invented interviews about ward handovers: t1-t3 coded, t4-t5 not; one rejection in t5.
  const lines: Record<string, string[][]> = {
    t1: [['rota', 'shift', 'late'], ['handover', 'sheet', 'paper'], ['manager', 'support', 'listen']],
    t2: [['shift', 'rota', 'night'], ['sheet', 'handover', 'print'], ['tired', 'busy', 'shift']],
    t3: [['support', 'manager', 'help'], ['paper', 'sheet', 'pocket'], ['rota', 'swap', 'weekend']],
    t4: [['rota', 'weekend', 'shift'], ['handover', 'print', 'sheet'], ['listen', 'help', 'manager'], ['busy', 'night']],
    t5: [['pocket', 'paper', 'fold'], ['swap', 'shift', 'late'], ['support', 'listen']],
  };
  const passages: ModelPassage[] = Object.entries(lines).flatMap(([t, docs]) =>
    docs.map((terms, i) => ({ id: `${t}-${i}`, transcript: t, ordinal: i + 1, role: 'participant', terms }) as ModelPassage),
  );
  const themes = [theme('hours'), theme('rota', 'hours'), theme('paper'), theme('support'), theme('pay', null, { definition: 'money', seeds: ['salary'], definitionTerms: ['money', 'salary'] })];
  const codings: Coding[] = [
    { passageId: 't1-0', themeId: 'rota' },
    { passageId: 't1-1', themeId: 'paper' },
    { passageId: 't1-2', themeId: 'support' },
    { passageId: 't2-0', themeId: 'rota' },
    { passageId: 't2-1', themeId: 'paper' },
    { passageId: 't2-2', themeId: 'hours' },
    { passageId: 't3-0', themeId: 'support' },
    { passageId: 't3-1', themeId: 'paper' },
    { passageId: 't3-2', themeId: 'rota' },
  ];
  const negatives: Coding[] = [{ passageId: 't5-1', themeId: 'support' }];
  const nT = themes.length;

  const same = (fit: ReturnType<typeof fitFewshot>, scored: ReturnType<typeof scoreFewshot>, rows: number[]) => {
    let checked = 0;
    rows.forEach((p, i) => {
      for (let t = 0; t < nT; t++) {
        expect(scored.conf[i * nT + t]).toBeCloseTo(fit.cells.conf[p * nT + t]!, 12);
        expect(scored.nearest[i * nT + t]).toBe(fit.cells.nearest[p * nT + t]);
        checked++;
      }
    });
    return checked;
  };

  it('gives every passage, coded or not, the confidence the fit gave it (EM rounds, rejections, JSON round trip)', () => {
    const fit = fitFewshot(passages, codings, themes, {}, negatives);
    expect(fit.state.soft.ids.length).toBe(7); // the passages of t4 and t5 joined the counts
    const again = scoreFewshot(decodeState(encodeState(fit.state)), themes, passages);
    expect(same(fit, again, passages.map((_, i) => i))).toBe(passages.length * nT);
  });
  it('scores one uncoded transcript on its own as it scored it among all the others', () => {
    const fit = fitFewshot(passages, codings, themes, {}, negatives);
    const t4 = passages.map((p, i) => [p, i] as const).filter(([p]) => p.transcript === 't4');
    const alone = scoreFewshot(fit.state, themes, t4.map(([p]) => p));
    same(fit, alone, t4.map(([, i]) => i));
  });
  it('leaves a coded passage out of its own fold when only one transcript is coded', () => {
    const one = codings.filter((c) => c.passageId.startsWith('t1'));
    const fit = fitFewshot(passages, one, themes, {});
    const again = scoreFewshot(fit.state, themes, passages);
    same(fit, again, passages.map((_, i) => i));
  });
  it('differs from the fit when a passage is scored with its own soft share (the check can fail)', () => {
    const fit = fitFewshot(passages, codings, themes, {}, negatives);
    const renamed = passages.map((p) => (p.transcript === 't4' ? { ...p, id: `new-${p.id}` } : p));
    const again = scoreFewshot(fit.state, themes, renamed);
    const i = passages.findIndex((p) => p.id === 't4-0');
    let diff = 0;
    for (let t = 0; t < nT; t++) diff = Math.max(diff, Math.abs(again.conf[i * nT + t]! - fit.cells.conf[i * nT + t]!));
    expect(diff).toBeGreaterThan(1e-9);
  });
});
