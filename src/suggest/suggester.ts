/**
 * ThemeSuggester: learns a profile for every theme from the coded batch and suggests themes for
 * passages, with calibrated confidences and reasons.
 *
 * The confidences come from the few-example scorer (src/suggest/fewshot.ts: Naive Bayes with
 * shrinkage toward the ancestors, Complement Naive Bayes, the nearest coded passage, the theme's
 * name, definition and seeds, and context, combined by one calibration shared by all themes,
 * fitted on the coded transcripts left out in turn; chosen by measurement,
 * docs/suggest-experiments.md). The profiles (src/suggest/profiles.ts: weighted log-odds against
 * the rest of the coded batch) give the reasons' distinctive terms and the theme reports. The
 * layered scorer this replaced is described in docs/suggest-experiments.md; its code was deleted.
 */
import { UserError } from '../errors.js';
import { withBigrams } from '../text/terms.js';
import { isFunctionWord } from '../text/stopwords.js';
import { TfidfVectorizer, type TfidfState } from '../text/tfidf.js';
import type { SparseVector } from '../math/sparse.js';
import { fingerprint } from './fingerprint.js';
import { MIN_EXAMPLES, MIN_TRANSCRIPTS, themeStrength } from './strength.js';
import { fitFewshot, scoreFewshot, type FewshotOptions, type FewshotState, type ScoredCells } from './fewshot.js';
import { buildTree, chooseThemes, rolledUpLabels, type Tree } from './hierarchy.js';
import { Profiles, type Corpus } from './profiles.js';
import { precisionRecallAt } from './thresholds.js';
import type {
  Candidate,
  Coding,
  ModelPassage,
  PassageScores,
  PassageSuggestions,
  Reason,
  SuggesterOptions,
  TermWeight,
  ThemeInfo,
  ThemeReport,
  ThemeScores,
} from './types.js';

export type ResolvedOptions = Required<Omit<SuggesterOptions, 'fewshot'>> & { fewshot: FewshotOptions };

export function resolveOptions(o: SuggesterOptions = {}): ResolvedOptions {
  return {
    targetPrecision: o.targetPrecision ?? 0.7,
    bigrams: o.bigrams ?? false,
    minExamples: o.minExamples ?? MIN_EXAMPLES,
    minTranscripts: o.minTranscripts ?? MIN_TRANSCRIPTS,
    priorStrength: o.priorStrength ?? 500,
    overlapCosine: o.overlapCosine ?? 0.8,
    rocchio: o.rocchio ?? 0.25,
    fewshot: o.fewshot ?? {},
  };
}

/** The version of SuggesterState this build writes and reads (a stored state of another is fitted again). */
export const STATE_VERSION = 6;

export interface SuggesterState {
  version: typeof STATE_VERSION;
  options: ResolvedOptions;
  tfidf: TfidfState;
  themes: { id: string; path: string; profiled: boolean; seedOnly: boolean; tooFew: boolean; scored: boolean }[];
  /** The few-example scorer's learned state: it gives the confidences. */
  fewshot: FewshotState;
  thresholds: number[];
  /**
   * Per theme, the terms a reason may cite as distinctive of it (z > 1.96 against the rest of the
   * coded batch), as indices into `tfidf`'s vocabulary, with the theme's excess weight of each.
   */
  evidence: { indices: number[]; weights: number[] }[];
  reports: ThemeReport[];
  /** Coded passages and transcripts the fit learned from, and the rejections it used. */
  coded: { passages: number; transcripts: number; codings: number; ignoredCodings: number; negatives: number };
}

/** The log-odds of conf, 65,536 at a time in one reused array. */
function* logOddsBlocks(conf: Float64Array): Generator<Float64Array> {
  const block = new Float64Array(Math.min(conf.length, 65_536));
  for (let from = 0; from < conf.length; from += block.length) {
    const n = Math.min(block.length, conf.length - from);
    for (let i = 0; i < n; i++) block[i] = logOdds(conf[from + i]!);
    yield n === block.length ? block : block.subarray(0, n);
  }
}

/** Called with the share of the work done so far, 0 to 1. */
export type Progress = (done: number) => void;

