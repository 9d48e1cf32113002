/**
 * Theme profiles as sums over the coded batch, so that leave-one-transcript-out (LOTO) scores
 * are exact and cheap: a fold's profile is the full sum minus the held-out transcripts' part,
 * never a refit. Three signals per (passage, theme):
 *   centroid  - cosine of the passage's TF-IDF vector to the theme's profile vector: the sum of
 *               its coded passages minus a Rocchio share of the passages a coder rejected for it;
 *   logodds   - mean weighted log-odds (theme vs the rest of the coded batch and the passages
 *               rejected for it, informative Dirichlet prior from the whole study) of the terms;
 *   exemplars - mean cosine to the theme's k nearest coded passages (from other transcripts).
 * Dense per-theme arrays cover only the terms of labelled passages, stored term-major so scoring
 * one passage against every theme walks memory in order.
 */
import type { SparseVector } from '../math/sparse.js';
import { logOddsDelta } from '../math/logodds.js';

export const SIGNALS = 3;
export const CENTROID = 0;
export const LOGODDS = 1;
export const EXEMPLARS = 2;

export interface Corpus {
  /** TF-IDF vectors and raw term counts of every passage (same term indices). */
  x: SparseVector[];
  c: SparseVector[];
  vocabulary: number;
  /** Transcript of each passage, and each transcript's passages in order. */
  transcriptOf: Int32Array;
  members: number[][];
  /** Transcripts with at least one coding: all their passages are labelled (none = negative). */
  codedTranscript: Uint8Array;
  /** Rolled-up theme indices of each passage (empty outside coded transcripts). */
  labels: number[][];
  /** Themes a coder rejected for each passage (never one of its labels); optional. */
  negatives?: number[][];
  themes: number;
}

export interface FoldSignals {
  /** [member][theme][signal] flattened. */
  f: Float64Array;
  /** 1 where the theme still has coded passages once the held transcripts are left out. */
  valid: Uint8Array;
  /** Nearest coded exemplar of each (member, theme): passage index or -1, and its cosine. */
  nearest: Int32Array;
  nearestSim: Float64Array;
}

export class Profiles {
  readonly nT: number;
  /** Vocabulary index -> position among the terms of labelled passages (-1 when absent). */
  readonly loc: Int32Array;
  /** Position -> vocabulary index (the inverse of loc). */
  readonly termOf: Int32Array;
  readonly vc: number;
  /** Term-major sums: s[l * nT + t] (signed: rejections subtract), y the positives' counts. */
  readonly s: Float64Array;
  readonly y: Float64Array;
  /** Counts of the passages rejected for a theme outside coded transcripts (extra "rest"). */
  readonly yneg: Float64Array;
  readonly nneg: Float64Array;
  readonly ss: Float64Array;
  readonly n: Float64Array;
  readonly ytot: Float64Array;
  ntot = 0;
  /** Total pseudo-count of the prior actually used. */
  readonly a0: number;
  readonly prior: Float64Array;
  readonly positives: Int32Array;
  readonly positiveTranscripts: Int32Array;
  readonly rejected: Int32Array;
  /** Weight of one rejected passage in a theme's profile vector (a positive weighs 1). */
  readonly negWeight: Float64Array;
  /** Coded passages (passage indices) and an inverted index of their TF-IDF vectors. */
  readonly coded: Int32Array;
  private readonly postStart: Int32Array;
  private readonly postDoc: Int32Array;
  private readonly postVal: Float64Array;
  private readonly negs: number[][];
  /** Transcripts whose own labels or rejections are in the sums (so their folds differ). */
  readonly held: Uint8Array;

