/**
 * ThemeSuggester: learns a profile for every theme from the coded batch and suggests themes for
 * passages, with calibrated confidences and reasons.
 *
 * The model, chosen by measurement (docs/suggest-experiments.md):
 *  1. signals per (passage, theme) from the profiles (centroid cosine, weighted log-odds,
 *     optionally nearest exemplars), every one computed leave-one-transcript-out (LOTO) for
 *     transcripts with codings or rejections, so the batch yields honest scores for free; the
 *     LOTO signals of a held-out transcript's own themes get back the gain of one more transcript
 *     (estimated leave-two-out), so that the batch looks like a new transcript does;
 *  2. a base score u = shared combination of the standardised signals;
 *  3. context: u of the neighbouring passages, of the rest of the transcript (distance decay and
 *     scaling chosen by cross-validated log-loss) and of the interviewer's question, with the
 *     passage's length and the speaker's role, combined by a conditional logit over the themes
 *     at the same depth of the template plus "none", one intercept per theme; its probabilities
 *     are the confidences (no separate per-theme calibration: that overfitted a few transcripts);
 *  4. rejected suggestions count against their theme: a Rocchio share of their vectors is taken
 *     from the theme's profile, their words join the theme's "rest" in the log-odds, and each is
 *     an observation "not this theme" for the conditional logit;
 *  5. per-theme thresholds meeting the target precision on the LOTO confidences.
 */
import { UserError } from '../errors.js';
import { isStopWord } from '../text/stopwords.js';
import { withBigrams } from '../text/terms.js';
import { isFunctionWord } from '../text/stopwords.js';
import { TfidfVectorizer, type TfidfState } from '../text/tfidf.js';
import { cosine, type SparseVector } from '../math/sparse.js';
import { calibrate, fitPlatt, type Platt } from './calibrate.js';
import { choiceLoss, fitChoice, type ChoiceData, type ChoiceModel } from './choice.js';
import { fitGrouped } from './logistic.js';
import { adjacent, question, transcript as transcriptContext } from './context.js';
import { fingerprint } from './fingerprint.js';
import { MIN_EXAMPLES, MIN_TRANSCRIPTS, themeStrength } from './strength.js';
import { fitFewshot, scoreFewshot, type FewshotOptions, type FewshotState, type ScoredCells } from './fewshot.js';
import { buildTree, chooseThemes, rolledUpLabels, type Tree } from './hierarchy.js';
import { CENTROID, EXEMPLARS, LOGODDS, Profiles, SIGNALS, type Corpus } from './profiles.js';
import { chooseThreshold, precisionRecallAt } from './thresholds.js';
import type {
  Candidate,
  Coding,
  ModelPassage,
  PassageSuggestions,
  Reason,
  SignalName,
  SuggesterOptions,
  TermWeight,
  ThemeInfo,
  ThemeReport,
} from './types.js';

const BASE_SIGNALS: SignalName[] = ['centroid', 'logodds', 'exemplars'];
const BASE_INDEX: Record<string, number> = { centroid: CENTROID, logodds: LOGODDS, exemplars: EXEMPLARS };
/** Quantiles of the coded passages' log length at which the length effect may bend. */
const LENGTH_KNOTS = [0.1, 0.25, 0.5];
/** Partners averaged in the leave-two-out estimate (3 measured no better than 1). */
const PARTNERS = 1;
/** Newton steps a context candidate gets before the candidates are compared. */
const SCREEN_STEPS = 2;
/** Newton steps of the base layer. */
const BASE_STEPS = 4;

export type ResolvedOptions = Required<Omit<SuggesterOptions, 'signals' | 'fewshot'>> & { signals: Record<SignalName, boolean>; fewshot: FewshotOptions };

export function resolveOptions(o: SuggesterOptions = {}): ResolvedOptions {
  return {
    targetPrecision: o.targetPrecision ?? 0.7,
    bigrams: o.bigrams ?? false,
    minExamples: o.minExamples ?? MIN_EXAMPLES,
    minTranscripts: o.minTranscripts ?? MIN_TRANSCRIPTS,
    priorStrength: o.priorStrength ?? 500,
    neighbours: o.neighbours ?? 5,
    decays: o.decays ?? [0.3, 0.6, 0.9, 1],
    // The root scaling measured as well as choosing between both by cross-validation, at half the fits.
    contextScales: o.contextScales ?? ['sqrt'],
    overlapCosine: o.overlapCosine ?? 0.8,
    ridge: o.ridge ?? 1,
    competition: o.competition ?? 'level',
    rocchio: o.rocchio ?? 0.25,
    looCorrection: o.looCorrection ?? true,
    scorer: o.scorer ?? 'fewshot',
    fewshot: o.fewshot ?? {},
    signals: {
      centroid: o.signals?.centroid ?? true,
      logodds: o.signals?.logodds ?? true,
      exemplars: o.signals?.exemplars ?? false,
      // Off: a transcript context with decay 0.3 says the same, and the two together split one
      // effect into opposite-signed weights (docs/suggest-experiments.md).
      adjacent: o.signals?.adjacent ?? false,
      transcript: o.signals?.transcript ?? true,
      question: o.signals?.question ?? true,
      length: o.signals?.length ?? true,
    },
  };
}

/** A standardised shared layer: which inputs, their scaling, and the weights. */
export interface LayerState {
  inputs: string[];
  mean: number[];
  sd: number[];
  weights: number[];
  /** Per theme (index as in `themes`); themes the layer was not trained on get their level's mean. */
  intercepts: number[];
}