export class ThemeSuggester {
  readonly options: ResolvedOptions;
  private st: SuggesterState | null = null;
  private fp = '';
  // Fitted data kept for predict() and reasons.
  private passages: ModelPassage[] = [];
  private pIndex = new Map<string, number>();
  private tree!: Tree;
  private vec!: TfidfVectorizer;
  private termLists: string[][] = [];
  /** Raw term counts of each passage (same vocabulary as `vec`). */
  private counts: SparseVector[] = [];
  /** Per theme: vocabulary index -> excess weight, for the terms a reason may cite. */
  private evidence: Map<number, number>[] = [];
  /** What `nearest` indexes: the coded passages' ids (few-example scorer) or every passage's. */
  private exemplarIds: string[] = [];
  /** [passage][theme] confidence (a candidate's score is its log-odds, worked out when asked for). */
  private conf: Float64Array = new Float64Array(0);
  private ctxPart: Float64Array = new Float64Array(0);
  private nearest: Int32Array = new Int32Array(0);
  private nearestSim: Float64Array = new Float64Array(0);
  /**
   * Per vocabulary term: whether a reason may cite it. Function words, pronouns, titles, numbers
   * and one-letter lemmas still count in the scores (measured: taking them out of the model lost
   * 0.01 of top-1 on the interviews benchmark) but a researcher cannot check them as evidence.
   */
  private checkable = new Uint8Array(0);
  private scoresDropped = false;

  constructor(opts: SuggesterOptions = {}) {
    this.options = resolveOptions(opts);
  }