  /**
   * @param k nearest exemplars averaged; 0 skips the exemplar signal (nearest exemplars for
   * reasons are then found on demand by nearestExemplars)
   * @param rocchio share of a theme's positive mass its rejections may subtract from its
   * profile vector (Rocchio's gamma; each rejected passage weighs at most this much)
   */
  constructor(
    readonly corpus: Corpus,
    readonly priorStrength: number,
    readonly k: number,
    readonly rocchio = 0.25,
  ) {
    const nT = (this.nT = corpus.themes);
    const negs = (this.negs = corpus.negatives ?? corpus.x.map(() => []));
    const coded: number[] = [];
    this.held = new Uint8Array(corpus.members.length);
    corpus.members.forEach((m, ti) => {
      if (corpus.codedTranscript[ti]) coded.push(...m);
      if (corpus.codedTranscript[ti] || m.some((p) => negs[p]!.length)) this.held[ti] = 1;
    });
    this.coded = Int32Array.from(coded);
    const rejectedPassages: number[] = [];
    for (let p = 0; p < negs.length; p++) if (negs[p]!.length) rejectedPassages.push(p);

    this.loc = new Int32Array(corpus.vocabulary).fill(-1);
    let vc = 0;
    const terms: number[] = [];
    for (const p of [...coded, ...rejectedPassages]) {
      for (const i of corpus.x[p]!.indices) {
        if (this.loc[i] !== -1) continue;
        this.loc[i] = vc++;
        terms.push(i);
      }
    }
    this.vc = vc;
    this.termOf = Int32Array.from(terms);

    this.positives = new Int32Array(nT);
    this.rejected = new Int32Array(nT);
    for (const p of coded) for (const t of corpus.labels[p]!) this.positives[t]!++;
    for (const p of rejectedPassages) for (const t of negs[p]!) this.rejected[t]!++;
    this.negWeight = Float64Array.from(this.positives, (pos, t) => (this.rejected[t]! ? rocchio * Math.min(1, pos / this.rejected[t]!) : 0));

    this.s = new Float64Array(vc * nT);
    this.y = new Float64Array(vc * nT);
    this.yneg = new Float64Array(vc * nT);
    this.nneg = new Float64Array(nT);
    this.ytot = new Float64Array(vc);
    this.n = new Float64Array(nT);
    this.positiveTranscripts = new Int32Array(nT);
    for (const p of coded) {
      const c = corpus.c[p]!;
      for (let k = 0; k < c.indices.length; k++) {
        const l = this.loc[c.indices[k]!]!;
        this.ytot[l] = this.ytot[l]! + c.values[k]!;
        this.ntot += c.values[k]!;
      }
    }
    for (let p = 0; p < corpus.x.length; p++) {
      const inCoded = corpus.codedTranscript[corpus.transcriptOf[p]!] === 1;
      if (!inCoded && !negs[p]!.length) continue;
      this.addPassage(p, inCoded, 1, this.s, this.y, this.n, this.yneg, this.nneg);
    }
    corpus.members.forEach((m, ti) => {
      if (!corpus.codedTranscript[ti]) return;
      const seen = new Set<number>();
      for (const p of m) for (const t of corpus.labels[p]!) seen.add(t);
      for (const t of seen) this.positiveTranscripts[t]!++;
    });
    this.ss = new Float64Array(nT);
    for (let l = 0; l < vc; l++) for (let t = 0; t < nT; t++) this.ss[t] = this.ss[t]! + this.s[l * nT + t]! ** 2;

    // Informative prior: the term's share of all the study's text (coded or not) times a0;
    // a0 is capped at a tenth of the coded text so a small batch is not drowned by the prior.
    this.a0 = Math.min(priorStrength, 0.1 * this.ntot);
    const all = new Float64Array(vc);
    let total = 0;
    for (const c of corpus.c) {
      for (let k = 0; k < c.indices.length; k++) {
        const l = this.loc[c.indices[k]!]!;
        if (l >= 0) {
          all[l] = all[l]! + c.values[k]!;
          total += c.values[k]!;
        }
      }
    }
    this.prior = all.map((v) => (this.a0 * v) / Math.max(total, 1));

    // Inverted index over coded passages, in CSR form.
    const counts = new Int32Array(vc + 1);
    for (const p of coded) for (const i of corpus.x[p]!.indices) counts[this.loc[i]! + 1]!++;
    for (let l = 0; l < vc; l++) counts[l + 1] = counts[l + 1]! + counts[l]!;
    this.postStart = counts.slice();
    this.postDoc = new Int32Array(counts[vc]!);
    this.postVal = new Float64Array(counts[vc]!);
    const fill = counts.slice();
    coded.forEach((p, ci) => {
      const x = corpus.x[p]!;
      for (let k = 0; k < x.indices.length; k++) {
        const l = this.loc[x.indices[k]!]!;
        const at = fill[l]!++;
        this.postDoc[at] = ci;
        this.postVal[at] = x.values[k]!;
      }
    });
    this.local = new Int32Array(vc).fill(-1);
    // Terms the profiles see: used by a coded passage, or by a passage rejected outside the
    // coded transcripts (the extra rest); other terms score nothing.
    this.anyNeg = this.nneg.some((v) => v > 0);
    this.restSeen = new Uint8Array(vc);
    for (let l = 0; l < vc; l++) {
      let seen = this.ytot[l]! > 0;
      for (let t = 0; t < nT && !seen; t++) seen = this.yneg[l * nT + t]! > 0;
      this.restSeen[l] = seen ? 1 : 0;
    }
  }

