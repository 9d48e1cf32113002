/**
 * NoveltyModel: the probability that a passage's theme is missing from the template, learned from
 * the coded batch itself by leaving one theme out at a time.
 *
 * The suggester's confidences answer "which theme?", not "is it any theme?": a passage on a
 * topic the template lacks still gets some theme with a middling confidence (docs/discovery.md,
 * section 5). So: hold out each claiming theme (a leaf, or a theme coders apply directly) in
 * turn; its coded passages, scored against the remaining themes, are examples of "the template
 * has no theme for this"; the coded passages scored against all themes (leave-one-transcript-
 * out, so honestly) are examples of "it has one". A small logistic regression over
 *  - conf: the best claiming theme's confidence (the suggester's, cross-validated for the
 *    batch). With a theme held out, the confidences of the themes it competed with are
 *    renormalised without it (the suggester's choice model is a conditional logit, whose
 *    probabilities without one alternative are the others' divided by 1 - its own);
 *  - centroid: the best cosine to a claiming theme's TF-IDF centroid (leave-one-transcript-out);
 *  - both smoothed over the passage's neighbourhood in its transcript (smooth.ts: near turns,
 *    weight decay^distance, and the whole transcript), since talk on a topic runs over turns;
 * learns the rest. The pool threshold comes from the batch too: the novelty above which a chosen
 * share (`batchShare`) of the in-template coded passages would be pooled.
 *
 * Learned state is plain data (feature means and scales, the logistic coefficients, the
 * threshold, and how the batch scored); every step is deterministic.
 */
import type { Coding, PassageSuggestions, Role } from '../suggest/types.js';
import { logOdds } from '../suggest/logodds.js';
import { TfidfVectorizer } from '../text/tfidf.js';
import { addTo, dotDense, type SparseVector } from '../text/vectors.js';
import { fitLogit, predictLogit, type LogitState } from './logit.js';
import { claimingThemes } from './pool.js';
import { smoothInGroups } from './smooth.js';

export interface NoveltyPassage {
  id: string;
  transcript: string;
  ordinal: number;
  role: Role;
  terms: readonly string[];
}

export interface NoveltyInput {
  /** Every passage of the study. */
  passages: readonly NoveltyPassage[];
  themes: readonly { id: string; parentId: string | null }[];
  codings: readonly Coding[];
  /**
   * The suggester's answers for every passage: for coded passages these are its
   * cross-validated (leave-one-transcript-out) confidences.
   */
  suggestions: readonly Pick<PassageSuggestions, 'passageId' | 'candidates'>[];
}

/** The per-passage measures; each also smoothed over near turns ('-near') and the transcript ('-transcript'). */
export type NoveltyBase = 'conf' | 'centroid' | 'lift' | 'unseen';
export type NoveltyFeature = NoveltyBase | `${NoveltyBase}-near` | `${NoveltyBase}-transcript`;

export const NOVELTY_FEATURES: readonly NoveltyFeature[] = ['conf', 'lift', 'unseen', 'conf-near', 'lift-near', 'unseen-near', 'conf-transcript', 'lift-transcript', 'unseen-transcript'];

export interface NoveltyOptions {
  /** Features used (default all of NOVELTY_FEATURES). */
  features?: readonly NoveltyFeature[];
  /** Weight of a neighbour d passages away in the near smoothing: decay^d (default 0.5). */
  decay?: number;
  /** Inverse penalty of the logistic regression, as scikit-learn's C (default 1). */
  c?: number;
  /** Share of the in-template coded passages that the threshold would pool (default 0.1). */
  batchShare?: number;
  /** Fewest held-out themes with passages for the model to be trained (default 3). */
  minThemes?: number;
  /** Renormalise the held-out theme's competitors without it (default false: measured worse). */
  renormalise?: boolean;
}