  /**
   * @param passages ALL passages of the study, ordered by transcript then ordinal
   * @param codings the coded batch (a passage may carry several themes)
   * @param extra.negatives (passage, theme) pairs a coder rejected or re-coded away from
   * @param extra.progress told how far the fit is (a share of it, 0 to 1); it does not change the fit
   */
  fit(passages: ModelPassage[], codings: Coding[], themes: ThemeInfo[], extra: { negatives?: Coding[]; progress?: Progress } = {}): this {
    const o = this.options;
    const progress = extra.progress ?? (() => {});
    if (codings.length === 0) throw new UserError('no coded passages yet: code the initial batch first (trellis sheet import)');
    const tree = (this.tree = buildTree(themes));
    this.passages = passages;
    this.pIndex = new Map(passages.map((p, i) => [p.id, i]));
    const { labels, unknownThemes, unknownPassages } = rolledUpLabels(tree, passages, codings);
    const ignored = codings.filter((c) => unknownThemes.includes(c.themeId) || unknownPassages.includes(c.passageId)).length;
    if (ignored === codings.length) {
      throw new UserError('no coded passages yet: code the initial batch first (trellis sheet import); none of the codings names a current passage and theme');
    }

    // Transcripts in input order.
    const tIndex = new Map<string, number>();
    const members: number[][] = [];
    const transcriptOf = new Int32Array(passages.length);
    passages.forEach((p, i) => {
      let ti = tIndex.get(p.transcript);
      if (ti === undefined) {
        ti = members.length;
        tIndex.set(p.transcript, ti);
        members.push([]);
      }
      members[ti]!.push(i);
      transcriptOf[i] = ti;
    });
    const codedTranscript = new Uint8Array(members.length);
    labels.forEach((l, i) => {
      if (l.length) codedTranscript[transcriptOf[i]!] = 1;
    });
    const labelsInBatch = labels.map((l, i) => (codedTranscript[transcriptOf[i]!] ? l : []));

    // Rejections: a theme a passage is (still) coded with, or inherits from a sub-theme, is not
    // counted against it (two coders disagreed, or the coder came back to it).
    const negs: number[][] = passages.map(() => []);
    let usedNegatives = 0;
    for (const n of extra.negatives ?? []) {
      const p = this.pIndex.get(n.passageId);
      const t = tree.index.get(n.themeId);
      if (p === undefined || t === undefined || labels[p]!.includes(t) || negs[p]!.includes(t)) continue;
      negs[p]!.push(t);
      usedNegatives++;
    }

    // Text model: fitted on every passage of the study (unsupervised, so LOTO stays exact).
    // Without bigrams the passages' own term lists serve (they are not modified).
    this.termLists = o.bigrams ? passages.map((p) => withBigrams(p.terms, true)) : passages.map((p) => p.terms);
    this.vec = new TfidfVectorizer();
    const { vectors: x, counts: c } = this.vec.fitVectorise(this.termLists);
    this.checkable = Uint8Array.from({ length: this.vec.size }, (_, i) => (citable(this.vec.term(i)) ? 1 : 0));
    const nT = themes.length;
    const corpus: Corpus = { x, c, vocabulary: this.vec.size, transcriptOf, members, codedTranscript, labels: labelsInBatch, negatives: negs, themes: nT };
    // The profiles serve the fit only (reports, evidence, the fingerprint): what the fit needs of
    // them is taken before the few-example scorer runs, so their arrays are gone by then.
    const prof = this.profileFacts(corpus, tree);
    this.evidence = prof.evidence;
    this.counts = c;
    this.exemplarIds = passages.map((p) => p.id);

    const profiled = themes.map((_, t) => prof.positives[t]! > 0);
    progress(0);
    // The few-example scorer gives the confidences; the profiles above give reasons and reports.
    const few = fitFewshot(passages, codings, themes, { targetPrecision: o.targetPrecision, ...o.fewshot }, extra.negatives ?? [], (d) => progress(0.95 * d));
    const scored = themes.map((_, t) => few.state.themes[t]!.rolled > 0 || few.state.seeds[t]!.indices.length > 0);
    const heldOutOf: number[][] = themes.map(() => []);
    this.useCells(few.cells, few.state);
    few.heldOut.theme.forEach((t, i) => heldOutOf[t]!.push(i));
    const batch = codedTranscript.reduce((a, b) => a + b, 0);
    const tooFew = themes.map((_, t) => scored[t]! && themeStrength(few.state.themes[t]!.rolled, few.state.themes[t]!.transcripts, batch, true, o.minExamples, o.minTranscripts) === 'few examples');
    const seedOnly = themes.map((_, t) => scored[t]! && few.state.themes[t]!.rolled === 0);

    // One threshold shared by all themes, from the left-out coded transcripts.
    const thresholds = themes.map(() => few.state.threshold);
    const reports: ThemeReport[] = themes.map((th, t) => {
      const warnings: string[] = [];
      let expectedPrecision: number | null = null;
      let expectedRecall: number | null = null;
      {
        const rows = heldOutOf[t]!;
        const at = precisionRecallAt(rows.map((i) => few.heldOut.conf[i]!), rows.map((i) => few.heldOut.y[i]!), thresholds[t]!);
        const n = few.state.themes[t]!.rolled;
        if (!scored[t]) warnings.push('no coded passage, name terms, definition or seeds: not suggested');
        else if (n === 0) warnings.push('no coded passage yet: profile from its name, definition and seeds only; confidence from the calibration shared by all themes, not checked on this theme');
        else if (tooFew[t]) {
          warnings.push(`too few examples: ${n} coded passage(s) in ${few.state.themes[t]!.transcripts} transcript(s) (needs ${o.minExamples} in ${o.minTranscripts} to be checked on its own codings); its confidence comes from the calibration shared by all themes`);
        } else {
          expectedPrecision = at.precision;
          expectedRecall = at.recall;
        }
      }
      if (prof.rejected[t]) warnings.push(`${prof.rejected[t]} rejected suggestion(s) count against this theme`);
      return {
        themeId: th.id,
        path: th.path,
        exemplars: prof.positives[t]!,
        transcripts: prof.positiveTranscripts[t]!,
        topTerms: prof.topTerms[t]!,
        threshold: thresholds[t]!,
        expectedPrecision,
        expectedRecall,
        seedOnly: seedOnly[t]!,
        tooFew: tooFew[t]!,
        warnings,
      };
    });
    for (const { a, b, cos } of prof.overlaps) {
      reports[a]!.warnings.push(`overlaps strongly with theme ${themes[b]!.path} (centroid cosine ${cos.toFixed(2)})`);
      reports[b]!.warnings.push(`overlaps strongly with theme ${themes[a]!.path} (centroid cosine ${cos.toFixed(2)})`);
    }

    progress(1);
    const codedPassages = labelsInBatch.filter((l) => l.length).length;
    this.st = {
      version: STATE_VERSION,
      options: o,
      tfidf: this.vec.state,
      themes: themes.map((th, t) => ({ id: th.id, path: th.path, profiled: profiled[t]!, seedOnly: seedOnly[t]!, tooFew: tooFew[t]!, scored: scored[t]! })),
      fewshot: few.state,
      thresholds,
      evidence: this.evidence.map((m) => {
        const indices = [...m.keys()].sort((a, b) => a - b);
        return { indices, weights: indices.map((i) => m.get(i)!) };
      }),
      reports,
      coded: {
        passages: codedPassages,
        transcripts: codedTranscript.reduce((a, b) => a + b, 0),
        codings: codings.length - ignored,
        ignoredCodings: ignored,
        negatives: usedNegatives,
      },
    };
    // The few-example scorer's counts are summarised by the confidences they gave (their JSON
    // would be millions of numbers): its calibration, threshold and options are hashed as text.
    const f = this.st.fewshot;
    const light = { ...this.st, fewshot: { options: f.options, calibration: f.calibration, seedCalibration: f.seedCalibration, threshold: f.threshold, seedScale: f.seedScale } };
    // The scores (log-odds) a block at a time, as the bytes of one array of them: the whole
    // array was 60 MB more at the end of a fit on 20,000 answers.
    this.fp = fingerprint([JSON.stringify(light), prof.digest, { pieces: logOddsBlocks(this.conf) }, this.conf]);
    return this;
  }