  private readonly restSeen: Uint8Array;
  private readonly anyNeg: boolean;
  private gBest: Float64Array | null = null;
  private gArg: Int32Array | null = null;

  /**
   * Adds (sign 1) one passage's part of the sums into the given term-major arrays: its vector to
   * the themes it is coded with, minus the Rocchio share to the themes rejected for it, and its
   * counts to the positives' counts, or to the extra rest of a theme rejected outside a coded
   * transcript (inside one, its counts are already part of the rest).
   */
  private addPassage(
    p: number,
    inCoded: boolean,
    sign: number,
    s: Float64Array,
    y: Float64Array,
    n: Float64Array,
    yneg: Float64Array,
    nneg: Float64Array,
    at: (l: number) => number = (l) => l,
  ): void {
    const { nT, loc, corpus } = this;
    const x = corpus.x[p]!;
    const c = corpus.c[p]!;
    const labels = inCoded ? corpus.labels[p]! : [];
    for (const t of labels) {
      for (let q = 0; q < x.indices.length; q++) {
        const i = at(loc[x.indices[q]!]!) * nT + t;
        s[i] = s[i]! + sign * x.values[q]!;
      }
      for (let q = 0; q < c.indices.length; q++) {
        const i = at(loc[c.indices[q]!]!) * nT + t;
        y[i] = y[i]! + sign * c.values[q]!;
        n[t] = n[t]! + sign * c.values[q]!;
      }
    }
    for (const t of this.negs[p]!) {
      const w = this.negWeight[t]!;
      for (let q = 0; q < x.indices.length; q++) {
        const i = at(loc[x.indices[q]!]!) * nT + t;
        s[i] = s[i]! - sign * w * x.values[q]!;
      }
      if (inCoded) continue;
      for (let q = 0; q < c.indices.length; q++) {
        const i = at(loc[c.indices[q]!]!) * nT + t;
        yneg[i] = yneg[i]! + sign * c.values[q]!;
        nneg[t] = nneg[t]! + sign * c.values[q]!;
      }
    }
  }

  private sc: { px: Float64Array; pc: Float64Array; pneg: Float64Array; delta: Float64Array; tc: Float64Array; done: Uint8Array; seen: Uint8Array } | null = null;

