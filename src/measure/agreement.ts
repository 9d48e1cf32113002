/**
 * Inter-coder agreement on a set of passages, per theme and overall. Each theme is a binary
 * variable: for every passage a coder looked at, the theme is present (the coder applied it) or
 * absent (the coder coded the passage, but not with this theme). A coder who did not look at a
 * passage is missing for it, which only Krippendorff's alpha can take in its stride.
 *
 * Themes are compared as given: a coding of "Workload > Staffing" is not a coding of "Workload".
 * A caller that wants agreement on a parent theme to include its sub-themes passes codings
 * expanded to their ancestors.
 */

import { krippendorffAlpha } from './alpha.js';
import { AGREEMENT_CAUTION, KRIPPENDORFF_SOURCE, LANDIS_KOCH_SOURCE, agreementBand, alphaGuidance, type AlphaGuidance, type Band } from './bands.js';
import { undefinedBecause, type Coefficient } from './coefficient.js';
import { fleissFromRows } from './fleiss.js';
import { cohensKappa } from './kappa.js';

export { percentAgreement, cohensKappa, type KappaResult } from './kappa.js';
export { krippendorffAlpha, type AlphaLevel, type AlphaResult } from './alpha.js';
export { fleissKappa, fleissFromRows, type FleissResult } from './fleiss.js';
export {
  AGREEMENT_CAUTION,
  CIRCULARITY_NOTE,
  KRIPPENDORFF_GUIDANCE,
  KRIPPENDORFF_SOURCE,
  LANDIS_KOCH_BANDS,
  LANDIS_KOCH_SOURCE,
  agreementBand,
  alphaGuidance,
  type AlphaGuidance,
  type Band,
} from './bands.js';
export type { Coefficient, Label } from './coefficient.js';

export interface CodingRecord {
  coder: string;
  passageId: string;
  themeId: string;
}

/** A coder looked at a passage (whether or not they coded it with any theme). */
export interface CodedRecord {
  coder: string;
  passageId: string;
}

export interface AgreementInput {
  passages: readonly string[];
  coders: readonly string[];
  themes: readonly string[];
  codings: readonly CodingRecord[];
  /** Which coder looked at which passage. A coding implies its coder looked at the passage. */
  coded: readonly CodedRecord[];
}

/** Kappa with its Landis and Koch band. */
export interface BandedCoefficient extends Coefficient {
  band: Band['label'] | null;
}

/** Alpha with Krippendorff's own guidance (at least 0.800; 0.667 for tentative conclusions). */
export interface GuidedCoefficient extends Coefficient {
  guidance: AlphaGuidance['label'] | null;
}

/** A passage on which the coders who reviewed it differ about one theme. */
export interface Disagreement {
  theme_id: string;
  passage_id: string;
  /** Coders who applied the theme, and coders who reviewed the passage without applying it. */
  applied_by: string[];
  not_by: string[];
}

export interface AgreementFigures {
  /** Units (passages, or passage-theme pairs when pooled) that two or more coders looked at. */
  units: number;
  /**
   * Share of agreeing coder pairs among all pairs of coders who both looked at a unit, pooled
   * over units; with two coders, the plain share of units on which they agree.
   */
  percentAgreement: number | null;
  /** Cohen's kappa on the units both coders looked at; null unless there are exactly two coders. */
  kappa: BandedCoefficient;
  /** Krippendorff's alpha, nominal, any number of coders, missing values allowed. */
  alpha: GuidedCoefficient;
  /**
   * Fleiss' kappa (Fleiss 1971) for all the coders together, on the units every one of them
   * reviewed (`units` here): it needs the same coders on every unit. With two coders it is
   * Scott's pi; Cohen's kappa is the two-coder figure shown.
   */
  fleiss: BandedCoefficient & { units: number };
}

/** Two coders of several, on the passages both reviewed. */
export interface PairAgreement {
  coders: [string, string];
  /** Participant passages both reviewed. */
  passages: number;
  /** Over every passage-theme pair of those passages. */
  percent_agreement: number | null;
  kappa: BandedCoefficient;
  alpha: GuidedCoefficient;
  /** The unweighted mean of the per-theme Cohen's kappas that are defined, and over how many themes. */
  mean_kappa: number | null;
  themes_in_mean_kappa: number;
}