export interface SuggesterState {
  version: 3;
  options: ResolvedOptions;
  tfidf: TfidfState;
  themes: { id: string; path: string; profiled: boolean; seedOnly: boolean; tooFew: boolean; scored: boolean }[];
  /** The few-example scorer's learned state, when it gave the confidences. */
  fewshot: FewshotState | null;
  base: LayerState;
  context: LayerState & { decay: number; scale: 'mean' | 'sqrt'; logLoss: Record<string, number> };
  /** Whether a passage is coded at all, from its log length (a spline with these knots) and role. */
  substance: { knots: number[]; interviewer: boolean; mean: number[]; sd: number[]; weights: number[]; intercept: number } | null;
  /** Maps a seed-only theme's cosine to its seed profile into a confidence (pooled over themes). */
  seedCalibrator: Platt | null;
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

/** One input of a layer: a value per (passage, theme) cell, or per passage. */
interface Column {
  name: string;
  cell?: Float64Array;
  passage?: Float64Array;
}

/** Training observations of the layers: choice sets over cells (passage * nT + theme). */
interface Sets {
  cells: Int32Array;
  /** Theme of each row (cells % nT). */
  theme: Int32Array;
  y: Uint8Array;
  start: Int32Array;
  partial: Uint8Array;
}

/** Called with the share of the work done so far, 0 to 1. */
export type Progress = (done: number) => void;

/**
 * How far the fit is after each step, as a share of it: read off a CPU profile of the benchmark
 * study (folds 0.35 s, leave-two-out correction 0.1 s, layers 0.5 s, the rest 0.35 s of 1.3 s).
 */
const FIT_SHARES = { folds: 0.27, correction: 0.35, base: 0.45, context: 0.75 };

export class ThemeSuggester {
  readonly options: ResolvedOptions;
  private st: SuggesterState | null = null;
  private fp = '';
  // Fitted data kept for predict() and reasons.
  private passages: ModelPassage[] = [];
  private pIndex = new Map<string, number>();
  private tree!: Tree;
  private vec!: TfidfVectorizer;
  private profiles!: Profiles;
  private corpus!: Corpus;
  private termLists: string[][] = [];
  /** Raw term counts of each passage (same vocabulary as `vec`). */
  private counts: SparseVector[] = [];
  /** Per theme: vocabulary index -> excess weight, for the terms a reason may cite. */
  private evidence: Map<number, number>[] = [];
  /** What `nearest` indexes: the coded passages' ids (few-example scorer) or every passage's. */
  private exemplarIds: string[] = [];
  /** [passage][theme] combined score and confidence. */
  private score = new Float64Array(0);
  private conf = new Float64Array(0);
  private ctxPart = new Float64Array(0);
  private qPart = new Float64Array(0);
  private nearest = new Int32Array(0);
  private nearestSim = new Float64Array(0);
  private seedVecs: (SparseVector | null)[] = [];
  /**
   * Per vocabulary term: whether a reason may cite it. Function words, pronouns, titles, numbers
   * and one-letter lemmas still count in the scores (measured: taking them out of the model lost
   * 0.01 of top-1 on the interviews benchmark) but a researcher cannot check them as evidence.
   */
  private checkable = new Uint8Array(0);

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
    const corpus: Corpus = (this.corpus = { x, c, vocabulary: this.vec.size, transcriptOf, members, codedTranscript, labels: labelsInBatch, negatives: negs, themes: nT });
    const prof = (this.profiles = new Profiles(corpus, o.priorStrength, o.signals.exemplars ? o.neighbours : 0, o.rocchio));
    this.counts = c;
    this.exemplarIds = passages.map((p) => p.id);
    this.evidence = this.evidenceOf(prof, nT);

    const profiled = themes.map((_, t) => prof.positives[t]! > 0);
    const seedOnly = themes.map((th, t) => !profiled[t] && this.seedTerms(th).length > 0);
    const tooFew = themes.map((_, t) => profiled[t]! && (prof.positives[t]! < o.minExamples || prof.positiveTranscripts[t]! < o.minTranscripts));