  /** Fold scratch for nl local rows, zeroed over that part (grown when a fold needs more). */
  private scratch(nl: number) {
    const nT = this.nT;
    if (!this.sc || this.sc.tc.length < nl) {
      const cap = Math.max(nl, 2 * (this.sc?.tc.length ?? 0));
      const f = () => new Float64Array(cap * nT);
      this.sc = { px: f(), pc: f(), pneg: f(), delta: f(), tc: new Float64Array(cap), done: new Uint8Array(cap), seen: new Uint8Array(cap) };
      return this.sc;
    }
    const sc = this.sc;
    const end = nl * nT;
    sc.px.fill(0, 0, end);
    sc.pc.fill(0, 0, end);
    sc.pneg.fill(0, 0, end);
    sc.delta.fill(0, 0, end);
    sc.tc.fill(0, 0, nl);
    sc.done.fill(0, 0, nl);
    sc.seen.fill(0, 0, nl);
    return sc;
  }

  /** Scratch: vocabulary position -> row of the held transcripts' local arrays (-1 = none). */
  private readonly local: Int32Array;
  private get allThemes(): Int32Array {
    return (this.themeList ??= Int32Array.from({ length: this.nT }, (_, t) => t));
  }
  private themeList: Int32Array | null = null;

  /**
   * Signals of every passage of transcript `ti` against every theme, from the profiles without
   * the codings and rejections of `ti` (and of `also`, when given: a leave-two-out fold). For a
   * transcript with neither, that is the full profile.
   */
  foldSignals(ti: number, also = -1, only?: readonly number[]): FoldSignals {
    const { corpus, nT, loc, s, y, k: kNear, local } = this;
    // The themes to score (all, unless the caller needs a few: the others are left at 0).
    const tl = only ? Int32Array.from(only) : this.allThemes;
    const nTl = tl.length;
    const members = corpus.members[ti]!;
    const heldTranscripts = [ti, ...(also >= 0 ? [also] : [])].filter((h) => this.held[h]);
    const held = heldTranscripts.length > 0;
    const m = members.length;

    // The held transcripts' share of the sums, over the terms they use (local rows).
    const terms: number[] = [];
    if (held) {
      for (const h of heldTranscripts) {
        for (const p of corpus.members[h]!) {
          for (const i of corpus.x[p]!.indices) {
            const l = loc[i]!;
            if (l >= 0 && local[l] === -1) {
              local[l] = terms.length;
              terms.push(l);
            }
          }
        }
      }
    }
    const nl = terms.length;
    // Scratch reused across folds (zeroed over the part used): one fold's arrays are a few
    // hundred KB, and allocating them afresh for every fold was most of the fit's GC.
    const sc = this.scratch(nl);
    const px = sc.px;
    const pc = sc.pc;
    const pneg = sc.pneg;
    const pn = new Float64Array(nT);
    const pnn = new Float64Array(nT);
    const tc = sc.tc;
    const ppos = new Int32Array(nT);
    let tn = 0;
    const at = (l: number) => local[l]!;
    for (const h of heldTranscripts) {
      const inCoded = corpus.codedTranscript[h] === 1;
      for (const p of corpus.members[h]!) {
        if (inCoded) {
          const c = corpus.c[p]!;
          for (let q = 0; q < c.indices.length; q++) {
            const r = local[loc[c.indices[q]!]!]!;
            tc[r] = tc[r]! + c.values[q]!;
            tn += c.values[q]!;
          }
          for (const t of corpus.labels[p]!) ppos[t]!++;
        }
        this.addPassage(p, inCoded, 1, px, pc, pn, pneg, pnn, at);
      }
    }

    const valid = new Uint8Array(nT);
    const norm = new Float64Array(nT);
    const foldN = new Float64Array(nT);
    const foldNneg = new Float64Array(nT);
    for (let t = 0; t < nT; t++) {
      valid[t] = this.positives[t]! - ppos[t]! > 0 ? 1 : 0;
      let sp = 0;
      let pp = 0;
      for (let r = 0; r < nl; r++) {
        const v = px[r * nT + t]!;
        if (v === 0) continue;
        sp += s[terms[r]! * nT + t]! * v;
        pp += v * v;
      }
      norm[t] = Math.sqrt(Math.max(this.ss[t]! - 2 * sp + pp, 0));
      foldN[t] = this.n[t]! - pn[t]!;
      foldNneg[t] = this.nneg[t]! - pnn[t]!;
    }
    const nAll = this.ntot - tn;
    const table = held ? null : this.fullDelta();
    const foldDelta = sc.delta;
    const foldDone = sc.done;
    const foldSeen = sc.seen;

    const f = new Float64Array(m * nT * SIGNALS);
    const nearest = new Int32Array(m * nT).fill(-1);
    const nearestSim = new Float64Array(m * nT);
    const dots = new Float64Array(nT);
    const lo = new Float64Array(nT);
    const acc = new Float64Array(kNear ? this.coded.length : 0);
    const top = new Float64Array(nT * kNear);
    const touched: number[] = [];

    members.forEach((p, mi) => {
      const x = corpus.x[p]!;
      const c = corpus.c[p]!;
      const base = mi * nT * SIGNALS;
      // centroid
      dots.fill(0);
      for (let q = 0; q < x.indices.length; q++) {
        const l = loc[x.indices[q]!]!;
        if (l < 0) continue;
        const v = x.values[q]!;
        const r = held ? local[l]! : -1;
        const o = l * nT;
        if (r < 0) for (let t = 0; t < nT; t++) dots[t] = dots[t]! + v * s[o + t]!;
        else {
          const or = r * nT;
          for (let j = 0; j < nTl; j++) {
            const t = tl[j]!;
            dots[t] = dots[t]! + v * (s[o + t]! - px[or + t]!);
          }
        }
      }
      for (let j = 0; j < nTl; j++) {
        const t = tl[j]!;
        f[base + t * SIGNALS + CENTROID] = norm[t]! > 1e-12 ? dots[t]! / norm[t]! : 0;
      }
      // log-odds
      lo.fill(0);
      let weight = 0;
      for (let q = 0; q < c.indices.length; q++) {
        const l = loc[c.indices[q]!]!;
        if (l < 0) continue;
        const w = c.values[q]!;
        if (table) {
          if (!this.restSeen[l]) continue; // unseen by the profiles
          weight += w;
          const o = l * nT;
          for (let t = 0; t < nT; t++) lo[t] = lo[t]! + w * table[o + t]!;
          continue;
        }
        // Every term of a held transcript has a local row; its fold deltas are worked out once.
        const r = local[l]!;
        if (!foldDone[r]) {
          foldDone[r] = 1;
          const all = this.ytot[l]! - tc[r]!;
          let negSeen = false;
          if (this.anyNeg) for (let t = 0; t < nT && !negSeen; t++) negSeen = this.yneg[l * nT + t]! - pneg[r * nT + t]! > 0;
          foldSeen[r] = all > 0 || negSeen ? 1 : 0; // else a term only the held transcripts use: unseen by the fold
          if (foldSeen[r]) {
            const aw = this.prior[l]!;
            for (let j = 0; j < nTl; j++) {
              const t = tl[j]!;
              const yt = y[l * nT + t]! - pc[r * nT + t]!;
              const yn = this.yneg[l * nT + t]! - pneg[r * nT + t]!;
              foldDelta[r * nT + t] = logOddsDelta(yt, foldN[t]!, all - yt + yn, nAll - foldN[t]! + foldNneg[t]!, aw, this.a0);
            }
          }
        }
        if (!foldSeen[r]) continue;
        weight += w;
        const o = r * nT;
        for (let j = 0; j < nTl; j++) {
          const t = tl[j]!;
          lo[t] = lo[t]! + w * foldDelta[o + t]!;
        }
      }
      for (let j = 0; j < nTl; j++) {
        const t = tl[j]!;
        f[base + t * SIGNALS + LOGODDS] = weight > 0 ? lo[t]! / weight : 0;
      }
      if (kNear === 0) return;
      // exemplars: cosines to coded passages of other transcripts via the inverted index
      for (let q = 0; q < x.indices.length; q++) {
        const l = loc[x.indices[q]!]!;
        if (l < 0) continue;
        const v = x.values[q]!;
        for (let at = this.postStart[l]!; at < this.postStart[l + 1]!; at++) {
          const d = this.postDoc[at]!;
          if (acc[d] === 0) touched.push(d);
          acc[d] = acc[d]! + v * this.postVal[at]!;
        }
      }
      top.fill(0);
      for (const d of touched) {
        const sim = acc[d]!;
        acc[d] = 0;
        const pd = this.coded[d]!;
        if (heldTranscripts.includes(corpus.transcriptOf[pd]!) || corpus.transcriptOf[pd] === ti) continue;
        for (const t of corpus.labels[pd]!) {
          const o = t * kNear;
          if (sim <= top[o + kNear - 1]!) continue;
          let j = kNear - 1;
          while (j > 0 && top[o + j - 1]! < sim) {
            top[o + j] = top[o + j - 1]!;
            j--;
          }
          top[o + j] = sim;
          if (j === 0) {
            nearest[mi * nT + t] = pd;
            nearestSim[mi * nT + t] = sim;
          }
        }
      }
      touched.length = 0;
      for (let t = 0; t < nT; t++) {
        let sum = 0;
        for (let j = 0; j < kNear; j++) sum += top[t * kNear + j]!;
        f[base + t * SIGNALS + EXEMPLARS] = sum / kNear;
      }
    });
    for (const l of terms) local[l] = -1;
    return { f, valid, nearest, nearestSim };
  }

