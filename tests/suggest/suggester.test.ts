import { describe, expect, it } from 'vitest';
import { UserError } from '../../src/errors.js';
import { ThemeSuggester } from '../../src/suggest/index.js';
import { buildTree, chooseThemes } from '../../src/suggest/hierarchy.js';
import { Profiles, SIGNALS, type Corpus } from '../../src/suggest/profiles.js';
import { TfidfVectorizer } from '../../src/text/tfidf.js';
import { FLAT, THEMES, syntheticStudy, tinyStudy } from './study.js';

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

describe('leave-one-transcript-out signals are exact', () => {
  it('equal the signals of profiles built without that transcript', () => {
    const { passages, codings } = syntheticStudy(true);
    const tree = buildTree(FLAT);
    const vec = new TfidfVectorizer().fit(passages.map((p) => p.terms));
    const both = passages.map((p) => vec.vectorAndCounts(p.terms));
    const members: number[][] = [];
    const transcriptOf = new Int32Array(passages.length);
    passages.forEach((p, i) => {
      const ti = Number(p.transcript.slice(1));
      (members[ti] ??= []).push(i);
      transcriptOf[i] = ti;
    });
    const corpusWith = (held: number): Corpus => {
      const coded = new Uint8Array(members.length);
      const labels = passages.map(() => [] as number[]);
      for (const c of codings) {
        const p = passages.findIndex((q) => q.id === c.passageId);
        if (transcriptOf[p] === held) continue;
        coded[transcriptOf[p]!] = 1;
        labels[p] = [tree.index.get(c.themeId)!];
      }
      return { x: both.map((b) => b.vector), c: both.map((b) => b.counts), vocabulary: vec.size, transcriptOf, members, codedTranscript: coded, labels, themes: FLAT.length };
    };
    // A prior of 50 stays under the cap (a tenth of the coded text) in every fold, so both sides
    // use the same prior, as one fit does.
    const full = new Profiles(corpusWith(-1), 50, 3);
    for (const held of [0, 5, 11]) {
      const without = new Profiles(corpusWith(held), 50, 3);
      expect(without.a0).toBe(full.a0);
      const a = full.foldSignals(held);
      const b = without.foldSignals(held);
      expect(a.f.length).toBe(members[held]!.length * FLAT.length * SIGNALS);
      a.f.forEach((v, i) => expect(v).toBeCloseTo(b.f[i]!, 9));
      expect([...a.nearest]).toEqual([...b.nearest]);
    }
  });
});

describe('context weight is learned from the coded batch', () => {
  const weight = (runs: boolean) => {
    const { passages, codings } = syntheticStudy(runs);
    const st = new ThemeSuggester().fit(passages, codings, FLAT).state.context;
    const w = (name: string) => st.weights[st.inputs.indexOf(name)]!;
    return { base: w('base'), context: Math.abs(w('adjacent')) + Math.abs(w('transcript')) };
  };
  it('is large when talk on a theme runs over several passages', () => {
    const r = weight(true);
    expect(r.context).toBeGreaterThan(0.5 * r.base);
  });
  it('is near zero when neighbouring passages are unrelated', () => {
    const r = weight(false);
    expect(r.context).toBeLessThan(0.15 * r.base);
  });
});