export interface NoveltyState {
  features: NoveltyFeature[];
  decay: number;
  /** Standardisation of each feature (mean and standard deviation over the training rows). */
  means: number[];
  scales: number[];
  logit: LogitState;
  /** Novelty at or above which a passage is pooled. */
  threshold: number;
  batchShare: number;
  /** The batch: held-out themes, rows of each kind, and the share of held-out passages pooled. */
  training: { heldOutThemes: string[]; novelRows: number; familiarRows: number; novelPooled: number; auc: number; featureAuc: number[] };
}

type Resolved = Required<NoveltyOptions>;

export function resolveNoveltyOptions(o: NoveltyOptions = {}): Resolved {
  return { features: o.features ?? NOVELTY_FEATURES, decay: o.decay ?? 0.5, c: o.c ?? 1, batchShare: o.batchShare ?? 0.1, minThemes: o.minThemes ?? 3, renormalise: o.renormalise ?? false };
}

/** Mann-Whitney AUC: the chance a novel row scores above a familiar one (ties count half). */
export function aucOf(novel: readonly number[], familiar: readonly number[]): number {
  if (![...novel, ...familiar].every(Number.isFinite)) throw new RangeError('aucOf: every score must be a finite number');
  const all = [...novel.map((v) => ({ v, y: 1 })), ...familiar.map((v) => ({ v, y: 0 }))].sort((a, b) => a.v - b.v);
  let rankSum = 0;
  for (let i = 0; i < all.length; ) {
    let j = i + 1;
    while (j < all.length && all[j]!.v === all[i]!.v) j++;
    const mid = (i + j + 1) / 2;
    for (let q = i; q < j; q++) if (all[q]!.y) rankSum += mid;
    i = j;
  }
  const n1 = novel.length;
  const n0 = familiar.length;
  return n1 && n0 ? (rankSum - (n1 * (n1 + 1)) / 2) / (n1 * n0) : NaN;
}

/** The value at or above which the top `share` of the values lie (at least one value). */
export function upperQuantile(values: readonly number[], share: number): number {
  const s = values.slice().sort((a, b) => b - a);
  if (!s.length) return Infinity;
  return s[Math.min(s.length - 1, Math.max(0, Math.ceil(share * s.length) - 1))]!;
}

export class NoveltyModel {
  readonly options: Resolved;
  private st: NoveltyState | null = null;
  private passages: readonly NoveltyPassage[] = [];
  /** Raw (unsmoothed) conf and centroid per passage and claiming theme, and the themes' groups. */
  private conf: Float64Array = new Float64Array(0);
  private cos: Float64Array = new Float64Array(0);
  private claiming: string[] = [];
  /** Cosine of every passage to the centroid of the whole study (the scale of `lift`). */
  private general: Float64Array = new Float64Array(0);
  private vectors: SparseVector[] = [];
  private studyRowsMemo: { rows: Map<number, number[]>; pIndex: Map<string, number> } | null = null;
  private counts: TermCounts | null = null;
  private codes: number[][] = [];
  private groupOf = new Int32Array(0);

  constructor(opts: NoveltyOptions = {}) {
    this.options = resolveNoveltyOptions(opts);
  }

  /** Whether the batch has enough themes to learn from (else the pool falls back to the claim rule). */
  static trainable(input: NoveltyInput, opts: NoveltyOptions = {}): boolean {
    const claiming = claimingThemes(input.themes, input.codings);
    const coded = new Set(input.codings.filter((c) => claiming.has(c.themeId)).map((c) => c.themeId));
    return coded.size >= resolveNoveltyOptions(opts).minThemes;
  }

  get state(): NoveltyState {
    if (!this.st) throw new Error('NoveltyModel: call fit() first');
    return this.st;
  }

