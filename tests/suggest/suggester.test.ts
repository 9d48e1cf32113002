import { describe, expect, it } from 'vitest';
import { UserError } from '../../src/errors.js';
import { ThemeSuggester } from '../../src/suggest/index.js';
import { buildTree, chooseThemes } from '../../src/suggest/hierarchy.js';
import { FLAT, THEMES, messagingStudy, syntheticStudy, tinyStudy } from './study.js';

const LEAVES = new Set(['staff', 'admin', 'support']);

describe('ThemeSuggester on a tiny hand-made study', () => {
  const { passages, codings, truth } = tinyStudy();
  const model = new ThemeSuggester({ minExamples: 3 }).fit(passages, codings, THEMES);
  const uncoded = passages.filter((p) => p.transcript === 't5' || p.transcript === 't6');
  const preds = model.predict(uncoded.map((p) => p.id));
  const byId = new Map(preds.map((p) => [p.passageId, p]));

  it('ranks the right leaf theme first for every answer of the uncoded transcripts', () => {
    for (const p of uncoded) {
      const want = truth.get(p.id);
      if (!want) continue;
      const leaf = byId.get(p.id)!.candidates.find((c) => LEAVES.has(c.themeId))!;
      expect(leaf.themeId, p.id).toBe(want);
    }
  });

  it('rolls sub-theme codings up into the parent profile', () => {
    const reports = new Map(model.themeReports().map((r) => [r.themeId, r]));
    expect(reports.get('work')!.exemplars).toBe(reports.get('staff')!.exemplars + reports.get('admin')!.exemplars);
    expect(reports.get('staff')!.exemplars).toBe(8);
    // A staffing answer scores higher on Workload than on Support.
    const staffing = uncoded.find((p) => truth.get(p.id) === 'staff')!;
    const conf = (id: string) => byId.get(staffing.id)!.candidates.find((c) => c.themeId === id)!.confidence;
    expect(conf('work')).toBeGreaterThan(conf('support'));
    // Distinctive terms of Staffing come from staffing talk.
    expect(reports.get('staff')!.topTerms.map((t) => t.term)).toContain('shift');
  });

  it('gives reasons: matched distinctive terms and the nearest coded exemplar from another transcript', () => {
    const p = uncoded.find((q) => truth.get(q.id) === 'admin')!;
    const top = byId.get(p.id)!.candidates.find((c) => c.themeId === 'admin')!;
    const terms = top.reasons.find((r) => r.kind === 'terms');
    const ex = top.reasons.find((r) => r.kind === 'exemplar');
    expect(terms && terms.kind === 'terms' && terms.terms.length).toBeGreaterThan(0);
    expect(ex && ex.kind === 'exemplar' && /^t[1-4]#/.test(ex.passageId)).toBe(true);
  });

  it('builds an a priori theme with no coded passage from its definition and seeds, and says so', () => {
    const pay = model.themeReports().find((r) => r.themeId === 'pay')!;
    expect(pay.seedOnly).toBe(true);
    expect(pay.expectedPrecision).toBeNull();
    expect(pay.warnings.join(' ')).toMatch(/definition and seeds only/);
    const salary = byId.get('t6#10')!;
    const c = salary.candidates.find((x) => x.themeId === 'pay')!;
    expect(c.reasons).toContainEqual({ kind: 'seed-only' });
    expect(c.reasons).toContainEqual({ kind: 'seeds', terms: ['salary', 'wage'] });
    // Its score (cosine to the seed profile) is highest on the passage that talks about pay.
    const others = preds.filter((q) => q.passageId !== 't6#10').map((q) => q.candidates.find((x) => x.themeId === 'pay')!.score);
    expect(c.score).toBeGreaterThan(Math.max(...others));
  });

  it('is deterministic: two fits give the same fingerprint and predictions', () => {
    const again = new ThemeSuggester({ minExamples: 3 }).fit(passages, codings, THEMES);
    expect(again.fingerprint).toBe(model.fingerprint);
    expect(again.fingerprint).toMatch(/^[0-9a-f]{16}$/);
    expect(JSON.stringify(again.predict(uncoded.map((p) => p.id)))).toBe(JSON.stringify(preds));
    // and a different batch gives a different fingerprint
    const fewer = new ThemeSuggester({ minExamples: 3 }).fit(passages, codings.slice(1), THEMES);
    expect(fewer.fingerprint).not.toBe(model.fingerprint);
  });

  it('flags a theme with too few coded passages instead of giving it figures', () => {
    const one = codings.filter((c) => c.themeId !== 'support').concat([{ passageId: 't1#9', themeId: 'support' }]);
    const m = new ThemeSuggester().fit(passages, one, THEMES);
    const r = m.themeReports().find((x) => x.themeId === 'support')!;
    expect(r.tooFew).toBe(true);
    expect(r.expectedPrecision).toBeNull();
    expect(r.expectedRecall).toBeNull();
    expect(r.warnings[0]).toMatch(/too few examples: 1 coded passage/);
  });

  it('refuses to fit without codings, with a message saying what to do', () => {
    expect(() => new ThemeSuggester().fit(passages, [], THEMES)).toThrow(UserError);
    expect(() => new ThemeSuggester().fit(passages, [], THEMES)).toThrow('no coded passages yet: code the initial batch first (trellis sheet import)');
  });
});

describe('hierarchy rule', () => {
  const tree = buildTree(THEMES);
  const ix = (id: string) => tree.index.get(id)!;
  it('prefers a sub-theme that clears its threshold to its parent', () => {
    expect([...chooseThemes(tree, [ix('work'), ix('staff')])]).toEqual([ix('staff')]);
  });
  it('keeps the parent when no sub-theme clears, and keeps parallel codings', () => {
    expect([...chooseThemes(tree, [ix('work'), ix('support')])].sort()).toEqual([ix('work'), ix('support')].sort());
    expect([...chooseThemes(tree, [ix('staff'), ix('admin'), ix('work')])].sort()).toEqual([ix('staff'), ix('admin')].sort());
  });
  it('marks chosen candidates and unclaimed passages consistently', () => {
    const { passages, codings } = tinyStudy();
    const m = new ThemeSuggester({ minExamples: 3 }).fit(passages, codings, THEMES);
    for (const p of m.predict()) {
      const chosen = p.candidates.filter((c) => c.chosen);
      expect(p.unclaimed).toBe(chosen.length === 0);
      for (const c of chosen) expect(c.aboveThreshold).toBe(true);
      const ids = new Set(chosen.map((c) => c.themeId));
      if (ids.has('staff') || ids.has('admin')) expect(ids.has('work')).toBe(false);
    }
  });
});

/** The passages of each synthetic transcript (s0, s1, ...) and the transcript of each passage. */
function transcriptIndex(passages: readonly { transcript: string }[]) {
  const members: number[][] = [];
  const transcriptOf = new Int32Array(passages.length);
  passages.forEach((p, i) => {
    const ti = Number(p.transcript.slice(1));
    (members[ti] ??= []).push(i);
    transcriptOf[i] = ti;
  });
  return { members, transcriptOf };
}

describe('progress of a fit and a prediction', () => {
  it('is reported in order, from 0 to 1, and does not change the model', () => {
    const { passages, codings } = syntheticStudy(true);
    const fitSteps: number[] = [];
    const withBar = new ThemeSuggester().fit(passages, codings, FLAT, { progress: (d) => fitSteps.push(d) });
    const plain = new ThemeSuggester().fit(passages, codings, FLAT);
    expect(withBar.fingerprint).toBe(plain.fingerprint);
    expect(fitSteps.length).toBeGreaterThan(3);
    expect(fitSteps).toEqual([...fitSteps].sort((a, b) => a - b));
    expect(fitSteps[0]).toBe(0);
    expect(fitSteps.at(-1)).toBe(1);
    const scoreSteps: number[] = [];
    const ids = passages.map((p) => p.id);
    withBar.predict(ids, { progress: (d) => scoreSteps.push(d) });
    // Every 500 passages: 480 passages give one report, at the start.
    expect(scoreSteps).toEqual([0]);
  });
});

describe('context weight is learned from the coded batch (the few-example scorer)', () => {
  const weight = (runs: boolean) => {
    const { passages, codings } = syntheticStudy(runs);
    const cal = new ThemeSuggester().fit(passages, codings, FLAT).state.fewshot!.calibration;
    const sum = (f: (n: string) => boolean) => cal.features.reduce((a, n, q) => a + (f(n) ? Math.abs(cal.weights[q]!) : 0), 0);
    return { own: sum((n) => ['mnb_z', 'cnb_z', 'knn'].includes(n)), context: sum((n) => ['ctx_mnb', 'ctx_cnb', 'ctx_knn'].includes(n)) };
  };
  it('is large when talk on a theme runs over several passages, and small when it does not', () => {
    const runs = weight(true);
    const apart = weight(false);
    expect(runs.context).toBeGreaterThan(0.5 * runs.own);
    expect(apart.context).toBeLessThan(0.5 * runs.context);
  });
  it('is given as a reason only where the surrounding passages support the theme', () => {
    const { passages, codings } = syntheticStudy(true);
    const model = new ThemeSuggester().fit(passages, codings, FLAT);
    const reasons = model.predict(passages.filter((p) => Number(p.transcript.slice(1)) >= 12).map((p) => p.id), { reasons: 4 })
      .flatMap((p) => p.candidates.flatMap((c) => c.reasons))
      .filter((r) => r.kind === 'context');
    expect(reasons.length).toBeGreaterThan(50);
    for (const r of reasons) expect(r.kind === 'context' && r.weight).toBeGreaterThan(0);
  });
});

describe('rejected suggestions are negative evidence', () => {
  const { passages, codings, negatives, fresh, t7 } = messagingStudy();
  const opts = { minExamples: 3 };
  const without = new ThemeSuggester(opts).fit(passages, codings, THEMES);
  const withNeg = new ThemeSuggester(opts).fit(passages, codings, THEMES, { negatives });
  const conf = (m: ThemeSuggester, id: string, theme: string) => m.predict([id])[0]!.candidates.find((c) => c.themeId === theme)!.confidence;

  it("lowers the rejected theme's confidence on new passages like the rejected ones", () => {
    for (const id of fresh) {
      const before = conf(without, id, 'admin');
      const after = conf(withNeg, id, 'admin');
      expect(after, id).toBeLessThan(0.7 * before);
    }
    // Messaging talk looks like admin talk before any decision.
    // (ranked first of the leaf themes, so the test is about the rejection and not a weak theme)
    for (const id of fresh) expect(without.predict([id])[0]!.candidates.find((c) => LEAVES.has(c.themeId))!.themeId, id).toBe('admin');
  });

  it('leave genuine passages of the theme to it', () => {
    const { truth } = tinyStudy();
    const admin = [...truth].filter(([id, th]) => th === 'admin' && /^t[56]#/.test(id)).map(([id]) => id);
    expect(admin.length).toBeGreaterThan(0);
    for (const id of admin) {
      const top = withNeg.predict([id])[0]!.candidates.find((c) => LEAVES.has(c.themeId))!;
      expect(top.themeId, id).toBe('admin');
      expect(conf(withNeg, id, 'admin')).toBeGreaterThan(0.8 * conf(without, id, 'admin'));
    }
  });

  it('count against the theme in its profile and report', () => {
    expect(withNeg.state.coded.negatives).toBe(t7.length);
    const report = withNeg.themeReports().find((r) => r.themeId === 'admin')!;
    expect(report.warnings.join(' ')).toMatch(/2 rejected suggestion\(s\) count against this theme/);
    expect(withNeg.fingerprint).not.toBe(without.fingerprint);
  });

  it('are ignored where the passage is coded with the theme (the coding stands)', () => {
    const coded = codings.find((c) => c.themeId === 'admin')!;
    const m = new ThemeSuggester(opts).fit(passages, codings, THEMES, { negatives: [coded, { passageId: coded.passageId, themeId: 'work' }] });
    expect(m.state.coded.negatives).toBe(0);
    expect(m.fingerprint).toBe(without.fingerprint);
  });
});
