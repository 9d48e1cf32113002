/**
 * Theme profiles as sums over the coded batch, so that leave-one-transcript-out (LOTO) scores
 * are exact and cheap: a fold's profile is the full sum minus the held-out transcript's part,
 * never a refit. Three signals per (passage, theme):
 *   centroid  - cosine of the passage's TF-IDF vector to the theme's centroid (the sum's direction);
 *   logodds   - mean weighted log-odds (theme vs rest of the coded batch, informative Dirichlet
 *               prior from the whole study) of the passage's terms;
 *   exemplars - mean cosine to the theme's k nearest coded passages (from other transcripts).
 * Dense per-theme arrays cover only the terms of coded passages, stored term-major so scoring
 * one passage against every theme walks memory in order.
 */
import type { SparseVector } from '../text/vectors.js';
import { logOdds, logOddsDelta } from './logodds.js';

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
  themes: number;
}

export interface FoldSignals {
  /** [member][theme][signal] flattened. */
  f: Float64Array;
  /** 1 where the theme still has coded passages once this transcript is held out. */
  valid: Uint8Array;
  /** Nearest coded exemplar of each (member, theme): passage index or -1, and its cosine. */
  nearest: Int32Array;
  nearestSim: Float64Array;
}

export class Profiles {
  readonly nT: number;
  /** Vocabulary index -> position among the terms of coded passages (-1 when absent). */
  readonly loc: Int32Array;
  readonly vc: number;
  /** Term-major sums: s[l * nT + t]. */
  readonly s: Float64Array;
  readonly y: Float64Array;
  readonly ss: Float64Array;
  readonly n: Float64Array;
  readonly ytot: Float64Array;
  ntot = 0;
  /** Total pseudo-count of the prior actually used. */
  readonly a0: number;
  readonly prior: Float64Array;
  readonly positives: Int32Array;
  readonly positiveTranscripts: Int32Array;
  /** Coded passages (passage indices) and an inverted index of their TF-IDF vectors. */
  readonly coded: Int32Array;
  private readonly postStart: Int32Array;
  private readonly postDoc: Int32Array;
  private readonly postVal: Float64Array;

  /**
   * @param k nearest exemplars averaged; 0 skips the exemplar signal (nearest exemplars for
   * reasons are then found on demand by nearestExemplars)
   */
  constructor(
    readonly corpus: Corpus,
    readonly priorStrength: number,
    readonly k: number,
  ) {
    const nT = (this.nT = corpus.themes);
    const coded: number[] = [];
    corpus.members.forEach((m, ti) => {
      if (corpus.codedTranscript[ti]) coded.push(...m);
    });
    this.coded = Int32Array.from(coded);

    this.loc = new Int32Array(corpus.vocabulary).fill(-1);
    let vc = 0;
    for (const p of coded) for (const i of corpus.x[p]!.indices) if (this.loc[i] === -1) this.loc[i] = vc++;
    this.vc = vc;

    this.s = new Float64Array(vc * nT);
    this.y = new Float64Array(vc * nT);
    this.ytot = new Float64Array(vc);
    this.n = new Float64Array(nT);
    this.positives = new Int32Array(nT);
    this.positiveTranscripts = new Int32Array(nT);
    for (const p of coded) {
      const x = corpus.x[p]!;
      const c = corpus.c[p]!;
      for (let k = 0; k < c.indices.length; k++) {
        const l = this.loc[c.indices[k]!]!;
        this.ytot[l] = this.ytot[l]! + c.values[k]!;
        this.ntot += c.values[k]!;
      }
      for (const t of corpus.labels[p]!) {
        this.positives[t]!++;
        for (let k = 0; k < x.indices.length; k++) {
          const l = this.loc[x.indices[k]!]!;
          this.s[l * nT + t] = this.s[l * nT + t]! + x.values[k]!;
        }
        for (let k = 0; k < c.indices.length; k++) {
          const l = this.loc[c.indices[k]!]!;
          this.y[l * nT + t] = this.y[l * nT + t]! + c.values[k]!;
          this.n[t] = this.n[t]! + c.values[k]!;
        }
      }
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
  }

  /**
   * Signals of every passage of transcript `ti` against every theme, from the profiles without
   * that transcript's codings (for an uncoded transcript that is the full profile).
   */
  foldSignals(ti: number): FoldSignals {
    const { corpus, nT, loc, s, y, k: kNear } = this;
    const members = corpus.members[ti]!;
    const held = corpus.codedTranscript[ti] === 1;
    const m = members.length;

    // The held-out transcript's share of the sums (empty when it is not coded).
    const px: Map<number, number>[] = Array.from({ length: nT }, () => new Map());
    const pc: Map<number, number>[] = Array.from({ length: nT }, () => new Map());
    const pn = new Float64Array(nT);
    const ppos = new Int32Array(nT);
    const tc = new Map<number, number>();
    let tn = 0;
    if (held) {
      for (const p of members) {
        const x = corpus.x[p]!;
        const c = corpus.c[p]!;
        for (let q = 0; q < c.indices.length; q++) {
          const l = loc[c.indices[q]!]!;
          tc.set(l, (tc.get(l) ?? 0) + c.values[q]!);
          tn += c.values[q]!;
        }
        for (const t of corpus.labels[p]!) {
          ppos[t]!++;
          for (let q = 0; q < x.indices.length; q++) {
            const l = loc[x.indices[q]!]!;
            px[t]!.set(l, (px[t]!.get(l) ?? 0) + x.values[q]!);
          }
          for (let q = 0; q < c.indices.length; q++) {
            const l = loc[c.indices[q]!]!;
            pc[t]!.set(l, (pc[t]!.get(l) ?? 0) + c.values[q]!);
            pn[t] = pn[t]! + c.values[q]!;
          }
        }
      }
    }
    const valid = new Uint8Array(nT);
    const norm = new Float64Array(nT);
    const foldN = new Float64Array(nT);
    for (let t = 0; t < nT; t++) {
      valid[t] = this.positives[t]! - ppos[t]! > 0 ? 1 : 0;
      let sp = 0;
      let pp = 0;
      for (const [l, v] of px[t]!) {
        sp += s[l * nT + t]! * v;
        pp += v * v;
      }
      norm[t] = Math.sqrt(Math.max(this.ss[t]! - 2 * sp + pp, 0));
      foldN[t] = this.n[t]! - pn[t]!;
    }
    const nAll = this.ntot - tn;
    const table = held ? null : this.fullDelta();

    const f = new Float64Array(m * nT * SIGNALS);
    const nearest = new Int32Array(m * nT).fill(-1);
    const nearestSim = new Float64Array(m * nT);
    const dots = new Float64Array(nT);
    const lo = new Float64Array(nT);
    const acc = new Float64Array(this.coded.length);
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
        for (let t = 0; t < nT; t++) {
          let st = s[l * nT + t]!;
          if (held) st -= px[t]!.get(l) ?? 0;
          dots[t] = dots[t]! + v * st;
        }
      }
      for (let t = 0; t < nT; t++) f[base + t * SIGNALS + CENTROID] = norm[t]! > 1e-12 ? dots[t]! / norm[t]! : 0;
      // log-odds
      lo.fill(0);
      let weight = 0;
      for (let q = 0; q < c.indices.length; q++) {
        const l = loc[c.indices[q]!]!;
        if (l < 0) continue;
        const all = this.ytot[l]! - (held ? (tc.get(l) ?? 0) : 0);
        if (all <= 0) continue; // a term only this transcript uses: unseen by the fold's profiles
        const w = c.values[q]!;
        const aw = this.prior[l]!;
        weight += w;
        if (table) {
          for (let t = 0; t < nT; t++) lo[t] = lo[t]! + w * table[l * nT + t]!;
          continue;
        }
        for (let t = 0; t < nT; t++) {
          const yt = y[l * nT + t]! - (pc[t]!.get(l) ?? 0);
          lo[t] = lo[t]! + w * logOddsDelta(yt, foldN[t]!, all - yt, nAll - foldN[t]!, aw, this.a0);
        }
      }
      for (let t = 0; t < nT; t++) f[base + t * SIGNALS + LOGODDS] = weight > 0 ? lo[t]! / weight : 0;
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
        if (corpus.transcriptOf[pd] === ti) continue;
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
    return { f, valid, nearest, nearestSim };
  }

