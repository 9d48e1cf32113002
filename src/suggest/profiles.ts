/**
 * Theme profiles as sums over the coded batch: per (term, theme) the weighted log-odds of the
 * theme against the rest of the coded batch and the passages rejected for it (informative
 * Dirichlet prior from the whole study), which give the reasons' distinctive terms and the
 * theme reports' top terms, and each theme's profile vector (the sum of its coded passages minus
 * a Rocchio share of the passages a coder rejected for it), whose cosines flag overlapping
 * themes. Dense per-theme arrays cover only the terms of labelled passages, term-major.
 */
import type { SparseVector } from '../math/sparse.js';
import { logOddsDelta } from '../math/logodds.js';

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
  /** Coded passages (passage indices). */
  readonly coded: Int32Array;
  private readonly negs: number[][];

  /**
   * @param rocchio share of a theme's positive mass its rejections may subtract from its
   * profile vector (Rocchio's gamma; each rejected passage weighs at most this much)
   */
  constructor(
    readonly corpus: Corpus,
    readonly priorStrength: number,
    readonly rocchio = 0.25,
  ) {
    const nT = (this.nT = corpus.themes);
    const negs = (this.negs = corpus.negatives ?? corpus.x.map(() => []));
    const coded: number[] = [];
    corpus.members.forEach((m, ti) => corpus.codedTranscript[ti] && coded.push(...m));
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

    // Terms the profiles see: used by a coded passage, or by a passage rejected outside the
    // coded transcripts (the extra rest); other terms score nothing.
    this.restSeen = new Uint8Array(vc);
    for (let l = 0; l < vc; l++) {
      let seen = this.ytot[l]! > 0;
      for (let t = 0; t < nT && !seen; t++) seen = this.yneg[l * nT + t]! > 0;
      this.restSeen[l] = seen ? 1 : 0;
    }
  }

  private readonly restSeen: Uint8Array;

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

  private delta: Float64Array | null = null;
  private zs: Float64Array | null = null;

  /** Log-odds deltas of the full batch, term-major . */
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

  /** Cosine between two themes' full profile vectors. */
  centroidCosine(a: number, b: number): number {
    let d = 0;
    for (let l = 0; l < this.vc; l++) d += this.s[l * this.nT + a]! * this.s[l * this.nT + b]!;
    const n = Math.sqrt(this.ss[a]! * this.ss[b]!);
    return n > 0 ? d / n : 0;
  }
}