  /**
   * What the fit takes from the theme profiles: the evidence terms (for the model), each
   * theme's counts and top terms, the pairs of themes that overlap strongly, and a digest of the
   * profiles for the fingerprint.
   */
  private profileFacts(corpus: Corpus, tree: Tree) {
    const o = this.options;
    const nT = corpus.themes;
    const prof = new Profiles(corpus, o.priorStrength, o.rocchio);
    const profiled = (t: number) => prof.positives[t]! > 0;
    // Overlap between themes that are not ancestor and descendant.
    const overlaps: { a: number; b: number; cos: number }[] = [];
    for (let a = 0; a < nT; a++) {
      for (let b = a + 1; b < nT; b++) {
        if (!profiled(a) || !profiled(b) || tree.ancestors[a]!.includes(b) || tree.ancestors[b]!.includes(a)) continue;
        const cos = prof.centroidCosine(a, b);
        if (cos > o.overlapCosine) overlaps.push({ a, b, cos });
      }
    }
    return {
      evidence: this.evidenceOf(prof, nT),
      positives: prof.positives,
      rejected: prof.rejected,
      positiveTranscripts: prof.positiveTranscripts,
      topTerms: Array.from({ length: nT }, (_, t) => (profiled(t) ? this.topTerms(prof, t, 10) : [])),
      overlaps,
      digest: fingerprint([prof.s, prof.y]),
    };
  }

  /**
   * A model from a stored state alone (the few-example scorer's): it scores the given passages,
   * which need not be the ones it was fitted on, exactly as the fit scored those it saw.
   * @param passages whole transcripts, in transcript order (context reads a passage's neighbours)
   * @param fp the fingerprint the fit gave (a state does not hold its own)
   * @param opts.again more models will be made from this state object: what scoring it prepares
   *   (the counts with the soft shares) is kept with it, not made again each time
   */
  static fromState(state: SuggesterState, themes: ThemeInfo[], passages: ModelPassage[], fp: string, opts: { again?: boolean } = {}): ThemeSuggester {
    if (state.version !== STATE_VERSION) throw new Error('this stored model is of another version: fit again');
    if (themes.length !== state.themes.length || themes.some((th, t) => th.id !== state.themes[t]!.id)) throw new Error('the stored model was fitted on other themes: fit again');
    const m = new ThemeSuggester(state.options);
    m.st = state;
    m.fp = fp;
    m.tree = buildTree(themes);
    m.passages = passages;
    m.pIndex = new Map(passages.map((p, i) => [p.id, i]));
    m.vec = TfidfVectorizer.fromState(state.tfidf);
    m.checkable = Uint8Array.from({ length: m.vec.size }, (_, i) => (citable(m.vec.term(i)) ? 1 : 0));
    m.termLists = state.options.bigrams ? passages.map((p) => withBigrams(p.terms, true)) : passages.map((p) => p.terms);
    m.counts = m.termLists.map((l) => m.vec.vectorAndCounts(l).counts);
    m.evidence = state.evidence.map((e) => new Map(e.indices.map((i, k) => [i, e.weights[k]!])));
    m.useCells(scoreFewshot(state.fewshot, themes, passages, opts.again), state.fewshot);
    return m;
  }