  private delta: Float64Array | null = null;
  private zs: Float64Array | null = null;

  /** Log-odds deltas of the full batch, term-major (the same for every transcript not held). */
  fullDelta(): Float64Array {
    if (this.delta) return this.delta;
    const { nT, vc } = this;
    const d = new Float64Array(vc * nT);
    for (let l = 0; l < vc; l++) {
      if (!this.restSeen[l]) continue;
      for (let t = 0; t < nT; t++) {
        const yt = this.y[l * nT + t]!;
        const yr = this.ytot[l]! - yt + this.yneg[l * nT + t]!;
        d[l * nT + t] = logOddsDelta(yt, this.n[t]!, yr, this.ntot - this.n[t]! + this.nneg[t]!, this.prior[l]!, this.a0);
      }
    }
    return (this.delta = d);
  }

  /** z of every full-batch delta (delta over its approximate standard deviation), term-major. */
  fullZ(): Float64Array {
    if (this.zs) return this.zs;
    const { nT, vc } = this;
    const d = this.fullDelta();
    const z = new Float64Array(vc * nT);
    for (let l = 0; l < vc; l++) {
      const aw = this.prior[l]!;
      for (let t = 0; t < nT; t++) {
        const i = l * nT + t;
        if (d[i] === 0) continue;
        const yt = this.y[i]!;
        const yr = this.ytot[l]! - yt + this.yneg[i]!;
        z[i] = d[i]! / Math.sqrt(1 / (yt + aw) + 1 / (yr + aw));
      }
    }
    return (this.zs = z);
  }