  fit(input: NoveltyInput): this {
    const o = this.options;
    this.passages = input.passages;
    this.studyRowsMemo = null;
    const claimingSet = claimingThemes(input.themes, input.codings);
    // Claiming themes in template order; each one's competition group is its depth.
    this.claiming = input.themes.map((t) => t.id).filter((id) => claimingSet.has(id));
    const depth = depthsOf(input.themes);
    this.groupOf = Int32Array.from(this.claiming, (id) => depth.get(id)!);
    const tIndex = new Map(this.claiming.map((id, t) => [id, t]));
    const pIndex = new Map(input.passages.map((p, i) => [p.id, i]));
    const nT = this.claiming.length;
    const nP = input.passages.length;

    // Claiming codes of every passage (direct codings only: parents claim only where coded).
    const codes: number[][] = input.passages.map(() => []);
    for (const c of input.codings) {
      const p = pIndex.get(c.passageId);
      const t = tIndex.get(c.themeId);
      if (p !== undefined && t !== undefined && !codes[p]!.includes(t)) codes[p]!.push(t);
    }
    this.conf = new Float64Array(nP * nT);
    for (const s of input.suggestions) {
      const p = pIndex.get(s.passageId);
      if (p === undefined) continue;
      for (const c of s.candidates) {
        const t = tIndex.get(c.themeId);
        if (t !== undefined) this.conf[p * nT + t] = c.confidence;
      }
    }
    const vec = new TfidfVectorizer();
    this.vectors = vec.fitVectorise(input.passages.map((p) => [...p.terms])).vectors;
    this.cos = centroidCosines(input.passages, this.vectors, vec.size, codes, nT);
    this.general = generalCosines(this.vectors, vec.size);
    this.codes = codes;
    this.counts = termCounts(input.passages, this.vectors, codes);

    // Training rows: per held-out theme, its passages coded with no other claiming theme.
    const transcripts = input.passages.map((p) => p.transcript);
    const ordinals = Float64Array.from(input.passages, (p) => p.ordinal);
    const codedTranscripts = new Set(input.passages.filter((_, i) => codes[i]!.length).map((p) => p.transcript));
    const inBatch = input.passages.map((p, i) => (codedTranscripts.has(p.transcript) && p.role === 'participant' ? i : -1)).filter((i) => i >= 0);
    const novelRows: number[][] = [];
    const heldOut: string[] = [];
    for (let h = 0; h < nT; h++) {
      const own = inBatch.filter((i) => codes[i]!.length === 1 && codes[i]![0] === h);
      if (!own.length) continue;
      heldOut.push(this.claiming[h]!);
      const inT = new Set(own.map((i) => transcripts[i]!));
      const rows = this.featureRows(inBatch.filter((i) => inT.has(transcripts[i]!)), h, transcripts, ordinals);
      for (const i of own) novelRows.push(rows.get(i)!);
    }
    const famRows = this.featureRows(inBatch, -1, transcripts, ordinals);
    const familiar = inBatch.filter((i) => codes[i]!.length).map((i) => famRows.get(i)!);

    const all = [...novelRows, ...familiar];
    const nf = o.features.length;
    const means = Array.from({ length: nf }, (_, f) => all.reduce((s, r) => s + r[f]!, 0) / Math.max(1, all.length));
    const scales = Array.from({ length: nf }, (_, f) => Math.sqrt(all.reduce((s, r) => s + (r[f]! - means[f]!) ** 2, 0) / Math.max(1, all.length)) || 1);
    const z = (r: readonly number[]) => r.map((v, f) => (v - means[f]!) / scales[f]!);
    const logit = fitLogit(all.map(z), [...novelRows.map(() => 1), ...familiar.map(() => 0)], o.c);
    const novelScores = novelRows.map((r) => predictLogit(logit, z(r)));
    const famScores = familiar.map((r) => predictLogit(logit, z(r)));
    const threshold = upperQuantile(famScores, o.batchShare);
    this.st = {
      features: [...o.features],
      decay: o.decay,
      means,
      scales,
      logit,
      threshold,
      batchShare: o.batchShare,
      training: {
        heldOutThemes: heldOut,
        novelRows: novelRows.length,
        familiarRows: familiar.length,
        novelPooled: novelScores.filter((s) => s >= threshold).length / Math.max(1, novelScores.length),
        auc: aucOf(novelScores, famScores),
        featureAuc: o.features.map((_, f) => aucOf(novelRows.map((r) => r[f]!), familiar.map((r) => r[f]!))),
      },
    };
    return this;
  }

