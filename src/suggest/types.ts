/** Plain-data shapes of the suggestion model: its inputs, its learned state and its answers. */

export type Role = 'interviewer' | 'participant';

export interface ThemeInfo {
  id: string;
  parentId: string | null;
  name: string;
  /** Full path, levels joined by " > " (for messages and reasons). */
  path: string;
  apriori: boolean;
  definition: string;
  /** Seed terms as lemmas (lemmatise them at the edge: contentLemmas(analyse(seed))). */
  seeds: string[];
  /** Non-stop lemmas of the definition, when the edge has analysed it; else split from `definition`. */
  definitionTerms?: string[];
  /** Non-stop lemmas of the theme's own name, when the edge has analysed it; else split from `name`. */
  nameTerms?: string[];
}

export interface ModelPassage {
  id: string;
  transcript: string;
  ordinal: number;
  role: Role;
  /** Non-stop lemmas in order (contentLemmas of the stored analysis). */
  terms: string[];
  /** Tokens of the passage, stop words included, when the edge knows them (else terms.length). */
  words?: number;
}

export interface Coding {
  passageId: string;
  themeId: string;
}

/** What fit() learns from. */
export interface FitInput {
  /** ALL passages of the study, ordered by transcript then ordinal, so context is available. */
  passages: ModelPassage[];
  codings: Coding[];
  themes: ThemeInfo[];
  /** Passages a coder said do NOT carry a theme (rejections and re-codes away from it). */
  negatives?: Coding[];
}

export interface SuggesterOptions {
  /** Precision each theme's default threshold must reach on the cross-validated batch (0.7). */
  targetPrecision?: number;
  /** Add bigrams of adjacent content lemmas to the vectors (default false: measured no gain). */
  bigrams?: boolean;
  /** A theme with fewer coded passages, or coded passages in fewer transcripts, is flagged. */
  minExamples?: number;
  minTranscripts?: number;
  /** Total pseudo-count of the informative Dirichlet prior of the log-odds (default 500). */
  priorStrength?: number;
  /** Cosine above which two themes' centroids are reported as overlapping (0.8). */
  overlapCosine?: number;
  /** Share of a theme's profile vector its rejected passages may take away (Rocchio's gamma, default 0.25). */
  rocchio?: number;
  /** Options of the few-example scorer. */
  fewshot?: import('./fewshot.js').FewshotOptions;
}

export interface TermWeight {
  term: string;
  /** The term as the study writes it, when the edge has looked it up (the term is a lemma). */
  written?: string;
  /** Weighted log-odds ratio (theme vs the rest of the coded batch). */
  weight: number;
  z: number;
}

export interface ThemeReport {
  themeId: string;
  path: string;
  /** Coded passages of the theme or any sub-theme. */
  exemplars: number;
  transcripts: number;
  topTerms: TermWeight[];
  /** Confidence at or above which a suggestion counts as above threshold. */
  threshold: number;
  /** Cross-validated precision and recall at the threshold; null when flagged. */
  expectedPrecision: number | null;
  expectedRecall: number | null;
  /** True when the profile has no coded passage: built from the definition and seeds. */
  seedOnly: boolean;
  /** True when the theme has too few coded passages for its own figures. */
  tooFew: boolean;
  warnings: string[];
}

export type Reason =
  /** Terms are lemmas; the study adds each as the passage writes it, and the stretch that matched. */
  | { kind: 'terms'; terms: { term: string; weight: number; written?: string }[]; fragment?: string }
  | { kind: 'exemplar'; passageId: string; similarity: number }
  | { kind: 'seeds'; terms: string[] }
  | { kind: 'seed-only' } // "profile from definition and seeds only"
  | { kind: 'parent'; theme: string } // "fits X; no sub-theme stands out"
  | { kind: 'context'; weight: number }
  | { kind: 'question'; weight: number };

export interface Candidate {
  themeId: string;
  /** Combined score: the theme's utility in the conditional logit (for a seed-only theme, the cosine to its seed profile). */
  score: number;
  /** Calibrated probability that the coder would give this theme. */
  confidence: number;
  aboveThreshold: boolean;
  /** Chosen after the hierarchy rule (a sub-theme above threshold replaces its parent). */
  chosen: boolean;
  reasons: Reason[];
}

export interface PassageSuggestions {
  passageId: string;
  transcript: string;
  /** Best first, by confidence. */
  candidates: Candidate[];
  unclaimed: boolean;
}

/**
 * Every passage's confidences with no object per (passage, theme): what bulk readers (the
 * unclaimed pool, cluster nearness, triage) take instead of PassageSuggestions, whose candidates
 * come to millions of objects in a large study. The same numbers and choices as predict()'s.
 */
export interface ThemeScores {
  /** Theme ids in the model's order: a theme is its index here. */
  themeIds: readonly string[];
  /** The themes the model scores (the ones predict() gives a candidate), in index order. */
  scored: readonly number[];
  /** Each theme's threshold: a confidence at or above it is above threshold. */
  thresholds: readonly number[];
  passages: PassageScores[];
}

export interface PassageScores {
  passageId: string;
  transcript: string;
  /** Every theme's calibrated confidence, by theme index; only the scored themes' count. */
  confidence: Float64Array;
  /** The chosen themes (hierarchy rule applied), best first as predict() ranks candidates. */
  chosen: readonly number[];
}