  /**
   * The nearest coded passage of each theme to passage p, from transcripts other than p's,
   * with its cosine: [passage index or -1, cosine] per theme. With `themes`, only those are
   * kept (the others stay at -1, 0). (MaxScore pruning of the common terms was tried: the exact
   * re-scoring of the passages it could not rule out cost more than it saved.)
   */
  nearestExemplars(p: number, themes?: readonly number[]): { nearest: Int32Array; sim: Float64Array } {
    const { corpus, nT, loc, postStart, postDoc, postVal } = this;
    const x = corpus.x[p]!;
    const acc = (this.acc ??= new Float64Array(this.coded.length));
    // Coded passages renumbered so that each label set's are contiguous (in passage order): the
    // walk is branch-free and the best of a group is a plain running maximum. (Keeping a list of
    // the passages touched cost a mispredicted branch per posting, twice the walk itself.)
    const G = (this.byGroup ??= this.groupIndex());
    const doc = G.doc;
    for (let q = 0; q < x.indices.length; q++) {
      const l = loc[x.indices[q]!]!;
      if (l < 0) continue;
      const v = x.values[q]!;
      const end = postStart[l + 1]!;
      for (let at = postStart[l]!; at < end; at++) {
        const d = doc[at]!;
        acc[d] = acc[d]! + v * postVal[at]!;
      }
    }
    // The best passage per label set (coded passages share a handful of them), then per theme.
    const nG = G.themes.length;
    const gBest = (this.gBest ??= new Float64Array(nG));
    const gArg = (this.gArg ??= new Int32Array(nG));
    const own = corpus.transcriptOf[p]!;
    const { coded } = this;
    for (let g = 0; g < nG; g++) {
      // Strictly greater: of equal cosines the first, i.e. the lowest passage index, wins; a
      // passage nothing reached stays at 0 and never wins.
      let best = 0;
      let arg = -1;
      const to = G.start[g + 1]!;
      for (let at = G.start[g]!; at < to; at++) {
        const v = acc[at]!;
        if (v > best && G.transcript[at] !== own) {
          best = v;
          arg = at;
        }
      }
      gBest[g] = best;
      gArg[g] = arg >= 0 ? G.ci[arg]! : -1;
    }
    acc.fill(0);
    const nearest = new Int32Array(nT).fill(-1);
    const sim = new Float64Array(nT);
    const want = (this.want ??= new Uint8Array(nT));
    if (themes) for (const t of themes) want[t] = 1;
    else want.fill(1);
    for (let g = 0; g < nG; g++) {
      if (gArg[g]! < 0) continue;
      const v = gBest[g]!;
      const pd = coded[gArg[g]!]!;
      for (const t of G.themes[g]!) {
        if (!want[t]) continue;
        if (v > sim[t]! || (v === sim[t]! && nearest[t]! >= 0 && pd < nearest[t]!)) {
          sim[t] = v;
          nearest[t] = pd;
        }
      }
    }
    want.fill(0);
    return { nearest, sim };
  }