  /** Feature rows of the given passages with every theme present (null for interviewer turns). */
  features(passageIds: readonly string[]): (number[] | null)[] {
    const { rows, pIndex } = this.studyRows();
    return passageIds.map((id) => rows.get(pIndex.get(id) ?? -1) ?? null);
  }

  /** Feature rows of every participant passage with every theme present, computed once after fit. */
  private studyRows(): { rows: Map<number, number[]>; pIndex: Map<string, number> } {
    if (!this.studyRowsMemo) {
      const transcripts = this.passages.map((p) => p.transcript);
      const ordinals = Float64Array.from(this.passages, (p) => p.ordinal);
      const participants = this.passages.map((p, i) => (p.role === 'participant' ? i : -1)).filter((i) => i >= 0);
      this.studyRowsMemo = { rows: this.featureRows(participants, -1, transcripts, ordinals), pIndex: new Map(this.passages.map((p, i) => [p.id, i])) };
    }
    return this.studyRowsMemo;
  }

  /** Novelty of the given passages (default all), in that order: probability the template lacks their theme. */
  predict(passageIds?: readonly string[]): { passageId: string; novelty: number }[] {
    const st = this.state;
    const { rows, pIndex } = this.studyRows();
    const z = (r: readonly number[]) => r.map((v, f) => (v - st.means[f]!) / st.scales[f]!);
    return (passageIds ?? this.passages.map((p) => p.id)).map((id) => {
      const i = pIndex.get(id);
      if (i === undefined) throw new RangeError(`passage ${id} is not in the study the novelty model was fitted on`);
      const r = rows.get(i);
      // An interviewer's turn is never new material of the participants.
      return { passageId: id, novelty: r ? predictLogit(st.logit, z(r)) : 0 };
    });
  }

  /**
   * Feature rows of the given passages with claiming theme `h` held out (-1: none); smoothing runs
   * over exactly these passages, grouped by transcript.
   */
  private featureRows(members: readonly number[], h: number, transcripts: readonly string[], ordinals: Float64Array): Map<number, number[]> {
    const nT = this.claiming.length;
    const wanted = new Set(this.options.features.map((f) => f.split('-')[0] as NoveltyBase));
    const base: Record<NoveltyBase, Float64Array> = { conf: new Float64Array(members.length), centroid: new Float64Array(members.length), lift: new Float64Array(members.length), unseen: new Float64Array(members.length) };
    members.forEach((p, m) => {
      const o = p * nT;
      // Without h, the themes it competed with share its probability (conditional logit).
      const rest = h >= 0 && this.options.renormalise ? Math.max(1e-12, 1 - this.conf[o + h]!) : 1;
      let bc = 0;
      let bs = 0;
      for (let t = 0; t < nT; t++) {
        if (t === h) continue;
        const c = h >= 0 && this.groupOf[t] === this.groupOf[h] ? Math.min(1, this.conf[o + t]! / rest) : this.conf[o + t]!;
        if (c > bc) bc = c;
        if (this.cos[o + t]! > bs) bs = this.cos[o + t]!;
      }
      base.conf[m] = bc;
      base.centroid[m] = bs;
      // Both cosines grow with the passage's length; their ratio does not.
      base.lift[m] = bs / Math.max(1e-3, this.general[p]!);
      if (wanted.has('unseen')) base.unseen[m] = unseenScore(this.counts!, this.vectors[p]!, transcripts[p]!, h);
    });
    const g = members.map((p) => transcripts[p]!);
    const pos = Float64Array.from(members, (p) => ordinals[p]!);
    const decay = this.options.decay;
    const cols = this.options.features.map((f) => {
      const [b, how] = f.split('-') as [NoveltyBase, string | undefined];
      return how === 'near' ? smoothInGroups(base[b], g, pos, decay) : how === 'transcript' ? smoothInGroups(base[b], g, pos, 1) : base[b];
    });
    return new Map(members.map((p, m) => [p, cols.map((c) => c[m]!)]));
  }
}