    const nP = passages.length;
    // The layers' state, kept empty when the few-example scorer gives the confidences.
    let sets: Sets = { cells: new Int32Array(0), theme: new Int32Array(0), y: new Uint8Array(0), start: Int32Array.of(0), partial: new Uint8Array(0) };
    let base: LayerState = { inputs: [], mean: [], sd: [], weights: [], intercepts: [] };
    let substance: SuggesterState['substance'] = null;
    const lossBy: Record<string, number> = {};
    let ctx: { layer: LayerState; decay: number; scale: 'mean' | 'sqrt' } = { layer: base, decay: NaN, scale: 'sqrt' };
    const rowsOf: number[][] = themes.map(() => []);
    let seedCalibrator: Platt | null = null;
    this.nearest = new Int32Array(nP * nT).fill(-1);
    this.nearestSim = new Float64Array(nP * nT);
    this.score = new Float64Array(nP * nT);
    this.ctxPart = new Float64Array(nP * nT);
    this.qPart = new Float64Array(nP * nT);
    this.conf = new Float64Array(nP * nT);
    this.seedVecs = themes.map(() => null);
    if (o.scorer === 'layers') {
    // 1. LOTO signals of every passage (full profiles for transcripts with no labels).
    const F = new Float64Array(nP * nT * SIGNALS);
    const valid = new Uint8Array(nP * nT);
    this.nearest = new Int32Array(nP * nT);
    this.nearestSim = new Float64Array(nP * nT);
    members.forEach((m, ti) => {
      if (ti % 25 === 0) progress(FIT_SHARES.folds * (ti / members.length));
      const fs = prof.foldSignals(ti);
      m.forEach((p, mi) => {
        F.set(fs.f.subarray(mi * nT * SIGNALS, (mi + 1) * nT * SIGNALS), p * nT * SIGNALS);
        this.nearest.set(fs.nearest.subarray(mi * nT, (mi + 1) * nT), p * nT);
        this.nearestSim.set(fs.nearestSim.subarray(mi * nT, (mi + 1) * nT), p * nT);
        for (let t = 0; t < nT; t++) valid[p * nT + t] = fs.valid[t]! & (profiled[t] ? 1 : 0);
      });
    });
    progress(FIT_SHARES.folds);
    if (o.looCorrection) this.correctLoto(F, prof, tree, members, codedTranscript, labelsInBatch);
    progress(FIT_SHARES.correction);

    // Competition groups: the profiled themes at one depth (or with one parent). Every profiled
    // theme trains, those with too few codings too: a theme coded in one transcript only has no
    // cross-validated positive, and the fit says so with a very low intercept (it is not
    // suggested until a second transcript has it); given a base-rate intercept instead, its
    // one-passage profile scored far out of the range the layers were fitted on.
    const levelOf = themes.map((_, t) => (o.competition === 'siblings' ? tree.parent[t]! : o.competition === 'none' ? t : tree.ancestors[t]!.length));
    const groupOf = new Map<number, number[]>();
    themes.forEach((_, t) => {
      if (profiled[t]) (groupOf.get(levelOf[t]!) ?? groupOf.set(levelOf[t]!, []).get(levelOf[t]!)!).push(t);
    });
    const groups = [...groupOf.values()];
    sets = trainingSets(groups, valid, members, codedTranscript, labelsInBatch, negs, nT);

    // 2. Base layer.
    const baseInputs = BASE_SIGNALS.filter((s) => o.signals[s]);
    if (!baseInputs.length) throw new Error('at least one of the signals centroid, logodds, exemplars must be on');
    const baseCols: Column[] = baseInputs.map((s) => {
      const col = new Float64Array(nP * nT);
      for (let cell = 0; cell < nP * nT; cell++) col[cell] = F[cell * SIGNALS + BASE_INDEX[s]!]!;
      return { name: s, cell: col };
    });
    // u only feeds the context features: a few Newton steps place it well enough.
    base = fitLayer(baseCols, sets, nT, o.ridge, undefined, BASE_STEPS).layer;
    progress(FIT_SHARES.base);
    const u = new Float64Array(nP * nT);
    for (let j = 0; j < baseCols.length; j++) {
      const w = base.weights[j]! / base.sd[j]!;
      const m = base.mean[j]!;
      const col = baseCols[j]!.cell!;
      for (let cell = 0; cell < nP * nT; cell++) u[cell] = u[cell]! + w * (col[cell]! - m);
    }

    // 3. Context layer, the decay and scaling chosen by log-loss on the LOTO sets.
    const role = passages.map((p) => p.role);
    const ctxIn = { u, themes: nT, members, role };
    const hasQuestion = o.signals.question && passages.some((p, i) => p.role === 'participant' && i > 0 && members[transcriptOf[i]!]!.some((q) => q < i && passages[q]!.role === 'interviewer'));
    const fixed: Column[] = [{ name: 'base', cell: u }];
    if (o.signals.adjacent) fixed.push({ name: 'adjacent', cell: adjacent(ctxIn) });
    if (hasQuestion) fixed.push({ name: 'question', cell: question(ctxIn) });
    const knots: number[] = [];
    if (o.signals.length) {
      // Short turns ("yes", "mm") and interviewer turns are seldom coded at all. Whether a passage
      // is coded, from its log length (a linear spline bending at quantiles) and the speaker's
      // role, is fitted on its own first (one row a passage: quick), and its logit enters the
      // layer as one input; the spline inside the layer made Newton crawl along its collinear terms.
      const len = Float64Array.from(passages, (p) => Math.log(1 + (p.words ?? p.terms.length)));
      const rowsP = members.flatMap((m, ti) => (codedTranscript[ti] ? m : []));
      const sorted = rowsP.map((p) => len[p]!).sort((a, b) => a - b);
      for (const q of LENGTH_KNOTS) {
        const k = sorted[Math.floor(q * (sorted.length - 1))]!;
        if (!knots.includes(k)) knots.push(k);
      }
      const roles = new Set(rowsP.map((p) => role[p]));
      const interviewer = roles.size > 1;
      const feats = (p: number) => [len[p]!, ...knots.map((k) => Math.max(0, len[p]! - k)), ...(interviewer ? [role[p] === 'interviewer' ? 1 : 0] : [])];
      const k = 1 + knots.length + (interviewer ? 1 : 0);
      const raw = rowsP.map(feats);
      const mean = Array.from({ length: k }, (_, j) => raw.reduce((a, r) => a + r[j]!, 0) / Math.max(1, raw.length));
      const sd = Array.from({ length: k }, (_, j) => Math.sqrt(raw.reduce((a, r) => a + (r[j]! - mean[j]!) ** 2, 0) / Math.max(1, raw.length)) || 1);
      const xs = new Float64Array(raw.length * k);
      raw.forEach((r, i) => r.forEach((v, j) => (xs[i * k + j] = (v - mean[j]!) / sd[j]!)));
      const yCoded = Uint8Array.from(rowsP, (p) => (labelsInBatch[p]!.length ? 1 : 0));
      const m = fitGrouped({ x: xs, k, y: yCoded, group: new Int32Array(raw.length), groups: 1 }, o.ridge);
      substance = { knots, interviewer, mean, sd, weights: m.weights, intercept: m.intercepts[0]! };
      const logit = Float64Array.from(passages, (_, p) => feats(p).reduce((a, v, j) => a + (m.weights[j]! * (v - mean[j]!)) / sd[j]!, m.intercepts[0]!));
      fixed.push({ name: 'length', passage: logit });
    }
    const decays = o.signals.transcript ? o.decays : [NaN];
    const scales = o.signals.transcript ? o.contextScales : (['mean'] as const);
    let best: { layer: LayerState; data: ChoiceData; loss: number; decay: number; scale: 'mean' | 'sqrt'; cols: Column[]; index: number } | null = null;
    // The first candidate starts where the base layer and the length model leave off: weight
    // sd(x) on a standardised x is weight 1 on x itself.
    const sdOf = (col: Column) => rowStats(col, sets, nT).sd;
    // With the length logit L at weight 1, P(coded) = sigmoid(L) when the intercepts are the
    // log shares of the themes among the coded (plus the mean of L, which standardising takes off).
    const lengthCol = fixed.find((c) => c.name === 'length');
    let warmIntercepts = base.intercepts;
    if (lengthCol) {
      const mu = rowStats(lengthCol, sets, nT).mean;
      const pos = new Float64Array(nT);
      const codedSets = new Float64Array(nT);
      for (let st = 0; st + 1 < sets.start.length; st++) {
        if (sets.partial[st]) continue;
        let any = 0;
        for (let r = sets.start[st]!; r < sets.start[st + 1]!; r++) any |= sets.y[r]!;
        for (let r = sets.start[st]!; r < sets.start[st + 1]!; r++) {
          if (any) codedSets[sets.theme[r]!]!++;
          pos[sets.theme[r]!] = pos[sets.theme[r]!]! + sets.y[r]!;
        }
      }
      warmIntercepts = Array.from(pos, (n, t) => (codedSets[t]! ? Math.log((n + 0.5) / (codedSets[t]! + 0.5)) + mu : base.intercepts[t]!));
    }
    const warm = {
      weights: [...fixed.map((c) => (c.name === 'base' || c.name === 'length' ? sdOf(c) : 0)), ...(o.signals.transcript ? [0] : [])],
      intercepts: warmIntercepts,
    };
    // The first candidate is fitted to convergence; the others are compared after a few Newton
    // steps from it (the loss has settled to a few parts in 10^4 by then), and only the winner
    // is then fitted to convergence.
    const candidates = scales.flatMap((scale) => decays.map((decay) => ({ scale, decay })));
    for (const [index, { scale, decay }] of candidates.entries()) {
      const cols = Number.isNaN(decay) ? fixed : [...fixed, { name: 'transcript', cell: transcriptContext(ctxIn, decay, scale) }];
      const { layer, data } = fitLayer(cols, sets, nT, o.ridge, best?.layer ?? warm, best ? SCREEN_STEPS : undefined);
      const loss = choiceLoss(layer, data);
      lossBy[Number.isNaN(decay) ? 'none' : `${scale} ${decay}`] = loss;
      if (!best || loss < best.loss - 1e-12) best = { layer, data, loss, decay, scale, cols, index };
    }
    if (best!.index > 0) {
      best!.layer = refitLayer(best!.layer, best!.data, o.ridge);
      best!.loss = choiceLoss(best!.layer, best!.data);
    }
    const won = best!;
    ctx = won;

    // Scores, the parts due to context (for reasons), and confidences within each group.
    this.score = new Float64Array(nP * nT);
    this.ctxPart = new Float64Array(nP * nT);
    this.qPart = new Float64Array(nP * nT);
    won.cols.forEach((col, j) => {
      const w = won.layer.weights[j]! / won.layer.sd[j]!;
      const m = won.layer.mean[j]!;
      const part = col.name === 'adjacent' || col.name === 'transcript' ? this.ctxPart : col.name === 'question' ? this.qPart : null;
      for (let cell = 0; cell < nP * nT; cell++) {
        const v = w * ((col.cell ? col.cell[cell]! : col.passage![(cell / nT) | 0]!) - m);
        this.score[cell] = this.score[cell]! + v;
        if (part) part[cell] = part[cell]! + v;
      }
    });
    for (let cell = 0; cell < nP * nT; cell++) this.score[cell] = this.score[cell]! + ctx.layer.intercepts[cell % nT]!;
    this.conf = new Float64Array(nP * nT);
    for (let p = 0; p < nP; p++) {
      for (const g of groups) {
        let mx = 0;
        for (const t of g) mx = Math.max(mx, this.score[p * nT + t]!);
        let sum = Math.exp(-mx);
        for (const t of g) sum += Math.exp(this.score[p * nT + t]! - mx);
        for (const t of g) this.conf[p * nT + t] = Math.exp(this.score[p * nT + t]! - mx) / sum;
      }
    }
    // Coding a sub-theme codes its parent too, so no parent may be less likely than its child;
    // the depths are fitted apart, and where they disagree the parent takes the child's value.
    const byDepth = themes.map((_, t) => t).sort((a, b) => tree.ancestors[b]!.length - tree.ancestors[a]!.length || a - b);
    for (const t of byDepth) {
      const up = tree.parent[t]!;
      if (up < 0 || !profiled[t] || !profiled[up]) continue;
      for (let p = 0; p < nP; p++) if (this.conf[p * nT + t]! > this.conf[p * nT + up]!) this.conf[p * nT + up] = this.conf[p * nT + t]!;
    }

    progress(FIT_SHARES.context);
    // 4. Seed-only themes: how a centroid cosine maps to a coding, pooled over all themes.
    for (let s = 0; s + 1 < sets.start.length; s++) {
      if (sets.partial[s]) continue;
      for (let r = sets.start[s]!; r < sets.start[s + 1]!; r++) rowsOf[sets.theme[r]!]!.push(r);
    }
    const trainRows = rowsOf.flat();
    seedCalibrator = seedOnly.some(Boolean) && trainRows.length ? fitPlatt(trainRows.map((r) => F[sets.cells[r]! * SIGNALS + CENTROID]!), trainRows.map((r) => sets.y[r]!)) : null;
    this.seedVecs = themes.map((th, t) => (seedOnly[t] ? this.vec.vector(withBigrams(this.seedTerms(th), o.bigrams)) : null));
    for (let t = 0; t < nT; t++) {
      if (!seedOnly[t] || !seedCalibrator) continue;
      for (let p = 0; p < nP; p++) {
        const cos = cosine(x[p]!, this.seedVecs[t]!);
        this.score[p * nT + t] = cos;
        this.conf[p * nT + t] = calibrate(seedCalibrator, cos);
      }
    }

    }
    // The few-example scorer replaces the confidences (the profiles above still give reasons).
    if (o.scorer === 'fewshot') progress(0);
    const few =
      o.scorer === 'fewshot' ? fitFewshot(passages, codings, themes, { targetPrecision: o.targetPrecision, ...o.fewshot }, extra.negatives ?? [], (d) => progress(0.95 * d)) : null;
    const scored = themes.map((_, t) => (few ? few.state.themes[t]!.rolled > 0 || few.state.seeds[t]!.indices.length > 0 : profiled[t]! || (seedOnly[t]! && !!seedCalibrator)));
    const heldOutOf: number[][] = themes.map(() => []);
    if (few) {
      this.useCells(few.cells, few.state);
      few.heldOut.theme.forEach((t, i) => heldOutOf[t]!.push(i));
      const batch = codedTranscript.reduce((a, b) => a + b, 0);
      for (let t = 0; t < nT; t++) tooFew[t] = scored[t]! && themeStrength(few.state.themes[t]!.rolled, few.state.themes[t]!.transcripts, batch, true, o.minExamples, o.minTranscripts) === 'few examples';
    }