  /**
   * Takes the few-example scorer's confidences, context parts, nearest coded passages and their
   * similarities: its own arrays, not copies (nothing else keeps them).
   */
  private useCells(cells: ScoredCells, few: FewshotState): void {
    this.conf = cells.conf;
    this.ctxPart = cells.context;
    this.nearest = cells.nearest;
    this.nearestSim = cells.knn;
    this.exemplarIds = few.coded.map((c) => c.id);
    for (let cell = 0; cell < this.conf.length; cell++) if (cells.nearest[cell]! < 0) this.nearestSim[cell] = 0;
  }

  /** Per theme, the citable terms distinctive of it (excess weight > 0, z > 1.96). */
  private evidenceOf(prof: Profiles, nT: number): Map<number, number>[] {
    const delta = prof.fullDelta();
    const z = prof.fullZ();
    const out = Array.from({ length: nT }, () => new Map<number, number>());
    for (let l = 0; l < prof.vc; l++) {
      const i = prof.termOf[l]!;
      if (!this.checkable[i]) continue;
      for (let t = 0; t < nT; t++) {
        const d = delta[l * nT + t]!;
        if (d > 0 && z[l * nT + t]! > 1.96) out[t]!.set(i, d);
      }
    }
    return out;
  }

  /** Learned state as plain data (profiles' sums are summarised by the fingerprint). */
  get state(): SuggesterState {
    if (!this.st) throw new Error('ThemeSuggester: call fit() first');
    return this.st;
  }

  get fingerprint(): string {
    return this.fp;
  }

  themeReports(): ThemeReport[] {
    return this.state.reports;
  }

  /**
   * Lets go of the per-cell arrays (confidences, context parts, nearest coded passages): a large
   * batch's are hundreds of MB, and a command that has its predictions still stores them and
   * prints them. The state, fingerprint and theme reports stay; predict and scores can no longer
   * be called.
   */
  dropScores(): void {
    this.conf = new Float64Array(0);
    this.ctxPart = new Float64Array(0);
    this.nearest = new Int32Array(0);
    this.nearestSim = new Float64Array(0);
    this.scoresDropped = true;
  }