export interface ThemeAgreement extends AgreementFigures {
  themeId: string;
  /** Present values: how many (coder, passage) pairs carry this theme among the units. */
  present: number;
}

export interface MeanOfThemes {
  /** Unweighted mean over the themes whose figure is defined; null when none is. */
  percentAgreement: number | null;
  kappa: number | null;
  alpha: number | null;
  /** How many themes each mean is taken over. */
  themesInPercentAgreement: number;
  themesInKappa: number;
  themesInAlpha: number;
  fleiss: number | null;
  themes_in_fleiss: number;
}

export interface AgreementReport {
  coders: string[];
  /** Passages given / passages that two or more coders looked at. */
  passages: number;
  pairablePassages: number;
  themes: ThemeAgreement[];
  /**
   * Every (passage, theme) pair as one binary unit. It weighs every theme equally per passage,
   * and so rewards the many joint "absent" values of rare themes: percent agreement pooled this
   * way runs high. Kappa and alpha correct for that through the chance term, but read it beside
   * the per-theme figures and their mean.
   */
  pooled: AgreementFigures;
  /** The mean of the per-theme figures: each theme counts once, however often it is used. */
  meanOfThemes: MeanOfThemes;
  /** Every pair of coders, each on the passages both reviewed; empty with fewer than three coders. */
  pairwise: PairAgreement[];
  /** Codings naming a passage, coder or theme outside the input lists; they are left out. */
  ignoredCodings: number;
  /** Every passage and theme on which the coders differ: what the team discusses. */
  disagreements: Disagreement[];
  /** Landis and Koch, for kappa's bands. */
  bandsSource: string;
  /** Krippendorff, for alpha's guidance. */
  guidance_source: string;
  caution: string;
}

type Binary = 0 | 1 | null;

function banded(c: Coefficient): BandedCoefficient {
  return { value: c.value, reason: c.reason, band: agreementBand(c.value) };
}

function guided(c: Coefficient): GuidedCoefficient {
  return { value: c.value, reason: c.reason, guidance: alphaGuidance(c.value) };
}

/** Figures for one binary variable given as rows[coder][unit]. */
function figures(rows: Binary[][]): AgreementFigures {
  const nUnits = rows.length > 0 ? rows[0]!.length : 0;
  let units = 0;
  let pairs = 0;
  let agreeing = 0;
  for (let u = 0; u < nUnits; u++) {
    let ones = 0;
    let zeros = 0;
    for (const row of rows) {
      const v = row[u];
      if (v === 1) ones++;
      else if (v === 0) zeros++;
    }
    const m = ones + zeros;
    if (m < 2) continue;
    units++;
    pairs += (m * (m - 1)) / 2;
    agreeing += (ones * (ones - 1)) / 2 + (zeros * (zeros - 1)) / 2;
  }
  let kappa: Coefficient;
  if (rows.length !== 2) {
    kappa = undefinedBecause(`Cohen's kappa is for exactly two coders (here ${rows.length}); see Fleiss' kappa, Krippendorff's alpha and the pairwise table`);
  } else {
    const a: number[] = [];
    const b: number[] = [];
    const [ra, rb] = rows as [Binary[], Binary[]];
    for (let u = 0; u < nUnits; u++) {
      if (ra[u] !== null && rb[u] !== null) {
        a.push(ra[u]!);
        b.push(rb[u]!);
      }
    }
    kappa = cohensKappa(a, b);
  }
  return {
    units,
    percentAgreement: pairs > 0 ? agreeing / pairs : null,
    kappa: banded(kappa),
    alpha: guided(krippendorffAlpha(rows, 'nominal')),
    fleiss: fleissFigure(rows),
  };
}

function fleissFigure(rows: Binary[][]): BandedCoefficient & { units: number } {
  const f = fleissFromRows(rows);
  return { ...banded(f), units: f.units };
}

function mean(values: (number | null)[]): [number | null, number] {
  const got = values.filter((v): v is number => v !== null);
  return [got.length > 0 ? got.reduce((s, v) => s + v, 0) / got.length : null, got.length];
}