/**
 * Transcript counts of terms: in how many transcripts a term occurs at all, and in how many it
 * occurs in a coded passage; per transcript, its coded passages' terms with the themes coded.
 * Transcripts, not passages: a name repeated through one transcript is not a topic the batch
 * lacks; words that recur across transcripts the batch does not cover are.
 */
interface TermCounts {
  study: Float64Array;
  nStudy: number;
  batch: Float64Array;
  nBatch: number;
  /** Per transcript: coded passages with each term, in all and by theme. */
  coded: Map<string, { all: Map<number, number>; byTheme: Map<number, Map<number, number>>; passages: number; themes: Map<number, number> }>;
  /** Per held-out theme: terms whose batch count drops without it, and by how much; the transcripts lost. */
  lost: Map<number, { terms: Map<number, number>; transcripts: number }>;
  a0: number;
}

function termCounts(passages: readonly NoveltyPassage[], vectors: readonly SparseVector[], codes: readonly number[][]): TermCounts {
  const V = vectors.reduce((m, v) => Math.max(m, v.indices.length ? v.indices[v.indices.length - 1]! + 1 : 0), 0);
  const seen = new Map<string, Set<number>>();
  const coded: TermCounts['coded'] = new Map();
  passages.forEach((p, i) => {
    const x = vectors[i]!;
    const s = seen.get(p.transcript) ?? seen.set(p.transcript, new Set()).get(p.transcript)!;
    for (const t of x.indices) s.add(t);
    if (!codes[i]!.length) return;
    const e = coded.get(p.transcript) ?? coded.set(p.transcript, { all: new Map(), byTheme: new Map(), passages: 0, themes: new Map() }).get(p.transcript)!;
    e.passages++;
    for (const t of x.indices) e.all.set(t, (e.all.get(t) ?? 0) + 1);
    for (const h of codes[i]!) {
      e.themes.set(h, (e.themes.get(h) ?? 0) + 1);
      const m = e.byTheme.get(h) ?? e.byTheme.set(h, new Map()).get(h)!;
      for (const t of x.indices) m.set(t, (m.get(t) ?? 0) + 1);
    }
  });
  const study = new Float64Array(V);
  for (const s of seen.values()) for (const t of s) study[t]++;
  const batch = new Float64Array(V);
  const lost: TermCounts['lost'] = new Map();
  for (const e of coded.values()) {
    for (const t of e.all.keys()) batch[t]++;
    for (const [h, m] of e.byTheme) {
      const l = lost.get(h) ?? lost.set(h, { terms: new Map(), transcripts: 0 }).get(h)!;
      // A passage coded h and another theme stays in the batch, so this is an upper bound.
      if (e.themes.get(h) === e.passages) l.transcripts++;
      for (const [t, c] of m) if (c === e.all.get(t)) l.terms.set(t, (l.terms.get(t) ?? 0) + 1);
    }
  }
  return { study, nStudy: seen.size, batch, nBatch: coded.size, coded, lost, a0: Math.min(50, 0.1 * seen.size) };
}

/**
 * How much the passage's vocabulary is new to the coded batch: the TF-IDF-weighted mean z of the
 * weighted log-odds (informative Dirichlet prior, as the clusters' terms) of each of its terms in
 * the transcripts outside the batch against those in it (transcript counts), where the batch
 * leaves out the passage's own transcript and the held-out theme h. A theme the template lacks
 * brings words the batch lacks.
 */
