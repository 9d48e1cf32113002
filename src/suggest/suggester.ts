/**
 * ThemeSuggester: learns a profile for every theme from the coded batch and suggests themes for
 * passages, with calibrated confidences and reasons.
 *
 * The model, chosen by measurement (docs/suggest-experiments.md):
 *  1. three signals per (passage, theme) from the profiles (centroid cosine, weighted log-odds,
 *     nearest exemplars), every one computed leave-one-transcript-out (LOTO) for passages of
 *     coded transcripts, so the batch yields honest scores for free;
 *  2. a base score u = shared logistic combination of the standardised signals;
 *  3. context: u of the neighbouring passages, of the rest of the transcript (distance decay
 *     chosen by cross-validated log-loss) and of the interviewer's question, combined with u by
 *     a second shared logistic model with one intercept per theme; a study whose neighbours are
 *     unrelated gets context weights near 0;
 *  4. per-theme Platt scaling (or isotonic regression) of the LOTO scores into confidences, and
 *     per-theme thresholds meeting the target precision on the same LOTO confidences.
 */
import { UserError } from '../errors.js';
import { isStopWord } from '../text/stopwords.js';
import { withBigrams } from '../text/terms.js';
import { TfidfVectorizer, type TfidfState } from '../text/tfidf.js';
import { cosine, type SparseVector } from '../text/vectors.js';
import { calibrate, fitIsotonic, fitPlatt, type Calibrator, type Platt } from './calibrate.js';
import { adjacent, question, transcript as transcriptContext } from './context.js';
import { fingerprint } from './fingerprint.js';
import { buildTree, chooseThemes, rolledUpLabels, type Tree } from './hierarchy.js';
import { fitGrouped, logLoss, type GroupedData } from './logistic.js';
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

export type ResolvedOptions = Required<Omit<SuggesterOptions, 'signals'>> & { signals: Record<SignalName, boolean> };

export function resolveOptions(o: SuggesterOptions = {}): ResolvedOptions {
  return {
    targetPrecision: o.targetPrecision ?? 0.7,
    bigrams: o.bigrams ?? false,
    minExamples: o.minExamples ?? 5,
    minTranscripts: o.minTranscripts ?? 2,
    priorStrength: o.priorStrength ?? 500,
    neighbours: o.neighbours ?? 5,
    decays: o.decays ?? [0.6, 0.9, 1],
    calibration: o.calibration ?? 'platt',
    overlapCosine: o.overlapCosine ?? 0.8,
    ridge: o.ridge ?? 1,
    competition: o.competition ?? 'level',
    calibrationScope: o.calibrationScope ?? 'theme',
    contextScale: o.contextScale ?? 'mean',
    signals: {
      centroid: o.signals?.centroid ?? true,
      logodds: o.signals?.logodds ?? true,
      exemplars: o.signals?.exemplars ?? false,
      adjacent: o.signals?.adjacent ?? true,
      transcript: o.signals?.transcript ?? true,
      question: o.signals?.question ?? true,
    },
  };
}

/** A standardised shared logistic layer: which inputs, their scaling, and the weights. */
export interface LayerState {
  inputs: string[];
  mean: number[];
  sd: number[];
  weights: number[];
  /** Per theme (index as in `themes`); 0 for themes the layer was not trained on. */
  intercepts: number[];
}