export function agreementReport(input: AgreementInput): AgreementReport {
  const passageIndex = new Map(input.passages.map((p, i) => [p, i]));
  const coderIndex = new Map(input.coders.map((c, i) => [c, i]));
  const themeIndex = new Map(input.themes.map((t, i) => [t, i]));
  const P = input.passages.length;
  const T = input.themes.length;
  const C = input.coders.length;

  // looked[c][p]: coder c looked at passage p; has[c] holds p * T + t for every coding.
  const looked = input.coders.map(() => new Uint8Array(P));
  const has = input.coders.map(() => new Set<number>());
  for (const r of input.coded) {
    const c = coderIndex.get(r.coder);
    const p = passageIndex.get(r.passageId);
    if (c !== undefined && p !== undefined) looked[c]![p] = 1;
  }
  let ignoredCodings = 0;
  for (const r of input.codings) {
    const c = coderIndex.get(r.coder);
    const p = passageIndex.get(r.passageId);
    const t = themeIndex.get(r.themeId);
    if (c === undefined || p === undefined || t === undefined) {
      ignoredCodings++;
      continue;
    }
    looked[c]![p] = 1;
    has[c]!.add(p * T + t);
  }

  // Only passages two or more coders looked at can show agreement; the rest are left out early.
  const pairable: number[] = [];
  for (let p = 0; p < P; p++) {
    let m = 0;
    for (let c = 0; c < C; c++) m += looked[c]![p]!;
    if (m >= 2) pairable.push(p);
  }

  const value = (c: number, p: number, t: number): Binary => (looked[c]![p] ? (has[c]!.has(p * T + t) ? 1 : 0) : null);

  const disagreements: Disagreement[] = [];
  const themes: ThemeAgreement[] = input.themes.map((themeId, t) => {
    const rows = input.coders.map((_, c) => pairable.map((p) => value(c, p, t)));
    pairable.forEach((p, u) => {
      const applied: string[] = [];
      const not: string[] = [];
      rows.forEach((row, c) => {
        if (row[u] === 1) applied.push(input.coders[c]!);
        else if (row[u] === 0) not.push(input.coders[c]!);
      });
      if (applied.length && not.length) disagreements.push({ theme_id: themeId, passage_id: input.passages[p]!, applied_by: applied, not_by: not });
    });
    let present = 0;
    for (const row of rows) for (const v of row) if (v === 1) present++;
    return { themeId, present, ...figures(rows) };
  });

  const pooledRows = input.coders.map((_, c) => {
    const row: Binary[] = [];
    for (const p of pairable) for (let t = 0; t < T; t++) row.push(value(c, p, t));
    return row;
  });

  const [pa, nPa] = mean(themes.map((t) => t.percentAgreement));
  const [ka, nKa] = mean(themes.map((t) => t.kappa.value));
  const [al, nAl] = mean(themes.map((t) => t.alpha.value));
  const [fl, nFl] = mean(themes.map((t) => t.fleiss.value));

  const pairwise: PairAgreement[] = [];
  if (C >= 3) {
    for (let i = 0; i < C; i++) {
      for (let j = i + 1; j < C; j++) {
        const both = pairable.filter((p) => looked[i]![p] && looked[j]![p]);
        const pair = [i, j];
        const perTheme = input.themes.map((_, t) => figures(pair.map((c) => both.map((p) => value(c, p, t)))));
        const pooled = figures(pair.map((c) => both.flatMap((p) => input.themes.map((_, t) => value(c, p, t)))));
        const [mk, nk] = mean(perTheme.map((f) => f.kappa.value));
        pairwise.push({
          coders: [input.coders[i]!, input.coders[j]!],
          passages: both.length,
          percent_agreement: pooled.percentAgreement,
          kappa: pooled.kappa,
          alpha: pooled.alpha,
          mean_kappa: mk,
          themes_in_mean_kappa: nk,
        });
      }
    }
  }

  return {
    coders: [...input.coders],
    passages: P,
    pairablePassages: pairable.length,
    themes,
    pooled: figures(pooledRows),
    meanOfThemes: {
      percentAgreement: pa,
      kappa: ka,
      alpha: al,
      themesInPercentAgreement: nPa,
      themesInKappa: nKa,
      themesInAlpha: nAl,
      fleiss: fl,
      themes_in_fleiss: nFl,
    },
    pairwise,
    ignoredCodings,
    disagreements,
    bandsSource: LANDIS_KOCH_SOURCE,
    guidance_source: KRIPPENDORFF_SOURCE,
    caution: AGREEMENT_CAUTION,
  };
}