function unseenScore(c: TermCounts, x: SparseVector, transcript: string, h: number): number {
  const own = c.coded.get(transcript);
  const lost = h >= 0 ? c.lost.get(h) : undefined;
  // The own transcript leaves the batch unless the held-out theme already took it.
  const ownOut = own && !(h >= 0 && own.themes.get(h) === own.passages) ? 1 : 0;
  const nB = c.nBatch - (lost?.transcripts ?? 0) - ownOut;
  const nU = c.nStudy - nB;
  const ownH = h >= 0 ? own?.byTheme.get(h) : undefined;
  let s = 0;
  let w = 0;
  for (let k = 0; k < x.indices.length; k++) {
    const t = x.indices[k]!;
    let b = c.batch[t]! - (lost?.terms.get(t) ?? 0);
    // The own transcript still counted for t: it has t in a coded passage outside h.
    if (own && (own.all.get(t) ?? 0) > (ownH?.get(t) ?? 0)) b--;
    // Counts of transcripts: clamp the approximations (mixed transcripts) to their totals.
    b = Math.min(nB, Math.max(0, b));
    const u = Math.min(nU, Math.max(0, c.study[t]! - b));
    // Presence counts can reach the number of transcripts; this prior share stays below 1.
    const aw = (c.a0 * (c.study[t]! + 0.5)) / (c.nStudy + 1);
    s += x.values[k]! * logOdds(u, nU, b, nB, aw, c.a0).z;
    w += x.values[k]!;
  }
  return w > 0 ? s / w : 0;
}

/** Cosine of every passage to the sum of all passages' unit vectors. */
function generalCosines(vectors: readonly SparseVector[], V: number): Float64Array {
  const sum = new Float64Array(V);
  for (const x of vectors) addTo(sum, x);
  const n = Math.sqrt(sum.reduce((a, v) => a + v * v, 0));
  return Float64Array.from(vectors, (x) => (n > 0 ? dotDense(x, sum) / n : 0));
}

/** Depth of every theme (top level 0). */
function depthsOf(themes: readonly { id: string; parentId: string | null }[]): Map<string, number> {
  const parent = new Map(themes.map((t) => [t.id, t.parentId]));
  const out = new Map<string, number>();
  for (const t of themes) {
    let d = 0;
    for (let q = parent.get(t.id) ?? null; q !== null && d <= themes.length; q = parent.get(q) ?? null) d++;
    out.set(t.id, d);
  }
  return out;
}

/**
 * Cosine of every passage to every claiming theme's TF-IDF centroid (sum of its coded passages'
 * unit vectors), leaving out the passage's own transcript, so coded passages score as new ones.
 */
function centroidCosines(passages: readonly NoveltyPassage[], vectors: readonly SparseVector[], V: number, codes: readonly number[][], nT: number): Float64Array {
  const sums = Array.from({ length: nT }, () => new Float64Array(V));
  const byTranscript = new Map<string, Map<number, Map<number, number>>>();
  passages.forEach((p, i) => {
    const x = vectors[i]!;
    for (const t of codes[i]!) {
      addTo(sums[t]!, x);
      const per = byTranscript.get(p.transcript) ?? byTranscript.set(p.transcript, new Map()).get(p.transcript)!;
      const m = per.get(t) ?? per.set(t, new Map()).get(t)!;
      for (let k = 0; k < x.indices.length; k++) m.set(x.indices[k]!, (m.get(x.indices[k]!) ?? 0) + x.values[k]!);
    }
  });
  const sq = sums.map((s) => s.reduce((a, v) => a + v * v, 0));
  // ||S - S_tr||^2 per transcript and theme.
  const foldNorm = new Map<string, Map<number, number>>();
  for (const [tr, per] of byTranscript) {
    const m = new Map<number, number>();
    for (const [t, part] of per) {
      let cross = 0;
      let own = 0;
      for (const [j, v] of part) (cross += v * sums[t]![j]!), (own += v * v);
      m.set(t, Math.max(0, sq[t]! - 2 * cross + own));
    }
    foldNorm.set(tr, m);
  }
  const out = new Float64Array(passages.length * nT);
  passages.forEach((p, i) => {
    const x = vectors[i]!;
    const per = byTranscript.get(p.transcript);
    const norms = foldNorm.get(p.transcript);
    for (let t = 0; t < nT; t++) {
      let d = dotDense(x, sums[t]!);
      let n2 = sq[t]!;
      const part = per?.get(t);
      if (part) {
        for (let k = 0; k < x.indices.length; k++) d -= x.values[k]! * (part.get(x.indices[k]!) ?? 0);
        n2 = norms!.get(t)!;
      }
      out[i * nT + t] = n2 > 1e-12 ? d / Math.sqrt(n2) : 0;
    }
  });
  return out;
}