export interface SuggesterState {
  version: 1;
  options: ResolvedOptions;
  tfidf: TfidfState;
  themes: { id: string; path: string; profiled: boolean; seedOnly: boolean; tooFew: boolean }[];
  base: LayerState;
  context: LayerState & { decay: number; logLossByDecay: Record<string, number> };
  calibrators: (Calibrator | null)[];
  /** Maps a seed-only theme's cosine to its seed profile into a confidence (pooled over themes). */
  seedCalibrator: Platt | null;
  thresholds: number[];
  reports: ThemeReport[];
  /** Coded passages and transcripts the fit learned from. */
  coded: { passages: number; transcripts: number; codings: number; ignoredCodings: number };
}

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
  /** [passage][theme] combined score and confidence. */
  private score = new Float64Array(0);
  private conf = new Float64Array(0);
  private ctxPart = new Float64Array(0);
  private qPart = new Float64Array(0);
  private nearest = new Int32Array(0);
  private nearestSim = new Float64Array(0);
  private seedVecs: (SparseVector | null)[] = [];

  constructor(opts: SuggesterOptions = {}) {
    this.options = resolveOptions(opts);
  }

  /**
   * @param passages ALL passages of the study, ordered by transcript then ordinal
   * @param codings the coded batch (a passage may carry several themes)
   * @param extra.negatives rejected suggestions; reserved for Rocchio-style negative evidence
   */
  fit(passages: ModelPassage[], codings: Coding[], themes: ThemeInfo[], extra: { negatives?: Coding[] } = {}): this {
    void extra.negatives; // not used yet: the next issue adds rejections as negative evidence
    const o = this.options;
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

    // Text model: fitted on every passage of the study (unsupervised, so LOTO stays exact).
    this.termLists = passages.map((p) => withBigrams(p.terms, o.bigrams));
    this.vec = new TfidfVectorizer().fit(this.termLists);
    const both = this.termLists.map((t) => this.vec.vectorAndCounts(t));
    const x = both.map((b) => b.vector);
    const c = both.map((b) => b.counts);
    const nT = themes.length;
    const corpus: Corpus = (this.corpus = { x, c, vocabulary: this.vec.size, transcriptOf, members, codedTranscript, labels: labelsInBatch, themes: nT });
    const prof = (this.profiles = new Profiles(corpus, o.priorStrength, o.signals.exemplars ? o.neighbours : 0));

    const profiled = themes.map((_, t) => prof.positives[t]! > 0);
    const seedOnly = themes.map((th, t) => !profiled[t] && this.seedTerms(th).length > 0);
    const tooFew = themes.map((_, t) => profiled[t]! && (prof.positives[t]! < o.minExamples || prof.positiveTranscripts[t]! < o.minTranscripts));

    // 1. LOTO signals of every passage (full profiles for uncoded transcripts).
    const nP = passages.length;
    const F = new Float64Array(nP * nT * SIGNALS);
    const valid = new Uint8Array(nP * nT);
    this.nearest = new Int32Array(nP * nT);
    this.nearestSim = new Float64Array(nP * nT);
    members.forEach((m, ti) => {
      const fs = prof.foldSignals(ti);
      m.forEach((p, mi) => {
        F.set(fs.f.subarray(mi * nT * SIGNALS, (mi + 1) * nT * SIGNALS), p * nT * SIGNALS);
        this.nearest.set(fs.nearest.subarray(mi * nT, (mi + 1) * nT), p * nT);
        this.nearestSim.set(fs.nearestSim.subarray(mi * nT, (mi + 1) * nT), p * nT);
        for (let t = 0; t < nT; t++) valid[p * nT + t] = fs.valid[t]! & (profiled[t] ? 1 : 0);
      });
    });

    // Training rows: passages of coded transcripts x themes whose fold profile is not empty.
    const rows: number[] = [];
    for (let ti = 0; ti < members.length; ti++) {
      if (!codedTranscript[ti]) continue;
      for (const p of members[ti]!) for (let t = 0; t < nT; t++) if (valid[p * nT + t]) rows.push(p * nT + t);
    }
    const yOf = (r: number) => (labelsInBatch[Math.floor(r / nT)]!.includes(r % nT) ? 1 : 0);
    const y = Uint8Array.from(rows, yOf);
    const group = Int32Array.from(rows, (r) => r % nT);

    // 2. Base layer.
    const baseInputs = BASE_SIGNALS.filter((s) => o.signals[s]);
    if (!baseInputs.length) throw new Error('at least one of the signals centroid, logodds, exemplars must be on');
    const baseCols = baseInputs.map((s) => (cell: number) => F[cell * SIGNALS + BASE_INDEX[s]!]!);
    const base = fitLayer(baseInputs, baseCols, rows, y, group, nT, o.ridge);
    const u = new Float64Array(nP * nT);
    for (let cell = 0; cell < nP * nT; cell++) u[cell] = layerLinear(base, baseCols, cell, false);

    // 3. Context layer, the decay chosen by log-loss on the LOTO rows.
    const role = passages.map((p) => p.role);
    const ctxIn = { u, themes: nT, members, role };
    const hasQuestion = o.signals.question && passages.some((p, i) => p.role === 'participant' && i > 0 && members[transcriptOf[i]!]!.some((q) => q < i && passages[q]!.role === 'interviewer'));
    const adj = o.signals.adjacent ? adjacent(ctxIn) : null;
    const q = hasQuestion ? question(ctxIn) : null;
    const decays = o.signals.transcript ? o.decays : [NaN];
    let best: { layer: LayerState; loss: number; decay: number; tr: Float64Array | null } | null = null;
    const lossByDecay: Record<string, number> = {};
    for (const decay of decays) {
      const tr = Number.isNaN(decay) ? null : transcriptContext(ctxIn, decay, o.contextScale);
      const inputs = ['base', ...(adj ? ['adjacent'] : []), ...(tr ? ['transcript'] : []), ...(q ? ['question'] : [])];
      const cols = inputs.map((name) => {
        const src = name === 'base' ? u : name === 'adjacent' ? adj! : name === 'transcript' ? tr! : q!;
        return (cell: number) => src[cell]!;
      });
      const layer = fitLayer(inputs, cols, rows, y, group, nT, o.ridge);
      const loss = layerLoss(layer, cols, rows, y, group, nT);
      lossByDecay[String(decay)] = loss;
      if (!best || loss < best.loss - 1e-12) best = { layer, loss, decay, tr };
    }
    const ctx = best!;
    const ctxCols = ctx.layer.inputs.map((name) => {
      const src = name === 'base' ? u : name === 'adjacent' ? adj! : name === 'transcript' ? ctx.tr! : q!;
      return (cell: number) => src[cell]!;
    });

    // Combined scores and the parts due to context (for reasons).
    this.score = new Float64Array(nP * nT);
    this.ctxPart = new Float64Array(nP * nT);
    this.qPart = new Float64Array(nP * nT);
    for (let cell = 0; cell < nP * nT; cell++) {
      this.score[cell] = layerLinear(ctx.layer, ctxCols, cell, true, cell % nT);
      ctx.layer.inputs.forEach((name, j) => {
        const part = (ctx.layer.weights[j]! * (ctxCols[j]!(cell) - ctx.layer.mean[j]!)) / ctx.layer.sd[j]!;
        if (name === 'adjacent' || name === 'transcript') this.ctxPart[cell] = this.ctxPart[cell]! + part;
        if (name === 'question') this.qPart[cell] = part;
      });
    }

    // Siblings compete: s_t - log(1 + sum over profiled siblings of e^s), the log-probability of
    // a multinomial logit with a "none of these" alternative. Without it the best of 15 leaves
    // is under-confident (its rivals' weakness is evidence for it); see the experiments log.
    if (o.competition !== 'none') {
      const groups = new Map<number, number[]>();
      themes.forEach((_, t) => {
        if (!profiled[t]) return;
        const g = o.competition === 'siblings' ? tree.parent[t]! : tree.ancestors[t]!.length;
        (groups.get(g) ?? groups.set(g, []).get(g)!).push(t);
      });
      for (let p = 0; p < nP; p++) {
        for (const g of groups.values()) {
          let mx = 0;
          for (const t of g) mx = Math.max(mx, this.score[p * nT + t]!);
          let sum = Math.exp(-mx);
          for (const t of g) sum += Math.exp(this.score[p * nT + t]! - mx);
          const lse = mx + Math.log(sum);
          for (const t of g) this.score[p * nT + t] = this.score[p * nT + t]! - lse;
        }
      }
    }

    // 4. Calibration and thresholds per theme, on the LOTO rows.
    const rowsOf: number[][] = themes.map(() => []);
    rows.forEach((r, i) => rowsOf[r % nT]!.push(i));
    const pooled = (() => {
      const s = rows.map((r) => this.score[r]!);
      return o.calibration === 'platt' ? fitPlatt(s, y) : fitIsotonic(s, y);
    })();
    const calibrators: (Calibrator | null)[] = themes.map((_, t) => {
      if (!profiled[t] || tooFew[t]) return null;
      if (o.calibrationScope === 'pooled') return pooled;
      const s = rowsOf[t]!.map((i) => this.score[rows[i]!]!);
      const l = rowsOf[t]!.map((i) => y[i]!);
      return o.calibration === 'platt' ? fitPlatt(s, l) : fitIsotonic(s, l);
    });
    // Seed-only themes: how a centroid cosine maps to a coding, pooled over all themes.
    const seedCalibrator = seedOnly.some(Boolean) && rows.length ? fitPlatt(rows.map((r) => F[r * SIGNALS + CENTROID]!), y) : null;
    this.seedVecs = themes.map((th, t) => (seedOnly[t] ? this.vec.vector(withBigrams(this.seedTerms(th), o.bigrams)) : null));

    this.conf = new Float64Array(nP * nT);
    for (let p = 0; p < nP; p++) {
      for (let t = 0; t < nT; t++) {
        const cell = p * nT + t;
        if (profiled[t]) {
          const cal = calibrators[t];
          this.conf[cell] = calibrate(cal ?? pooled, this.score[cell]!);
        } else if (seedOnly[t] && seedCalibrator) {
          const cos = cosine(x[p]!, this.seedVecs[t]!);
          this.score[cell] = cos;
          this.conf[cell] = calibrate(seedCalibrator, cos);
        }
      }
    }

    const thresholds = themes.map(() => o.targetPrecision);
    const reports: ThemeReport[] = themes.map((th, t) => {
      const warnings: string[] = [];
      let expectedPrecision: number | null = null;
      let expectedRecall: number | null = null;
      if (profiled[t] && !tooFew[t]) {
        const confs = rowsOf[t]!.map((i) => this.conf[rows[i]!]!);
        const l = rowsOf[t]!.map((i) => y[i]!);
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
      return {
        themeId: th.id,
        path: th.path,
        exemplars: prof.positives[t]!,
        transcripts: prof.positiveTranscripts[t]!,
        topTerms: profiled[t] ? this.topTerms(t, 10) : [],
        threshold: thresholds[t]!,
        expectedPrecision,
        expectedRecall,
        seedOnly: seedOnly[t]!,
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

    const codedPassages = labelsInBatch.filter((l) => l.length).length;
    this.st = {
      version: 1,
      options: o,
      tfidf: this.vec.state,
      themes: themes.map((th, t) => ({ id: th.id, path: th.path, profiled: profiled[t]!, seedOnly: seedOnly[t]!, tooFew: tooFew[t]! })),
      base,
      context: { ...ctx.layer, decay: ctx.decay, logLossByDecay: lossByDecay },
      calibrators,
      seedCalibrator,
      thresholds,
      reports,
      coded: { passages: codedPassages, transcripts: codedTranscript.reduce((a, b) => a + b, 0), codings: codings.length - ignored, ignoredCodings: ignored },
    };
    this.fp = fingerprint([JSON.stringify(this.st), prof.s, prof.y, this.score, this.conf]);
    return this;
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
   */
  predict(passageIds?: string[], opts: { reasons?: number } = {}): PassageSuggestions[] {
    const withReasons = opts.reasons ?? 3;
    const st = this.state;
    const nT = st.themes.length;
    const ids = passageIds ?? this.passages.map((p) => p.id);
    return ids.map((id) => {
      const p = this.pIndex.get(id);
      if (p === undefined) throw new UserError(`passage ${id} is not in the study the model was fitted on`);
      const scored: number[] = [];
      for (let t = 0; t < nT; t++) if (st.themes[t]!.profiled || (st.themes[t]!.seedOnly && st.seedCalibrator)) scored.push(t);
      scored.sort((a, b) => this.conf[p * nT + b]! - this.conf[p * nT + a]! || this.score[p * nT + b]! - this.score[p * nT + a]! || a - b);
      const above = scored.filter((t) => this.conf[p * nT + t]! >= st.thresholds[t]!);
      const chosen = chooseThemes(this.tree, above);
      const needReasons = scored.some((t, r) => r < withReasons || chosen.has(t));
      const near = needReasons && !this.options.signals.exemplars ? this.profiles.nearestExemplars(p) : null;
      const candidates: Candidate[] = scored.map((t, r) => ({
        themeId: st.themes[t]!.id,
        score: this.score[p * nT + t]!,
        confidence: this.conf[p * nT + t]!,
        aboveThreshold: this.conf[p * nT + t]! >= st.thresholds[t]!,
        chosen: chosen.has(t),
        reasons: r < withReasons || chosen.has(t) ? this.reasons(p, t, near) : [],
      }));
      return { passageId: id, transcript: this.passages[p]!.transcript, candidates, unclaimed: chosen.size === 0 };
    });
  }

  private reasons(p: number, t: number, near: { nearest: Int32Array; sim: Float64Array } | null): Reason[] {
    const st = this.state;
    const nT = st.themes.length;
    const out: Reason[] = [];
    const th = this.tree.themes[t]!;
    if (st.themes[t]!.profiled) {
      const terms = this.matchedTerms(p, t, 5);
      if (terms.length) out.push({ kind: 'terms', terms });
      const ex = near ? near.nearest[t]! : this.nearest[p * nT + t]!;
      const sim = near ? near.sim[t]! : this.nearestSim[p * nT + t]!;
      if (ex >= 0) out.push({ kind: 'exemplar', passageId: this.passages[ex]!.id, similarity: round(sim) });
      if (this.ctxPart[p * nT + t]) out.push({ kind: 'context', weight: round(this.ctxPart[p * nT + t]!) });
      if (this.qPart[p * nT + t]) out.push({ kind: 'question', weight: round(this.qPart[p * nT + t]!) });
    }
    const have = new Set(this.termLists[p]);
    const seeds = this.seedList(th).filter((s) => have.has(s));
    if (seeds.length) out.push({ kind: 'seeds', terms: seeds });
    if (st.themes[t]!.seedOnly) out.push({ kind: 'seed-only' });
    return out;
  }

  /** The passage's terms that are distinctive of the theme (z > 1.96), by contribution. */
  private matchedTerms(p: number, t: number, n: number): { term: string; weight: number }[] {
    const c = this.corpus.c[p]!;
    const out: { term: string; weight: number }[] = [];
    for (let k = 0; k < c.indices.length; k++) {
      const lo = this.profiles.termLogOdds(c.indices[k]!, t);
      if (lo && lo.delta > 0 && lo.z > 1.96) out.push({ term: this.vec.term(c.indices[k]!), weight: round(c.values[k]! * lo.delta) });
    }
    return out.sort((a, b) => b.weight - a.weight || (a.term < b.term ? -1 : 1)).slice(0, n);
  }

  private topTerms(t: number, n: number): TermWeight[] {
    const out: TermWeight[] = [];
    for (const [i] of this.profiles.codedTerms()) {
      const lo = this.profiles.termLogOdds(i, t);
      if (lo && lo.delta > 0) out.push({ term: this.vec.term(i), weight: round(lo.delta), z: round(lo.z) });
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

function round(v: number): number {
  return Math.round(v * 1e4) / 1e4;
}

function sigmoidOf(z: number): number {
  return z >= 0 ? 1 / (1 + Math.exp(-z)) : Math.exp(z) / (1 + Math.exp(z));
}

type Column = (cell: number) => number;

function layerData(layer: Pick<LayerState, 'mean' | 'sd'>, cols: Column[], rows: number[], y: Uint8Array, group: Int32Array, nT: number): GroupedData {
  const k = cols.length;
  const xs = new Float64Array(rows.length * k);
  rows.forEach((cell, i) => cols.forEach((col, j) => (xs[i * k + j] = (col(cell) - layer.mean[j]!) / layer.sd[j]!)));
  return { x: xs, k, y, group, groups: nT };
}

function fitLayer(inputs: string[], cols: Column[], rows: number[], y: Uint8Array, group: Int32Array, nT: number, ridge: number): LayerState {
  const mean = cols.map((col) => rows.reduce((s, r) => s + col(r), 0) / Math.max(rows.length, 1));
  const sd = cols.map((col, j) => Math.sqrt(rows.reduce((s, r) => s + (col(r) - mean[j]!) ** 2, 0) / Math.max(rows.length, 1)) || 1);
  const m = fitGrouped(layerData({ mean, sd }, cols, rows, y, group, nT), ridge);
  return { inputs, mean, sd, weights: m.weights, intercepts: m.intercepts };
}

function layerLoss(layer: LayerState, cols: Column[], rows: number[], y: Uint8Array, group: Int32Array, nT: number): number {
  return logLoss({ weights: layer.weights, intercepts: layer.intercepts }, layerData(layer, cols, rows, y, group, nT));
}

function layerLinear(layer: LayerState, cols: Column[], cell: number, intercept: boolean, theme = 0): number {
  let z = intercept ? layer.intercepts[theme]! : 0;
  for (let j = 0; j < cols.length; j++) z += (layer.weights[j]! * (cols[j]!(cell) - layer.mean[j]!)) / layer.sd[j]!;
  return z;
}