  private delta: Float64Array | null = null;

  /** Log-odds deltas of the full batch, term-major (the same for every uncoded transcript). */
  fullDelta(): Float64Array {
    if (this.delta) return this.delta;
    const { nT, vc } = this;
    const d = new Float64Array(vc * nT);
    for (let l = 0; l < vc; l++) {
      if (this.ytot[l]! <= 0) continue;
      for (let t = 0; t < nT; t++) {
        const yt = this.y[l * nT + t]!;
        d[l * nT + t] = logOddsDelta(yt, this.n[t]!, this.ytot[l]! - yt, this.ntot - this.n[t]!, this.prior[l]!, this.a0);
      }
    }
    return (this.delta = d);
  }

  /** Full-batch log-odds of term `termIndex` for theme t (for reasons and top terms). */
  termLogOdds(termIndex: number, t: number): { delta: number; z: number } | null {
    const l = this.loc[termIndex]!;
    if (l < 0 || this.ytot[l]! <= 0) return null;
    const yt = this.y[l * this.nT + t]!;
    return logOdds(yt, this.n[t]!, this.ytot[l]! - yt, this.ntot - this.n[t]!, this.prior[l]!, this.a0);
  }

  /**
   * The nearest coded passage of each theme to passage p, from transcripts other than p's,
   * with its cosine: [passage index or -1, cosine] per theme.
   */
  nearestExemplars(p: number): { nearest: Int32Array; sim: Float64Array } {
    const { corpus, nT, loc } = this;
    const x = corpus.x[p]!;
    const acc = (this.acc ??= new Float64Array(this.coded.length));
    const touched: number[] = [];
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
    const nearest = new Int32Array(nT).fill(-1);
    const sim = new Float64Array(nT);
    const own = corpus.transcriptOf[p];
    for (const d of touched) {
      const v = acc[d]!;
      acc[d] = 0;
      const pd = this.coded[d]!;
      if (corpus.transcriptOf[pd] === own) continue;
      for (const t of corpus.labels[pd]!) {
        if (v > sim[t]! || (v === sim[t]! && nearest[t]! >= 0 && pd < nearest[t]!)) {
          sim[t] = v;
          nearest[t] = pd;
        }
      }
    }
    return { nearest, sim };
  }

  private acc: Float64Array | null = null;

  /** Cosine between two themes' full centroids. */
  centroidCosine(a: number, b: number): number {
    let d = 0;
    for (let l = 0; l < this.vc; l++) d += this.s[l * this.nT + a]! * this.s[l * this.nT + b]!;
    const n = Math.sqrt(this.ss[a]! * this.ss[b]!);
    return n > 0 ? d / n : 0;
  }

  /** Term positions of the coded vocabulary, for walking every term of a theme. */
  *codedTerms(): Generator<[number, number]> {
    for (let i = 0; i < this.loc.length; i++) if (this.loc[i]! >= 0) yield [i, this.loc[i]!];
  }
}