    // 5. Thresholds per theme, on the LOTO confidences of the coded batch.
    const thresholds = themes.map(() => (few ? few.state.threshold : o.targetPrecision));
    const reports: ThemeReport[] = themes.map((th, t) => {
      const warnings: string[] = [];
      let expectedPrecision: number | null = null;
      let expectedRecall: number | null = null;
      if (few) {
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
      } else if (profiled[t] && !tooFew[t]) {
        const confs = rowsOf[t]!.map((r) => this.conf[sets.cells[r]!]!);
        const l = rowsOf[t]!.map((r) => sets.y[r]!);
        const choice = chooseThreshold(confs, l, o.targetPrecision);
        thresholds[t] = choice.threshold;
        expectedPrecision = choice.precision;
        expectedRecall = choice.recall;
        if (!choice.reached) {
          const at = precisionRecallAt(confs, l, choice.threshold);
          expectedPrecision = at.precision;
          expectedRecall = at.recall;
          warnings.push(`did not reach the target precision ${o.targetPrecision} on the coded batch; threshold set to ${o.targetPrecision}`);
        }
      } else if (tooFew[t]) {
        warnings.push(
          `too few examples: ${prof.positives[t]} coded passage(s) in ${prof.positiveTranscripts[t]} transcript(s) (needs ${o.minExamples} in ${o.minTranscripts}); confidence from the shared model, no expected precision or recall`,
        );
      } else if (seedOnly[t]) {
        warnings.push('no coded passage yet: profile from definition and seeds only; confidence not calibrated on this theme');
      } else {
        warnings.push('no coded passage, definition or seeds: not suggested');
      }
      if (prof.rejected[t]) warnings.push(`${prof.rejected[t]} rejected suggestion(s) count against this theme`);
      return {
        themeId: th.id,
        path: th.path,
        exemplars: prof.positives[t]!,
        transcripts: prof.positiveTranscripts[t]!,
        topTerms: profiled[t] ? this.topTerms(t, 10) : [],
        threshold: thresholds[t]!,
        expectedPrecision,
        expectedRecall,
        seedOnly: few ? scored[t]! && few.state.themes[t]!.rolled === 0 : seedOnly[t]!,
        tooFew: tooFew[t]!,
        warnings,
      };
    });
    // Overlap between themes that are not ancestor and descendant.
    for (let a = 0; a < nT; a++) {
      for (let b = a + 1; b < nT; b++) {
        if (!profiled[a] || !profiled[b] || tree.ancestors[a]!.includes(b) || tree.ancestors[b]!.includes(a)) continue;
        const cos = prof.centroidCosine(a, b);
        if (cos > o.overlapCosine) {
          reports[a]!.warnings.push(`overlaps strongly with theme ${themes[b]!.path} (centroid cosine ${cos.toFixed(2)})`);
          reports[b]!.warnings.push(`overlaps strongly with theme ${themes[a]!.path} (centroid cosine ${cos.toFixed(2)})`);
        }
      }
    }