  private want: Uint8Array | null = null;
  private byGroup: ReturnType<Profiles['groupIndex']> | null = null;

  /** The postings renumbered by label set: position of every coded passage, grouped, in passage order. */
  /** For the exemplar search: the coded passages grouped by label set, with their transcripts. */
  private groupIndex(): { doc: Int32Array; start: Int32Array; ci: Int32Array; transcript: Int32Array; themes: number[][] } {
    const { corpus, coded } = this;
    const nc = coded.length;
    const themes: number[][] = [];
    const groupKey = new Map<string, number>();
    const groupOf = Int32Array.from(coded, (p) => {
      const key = corpus.labels[p]!.join(',');
      let g = groupKey.get(key);
      if (g === undefined) {
        groupKey.set(key, (g = themes.length));
        themes.push(corpus.labels[p]!.slice());
      }
      return g;
    });
    const nG = themes.length;
    const start = new Int32Array(nG + 1);
    for (let d = 0; d < nc; d++) start[groupOf[d]! + 1]!++;
    for (let g = 0; g < nG; g++) start[g + 1] = start[g + 1]! + start[g]!;
    const fill = start.slice();
    const rank = new Int32Array(nc);
    const ci = new Int32Array(nc);
    const transcript = new Int32Array(nc);
    for (let d = 0; d < nc; d++) {
      const at = fill[groupOf[d]!]!++;
      rank[d] = at;
      ci[at] = d;
      transcript[at] = corpus.transcriptOf[coded[d]!]!;
    }
    return { doc: this.postDoc.map((d) => rank[d]!), start, ci, transcript, themes };
  }
  private acc: Float64Array | null = null;

  /** Cosine between two themes' full profile vectors. */
  centroidCosine(a: number, b: number): number {
    let d = 0;
    for (let l = 0; l < this.vc; l++) d += this.s[l * this.nT + a]! * this.s[l * this.nT + b]!;
    const n = Math.sqrt(this.ss[a]! * this.ss[b]!);
    return n > 0 ? d / n : 0;
  }
}