  /**
   * Suggestions for the given passages (default: every passage given to fit), in input order.
   * @param opts.reasons how many of the best candidates get reasons (default 3); chosen
   * candidates always do. Reasons cost more than the scores, so bulk scoring can ask for fewer.
   * @param opts.progress told the share of the passages done (0 to 1)
   * @param opts.shape applied to each passage's suggestions as it is made (say, to keep the best few)
   */
  predict(passageIds?: string[], opts: { reasons?: number; progress?: Progress; shape?: (p: PassageSuggestions) => PassageSuggestions } = {}): PassageSuggestions[] {
    const withReasons = opts.reasons ?? 3;
    const progress = opts.progress ?? (() => {});
    // A caller keeping a few candidates per passage says so here: a large batch's every candidate
    // of every theme (millions of objects) is then never held at once.
    const shape = opts.shape;
    const st = this.state;
    const nT = st.themes.length;
    const ids = passageIds ?? this.passages.map((p) => p.id);
    const scoredThemes: number[] = [];
    for (let t = 0; t < nT; t++) if (st.themes[t]!.scored) scoredThemes.push(t);
    const seeds = this.tree.themes.map((th) => this.seedList(th));
    if (this.scoresDropped) throw new Error('ThemeSuggester: predict after dropScores()');
    const conf = this.conf;
    return ids.map((id, i) => {
      if (i % 500 === 0) progress(i / ids.length);
      const p = this.pIndex.get(id);
      if (p === undefined) throw new UserError(`passage ${id} is not in the study the model was fitted on`);
      const o = p * nT;
      // (Equal confidences have equal scores: ties go by theme.)
      const scored = scoredThemes.slice().sort((a, b) => conf[o + b]! - conf[o + a]! || a - b);
      const above = scored.filter((t) => conf[o + t]! >= st.thresholds[t]!);
      const chosen = chooseThemes(this.tree, above);
      const explain = scored.filter((t, r) => r < withReasons || chosen.has(t));
      const have = explain.some((t) => seeds[t]!.length) ? new Set(this.termLists[p]) : null;
      const candidates: Candidate[] = scored.map((t, r) => ({
        themeId: st.themes[t]!.id,
        score: logOdds(conf[o + t]!),
        confidence: conf[o + t]!,
        aboveThreshold: conf[o + t]! >= st.thresholds[t]!,
        chosen: chosen.has(t),
        reasons: r < withReasons || chosen.has(t) ? this.reasons(p, t, seeds[t]!, have, chosen.has(t)) : NO_REASONS,
      }));
      const out = { passageId: id, transcript: this.passages[p]!.transcript, candidates, unclaimed: chosen.size === 0 };
      return shape ? shape(out) : out;
    });
  }

  /**
   * The given passages' confidences and chosen themes (default: every passage given to fit), in
   * input order: predict()'s numbers without its candidate objects or reasons, for readers that
   * go through every theme of every passage. Each passage's confidences are a view of the
   * model's own array (no copy), one row of it; do not write to them.
   */
  scores(passageIds?: string[], opts: { progress?: Progress } = {}): ThemeScores {
    if (this.scoresDropped) throw new Error('ThemeSuggester: scores after dropScores()');
    const progress = opts.progress ?? (() => {});
    const st = this.state;
    const nT = st.themes.length;
    const ids = passageIds ?? this.passages.map((p) => p.id);
    const scored: number[] = [];
    for (let t = 0; t < nT; t++) if (st.themes[t]!.scored) scored.push(t);
    const passages = ids.map((id, i): PassageScores => {
      if (i % 500 === 0) progress(i / ids.length);
      const p = this.pIndex.get(id);
      if (p === undefined) throw new UserError(`passage ${id} is not in the study the model was fitted on`);
      const confidence = this.conf.subarray(p * nT, (p + 1) * nT);
      const above = scored.filter((t) => confidence[t]! >= st.thresholds[t]!);
      // Best first and ties by theme, as predict() ranks its candidates.
      const chosen = [...chooseThemes(this.tree, above)].sort((a, b) => confidence[b]! - confidence[a]! || a - b);
      return { passageId: id, transcript: this.passages[p]!.transcript, confidence, chosen };
    });
    return { themeIds: st.themes.map((t) => t.id), scored, thresholds: st.thresholds, passages };
  }

  private reasons(p: number, t: number, seeds: string[], have: Set<string> | null, chosen = false): Reason[] {
    const st = this.state;
    const nT = st.themes.length;
    const out: Reason[] = [];
    // A parent chosen over its sub-themes: the evidence is for it and none of them clears.
    if (chosen && !this.tree.isLeaf[t]) out.push({ kind: 'parent', theme: this.tree.themes[t]!.name });
    if (st.themes[t]!.profiled) {
      const terms = this.matchedTerms(p, t, 5);
      if (terms.length) out.push({ kind: 'terms', terms });
      const ex = this.nearest[p * nT + t]!;
      if (ex >= 0) out.push({ kind: 'exemplar', passageId: this.exemplarIds[ex]!, similarity: round(this.nearestSim[p * nT + t]!) });
      // Reasons say why a theme is suggested: context that points elsewhere (a negative part) is
      // not one, and would read as "the surrounding passages point here too (-0.15)".
      if (this.ctxPart[p * nT + t]! > 0) out.push({ kind: 'context', weight: round(this.ctxPart[p * nT + t]!) });
    }
    const matched = have ? seeds.filter((s) => have.has(s)) : [];
    if (matched.length) out.push({ kind: 'seeds', terms: matched });
    if (st.themes[t]!.seedOnly) out.push({ kind: 'seed-only' });
    return out;
  }