    progress(1);
    const codedPassages = labelsInBatch.filter((l) => l.length).length;
    this.st = {
      version: 3,
      options: o,
      tfidf: this.vec.state,
      themes: themes.map((th, t) => ({ id: th.id, path: th.path, profiled: profiled[t]!, seedOnly: few ? scored[t]! && few.state.themes[t]!.rolled === 0 : seedOnly[t]!, tooFew: tooFew[t]!, scored: scored[t]! })),
      fewshot: few ? few.state : null,
      base,
      context: { ...ctx.layer, decay: ctx.decay, scale: ctx.scale, logLoss: lossBy },
      substance,
      seedCalibrator,
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
    const light = f ? { ...this.st, fewshot: { options: f.options, calibration: f.calibration, seedCalibration: f.seedCalibration, threshold: f.threshold, seedScale: f.seedScale } } : this.st;
    this.fp = fingerprint([JSON.stringify(light), prof.s, prof.y, this.score, this.conf]);
    return this;
  }

  /**
   * A model from a stored state alone (the few-example scorer's): it scores the given passages,
   * which need not be the ones it was fitted on, exactly as the fit scored those it saw.
   * @param passages whole transcripts, in transcript order (context reads a passage's neighbours)
   * @param fp the fingerprint the fit gave (a state does not hold its own)
   */
  static fromState(state: SuggesterState, themes: ThemeInfo[], passages: ModelPassage[], fp: string): ThemeSuggester {
    if (state.version !== 3 || !state.fewshot) throw new Error('this stored model cannot be reloaded (an older version, or not the few-example scorer): fit again');
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
    const n = passages.length * themes.length;
    m.score = new Float64Array(n);
    m.conf = new Float64Array(n);
    m.ctxPart = new Float64Array(n);
    m.qPart = new Float64Array(n);
    m.nearest = new Int32Array(n).fill(-1);
    m.nearestSim = new Float64Array(n);
    m.useCells(scoreFewshot(state.fewshot, themes, passages), state.fewshot);
    return m;
  }

  /** Takes the few-example scorer's confidences, context parts and nearest coded passages. */
  private useCells(cells: ScoredCells, few: FewshotState): void {
    this.conf = new Float64Array(cells.conf);
    this.ctxPart = new Float64Array(cells.context);
    this.exemplarIds = few.coded.map((c) => c.id);
    for (let cell = 0; cell < this.conf.length; cell++) {
      const c = Math.min(Math.max(this.conf[cell]!, 1e-12), 1 - 1e-12);
      this.score[cell] = Math.log(c / (1 - c));
      const ci = cells.nearest[cell]!;
      this.nearest[cell] = ci;
      this.nearestSim[cell] = ci >= 0 ? cells.raw[cell * 4 + 2]! : 0;
    }
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

  /**
   * LOTO signals understate a held-out transcript's own themes: their profiles lack it, while a
   * new transcript meets profiles with every coded transcript. For each coded transcript, a
   * partner sharing most of its themes is also left out; the change from leave-two-out to
   * leave-one-out estimates the gain of one more transcript, added back with the weight
   * (k - 2) / k that a 1/k learning curve gives (k = transcripts coded with the theme).
   */
  private correctLoto(F: Float64Array, prof: Profiles, tree: Tree, members: number[][], coded: Uint8Array, labels: number[][]): void {
    const nT = prof.nT;
    // Passages coded with each theme in each transcript: the share each adds to a profile.
    const countOf = members.map((m) => {
      const cnt = new Map<number, number>();
      for (const p of m) for (const t of labels[p]!) cnt.set(t, (cnt.get(t) ?? 0) + 1);
      return cnt;
    });
    const themesOf = countOf.map((c) => new Set(c.keys()));
    const codedList = members.map((_, ti) => ti).filter((ti) => coded[ti]);
    // A fixed hash breaks ties between equally good partners, so the choice is reproducible.
    const hash = (a: number, b: number) => (Math.imul(a + 1, 2654435761) ^ Math.imul(b + 1, 40503)) >>> 0;
    for (const ti of codedList) {
      const mine = themesOf[ti]!;
      // Partners: the coded transcripts sharing most leaf themes, ties broken by the hash.
      const ranked = codedList
        .filter((tj) => tj !== ti)
        .map((tj) => {
          let ov = 0;
          for (const t of themesOf[tj]!) if (mine.has(t) && tree.isLeaf[t]) ov++;
          return { tj, ov, h: hash(ti, tj) };
        })
        .filter((r) => r.ov > 0)
        .sort((a, b) => b.ov - a.ov || b.h - a.h)
        .slice(0, PARTNERS);
      const gain = new Float64Array(members[ti]!.length * nT * SIGNALS);
      const count = new Int32Array(nT);
      for (const { tj } of ranked) {
        const fs2 = prof.foldSignals(ti, tj, [...mine].filter((t) => themesOf[tj]!.has(t)));
        for (const t of mine) {
          if (!themesOf[tj]!.has(t) || !fs2.valid[t]) continue;
          count[t]!++;
          // The partner's gain, scaled to what this transcript adds to the theme.
          const scale = Math.min(3, countOf[ti]!.get(t)! / countOf[tj]!.get(t)!);
          members[ti]!.forEach((p, mi) => {
            for (let sg = 0; sg < SIGNALS; sg++) {
              const at = (mi * nT + t) * SIGNALS + sg;
              gain[at] = gain[at]! + scale * (F[(p * nT + t) * SIGNALS + sg]! - fs2.f[at]!);
            }
          });
        }
      }
      members[ti]!.forEach((p, mi) => {
        for (const t of mine) {
          if (!count[t]) continue;
          const k = prof.positiveTranscripts[t]!;
          const lam = Math.max(k - 2, 0) / k / count[t]!;
          for (let sg = 0; sg < SIGNALS; sg++) {
            const at = (p * nT + t) * SIGNALS + sg;
            F[at] = F[at]! + lam * gain[(mi * nT + t) * SIGNALS + sg]!;
          }
        }
      });
    }
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

  /** Suggestions for the given passages (default: every passage given to fit), in input order. */
  /**
   * @param opts.reasons how many of the best candidates get reasons (default 3); chosen
   * candidates always do. Reasons cost more than the scores, so bulk scoring can ask for fewer.
   * @param opts.progress told the share of the passages done (0 to 1)
   */
  predict(passageIds?: string[], opts: { reasons?: number; progress?: Progress } = {}): PassageSuggestions[] {
    const withReasons = opts.reasons ?? 3;
    const progress = opts.progress ?? (() => {});
    const st = this.state;
    const nT = st.themes.length;
    const ids = passageIds ?? this.passages.map((p) => p.id);
    const scoredThemes: number[] = [];
    for (let t = 0; t < nT; t++) if (st.themes[t]!.scored) scoredThemes.push(t);
    const seeds = this.tree.themes.map((th) => this.seedList(th));
    const conf = this.conf;
    const score = this.score;
    return ids.map((id, i) => {
      if (i % 500 === 0) progress(i / ids.length);
      const p = this.pIndex.get(id);
      if (p === undefined) throw new UserError(`passage ${id} is not in the study the model was fitted on`);
      const o = p * nT;
      const scored = scoredThemes.slice().sort((a, b) => conf[o + b]! - conf[o + a]! || score[o + b]! - score[o + a]! || a - b);
      const above = scored.filter((t) => conf[o + t]! >= st.thresholds[t]!);
      const chosen = chooseThemes(this.tree, above);
      const explain = scored.filter((t, r) => r < withReasons || chosen.has(t));
      const near = explain.length && !this.options.signals.exemplars && !st.fewshot ? this.profiles.nearestExemplars(p, explain) : null;
      const have = explain.some((t) => seeds[t]!.length) ? new Set(this.termLists[p]) : null;
      const candidates: Candidate[] = scored.map((t, r) => ({
        themeId: st.themes[t]!.id,
        score: score[o + t]!,
        confidence: conf[o + t]!,
        aboveThreshold: conf[o + t]! >= st.thresholds[t]!,
        chosen: chosen.has(t),
        reasons: r < withReasons || chosen.has(t) ? this.reasons(p, t, near, seeds[t]!, have, chosen.has(t)) : [],
      }));
      return { passageId: id, transcript: this.passages[p]!.transcript, candidates, unclaimed: chosen.size === 0 };
    });
  }

  private reasons(p: number, t: number, near: { nearest: Int32Array; sim: Float64Array } | null, seeds: string[], have: Set<string> | null, chosen = false): Reason[] {
    const st = this.state;
    const nT = st.themes.length;
    const out: Reason[] = [];
    // A parent chosen over its sub-themes: the evidence is for it and none of them clears.
    if (chosen && !this.tree.isLeaf[t]) out.push({ kind: 'parent', theme: this.tree.themes[t]!.name });
    if (st.themes[t]!.profiled) {
      const terms = this.matchedTerms(p, t, 5);
      if (terms.length) out.push({ kind: 'terms', terms });
      const ex = near ? near.nearest[t]! : this.nearest[p * nT + t]!;
      const sim = near ? near.sim[t]! : this.nearestSim[p * nT + t]!;
      if (ex >= 0) out.push({ kind: 'exemplar', passageId: near ? this.passages[ex]!.id : this.exemplarIds[ex]!, similarity: round(sim) });
      // Reasons say why a theme is suggested: context that points elsewhere (a negative part) is
      // not one, and would read as "the surrounding passages point here too (-0.15)".
      if (this.ctxPart[p * nT + t]! > 0) out.push({ kind: 'context', weight: round(this.ctxPart[p * nT + t]!) });
      if (this.qPart[p * nT + t]! > 0) out.push({ kind: 'question', weight: round(this.qPart[p * nT + t]!) });
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
  private topTerms(t: number, n: number): TermWeight[] {
    const { nT, vc, termOf } = this.profiles;
    const delta = this.profiles.fullDelta();
    const z = this.profiles.fullZ();
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

  /** Terms of a theme's definition and seeds; seeds count twice (they are chosen on purpose). */
  private seedTerms(th: ThemeInfo): string[] {
    // Without the edge's analysis, plain lower-case words of the definition less stop words.
    const def = th.definitionTerms ?? (th.definition.toLowerCase().match(/\p{L}[\p{L}'-]*/gu) ?? []).filter((w) => !isStopWord(w));
    const seeds = this.seedList(th).flatMap((s) => s.split(' '));
    return [...def, ...seeds, ...seeds];
  }


}

/** Whether a term can be cited as evidence: a word of two letters or more, not a function word. */
export function citable(term: string): boolean {
  return !isFunctionWord(term) && /^\p{L}[\p{L}'’-]*\p{L}$/u.test(term);
}

function round(v: number): number {
  return Math.round(v * 1e4) / 1e4;
}

/**
 * The layers' observations. Every passage of a coded transcript is a full set per group: the
 * themes it is coded with, or "none". A rejection outside a coded transcript is a partial set:
 * only "not this theme" is known. Rows are the themes whose fold profile is not empty.
 */
function trainingSets(
  groups: number[][],
  valid: Uint8Array,
  members: number[][],
  coded: Uint8Array,
  labels: number[][],
  negs: number[][],
  nT: number,
): Sets {
  const cells: number[] = [];
  const y: number[] = [];
  const start = [0];
  const partial: number[] = [];
  for (let ti = 0; ti < members.length; ti++) {
    for (const p of members[ti]!) {
      const full = coded[ti] === 1;
      if (!full && !negs[p]!.length) continue;
      for (const g of groups) {
        const before = cells.length;
        let hit = false;
        for (const t of g) {
          if (!valid[p * nT + t]) continue;
          const yes = full ? labels[p]!.includes(t) : negs[p]!.includes(t);
          hit ||= yes;
          cells.push(p * nT + t);
          y.push(yes ? 1 : 0);
        }
        if (cells.length === before || (!full && !hit)) {
          cells.length = before;
          y.length = before;
          continue;
        }
        start.push(cells.length);
        partial.push(full ? 0 : 1);
      }
    }
  }
  return { cells: Int32Array.from(cells), theme: Int32Array.from(cells, (c) => c % nT), y: Uint8Array.from(y), start: Int32Array.from(start), partial: Uint8Array.from(partial) };
}

/** Columns' values on the training rows, kept: the context candidates share all but one column. */
const rowCache = new WeakMap<Column, { sets: Sets; values: Float64Array; mean: number; sd: number }>();

/** A column's values on the training rows, with their mean and standard deviation (cached per column). */
function rowStats(col: Column, sets: Sets, nT: number): { values: Float64Array; mean: number; sd: number } {
  const hit = rowCache.get(col);
  if (hit && hit.sets === sets) return hit;
  const values = rowValues(col, sets, nT);
  const n = Math.max(values.length, 1);
  // Plain loops summing in the order reduce() did (same results, no closure per row).
  let sum = 0;
  for (let i = 0; i < values.length; i++) sum += values[i]!;
  const mean = sum / n;
  let ss = 0;
  for (let i = 0; i < values.length; i++) ss += (values[i]! - mean) ** 2;
  const entry = { sets, values, mean, sd: Math.sqrt(ss / n) || 1 };
  rowCache.set(col, entry);
  return entry;
}

/** A column's values on the training rows. */
function rowValues(col: Column, sets: Sets, nT: number): Float64Array {
  const n = sets.cells.length;
  const out = new Float64Array(n);
  const { cells } = sets;
  if (col.cell) for (let i = 0; i < n; i++) out[i] = col.cell[cells[i]!]!;
  else for (let i = 0; i < n; i++) out[i] = col.passage![(cells[i]! / nT) | 0]!;
  return out;
}

function choiceData(layer: Pick<LayerState, 'mean' | 'sd'>, cols: Column[], sets: Sets, nT: number, values?: Float64Array[]): ChoiceData {
  const k = cols.length;
  const n = sets.cells.length;
  const xs = new Float64Array(n * k);
  cols.forEach((col, j) => {
    const v = values?.[j] ?? rowValues(col, sets, nT);
    const m = layer.mean[j]!;
    const inv = 1 / layer.sd[j]!;
    for (let i = 0; i < n; i++) xs[i * k + j] = (v[i]! - m) * inv;
  });
  return { x: xs, k, theme: sets.theme, y: sets.y, setStart: sets.start, partial: sets.partial, themes: nT };
}

/**
 * Standardises the inputs over the training rows and fits the conditional logit; returns the
 * layer and the training data it was fitted on (for its loss).
 */
function fitLayer(
  cols: Column[],
  sets: Sets,
  nT: number,
  ridge: number,
  start?: ChoiceModel,
  maxIter?: number,
): { layer: LayerState; data: ChoiceData } {
  const stats = cols.map((col) => rowStats(col, sets, nT));
  const values = stats.map((c) => c.values);
  const mean = stats.map((c) => c.mean);
  const sd = stats.map((c) => c.sd);
  const data = choiceData({ mean, sd }, cols, sets, nT, values);
  // A start of another width (fewer inputs) is ignored by fitChoice.
  const m = fitChoice(data, ridge, 1e-3, start, maxIter);
  return { layer: { inputs: cols.map((c) => c.name), mean, sd, weights: m.weights, intercepts: m.intercepts }, data };
}

/** Fits a layer on to convergence from where it stopped, on the data it was fitted on. */
function refitLayer(layer: LayerState, data: ChoiceData, ridge: number): LayerState {
  const m = fitChoice(data, ridge, 1e-3, layer);
  return { ...layer, weights: m.weights, intercepts: m.intercepts };
}