  /** The passage's terms that are distinctive of the theme (z > 1.96), by contribution. */
  private matchedTerms(p: number, t: number, n: number): { term: string; weight: number }[] {
    const c = this.counts[p]!;
    const evidence = this.evidence[t]!;
    // The n best by a running selection (this runs for every reason of every passage): weights
    // and term indices only, the term strings looked up for ties and for the n kept.
    const bw: number[] = [];
    const bi: number[] = [];
    const before = (w: number, i: number, j: number) => w > bw[j]! || (w === bw[j]! && this.vec.term(i) < this.vec.term(bi[j]!));
    for (let k = 0; k < c.indices.length; k++) {
      const d = evidence.get(c.indices[k]!);
      if (d === undefined) continue;
      const w = round(c.values[k]! * d);
      const i = c.indices[k]!;
      if (bw.length === n && !before(w, i, n - 1)) continue;
      let j = bw.length < n ? bw.length : n - 1;
      if (bw.length < n) bw.push(w), bi.push(i);
      while (j > 0 && before(w, i, j - 1)) {
        bw[j] = bw[j - 1]!;
        bi[j] = bi[j - 1]!;
        j--;
      }
      bw[j] = w;
      bi[j] = i;
    }
    return bw.map((weight, j) => ({ term: this.vec.term(bi[j]!), weight }));
  }

  /** The theme's most distinctive terms by z (rounded, as reported), ties by term. */
  private topTerms(prof: Profiles, t: number, n: number): TermWeight[] {
    const { nT, vc, termOf } = prof;
    const delta = prof.fullDelta();
    const z = prof.fullZ();
    // Only the terms whose rounded z reaches the n-th largest need an object.
    const rz: number[] = [];
    for (let l = 0; l < vc; l++) if (delta[l * nT + t]! > 0 && this.checkable[termOf[l]!]) rz.push(round(z[l * nT + t]!));
    if (!rz.length) return [];
    const cut = rz.sort((a, b) => b - a)[Math.min(n, rz.length) - 1]!;
    const out: TermWeight[] = [];
    for (let l = 0; l < vc; l++) {
      const d = delta[l * nT + t]!;
      if (d <= 0 || !this.checkable[termOf[l]!]) continue;
      const zz = round(z[l * nT + t]!);
      if (zz >= cut) out.push({ term: this.vec.term(termOf[l]!), weight: round(d), z: zz });
    }
    return out.sort((a, b) => b.z - a.z || (a.term < b.term ? -1 : 1)).slice(0, n);
  }

  /** Seeds as single lemmas (a multi-word seed also as its words). */
  private seedList(th: ThemeInfo): string[] {
    const out = new Set<string>();
    for (const s of th.seeds) {
      const words = s.toLowerCase().split(/\s+/).filter(Boolean);
      if (words.length > 1 && this.options.bigrams) out.add(words.join(' '));
      for (const w of words) out.add(w);
    }
    return [...out];
  }

}

/**
 * The reasons of a candidate given none: one frozen list shared by all of them (a bulk run
 * returns a candidate for every theme of every passage, most of them without reasons).
 */
const NO_REASONS = Object.freeze([]) as unknown as Reason[];

/** Whether a term can be cited as evidence: a word of two letters or more, not a function word. */
export function citable(term: string): boolean {
  return !isFunctionWord(term) && /^\p{L}[\p{L}'’-]*\p{L}$/u.test(term);
}

/** A candidate's score: the log-odds of its confidence, kept off 0 and 1. */
function logOdds(conf: number): number {
  const c = Math.min(Math.max(conf, 1e-12), 1 - 1e-12);
  return Math.log(c / (1 - c));
}

function round(v: number): number {
  return Math.round(v * 1e4) / 1e4;
}
