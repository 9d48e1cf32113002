/** Plain-data shapes of discovery: the unclaimed pool, clusters, dismissals and triage. */
import type { Role } from '../suggest/types.js';

/** A passage as the pool rule sees it (what the store holds for every passage). */
export interface PoolCandidate {
  id: string;
  transcript: string;
  speaker: string | null;
  role: Role;
  /** Content lemmas in order (contentLemmas of the stored analysis). */
  terms: string[];
  /** Length in words (for triage weights); defaults to the number of terms when absent. */
  words?: number;
}

/** Why a passage is not in the pool. */
export type PoolExclusion = 'interviewer' | 'short' | 'small-talk' | 'coded' | 'nothing-to-code' | 'claimed' | 'not-scored';

/** The theme that came nearest to claiming an unclaimed passage ("almost X"). */
export interface NearestTheme {
  themeId: string;
  confidence: number;
  /** The theme's threshold, when the caller gave thresholds. */
  threshold?: number;
}

export interface PoolEntry {
  id: string;
  transcript: string;
  speaker: string | null;
  /** Topic lemmas: the content lemmas less small talk and clitics (pool.ts, topicTerms). */
  terms: string[];
  words: number;
  /** The best-scoring theme that could have claimed the passage; null when none was scored. */
  nearest: NearestTheme | null;
  /** Themes above threshold that do not claim at this level (e.g. "Informative" with no leaf). */
  clearedParents: string[];
  /** The chance that no theme of the template applies (pool.ts, noneFits). */
  noneFits: number;
}

export interface PoolResult {
  /** The unclaimed pool, in the order passages were given. */
  pool: PoolEntry[];
  /** Every other passage given, with the first rule that kept it out. */
  excluded: { id: string; reason: PoolExclusion }[];
  counts: Record<PoolExclusion | 'unclaimed', number>;
}

/** What discover() clusters: a pool entry, or anything with these fields. */
export interface DiscoverItem {
  id: string;
  transcript: string;
  speaker: string | null;
  /** Content (or topic) lemmas, from the same analysis as the background lists. */
  terms: string[];
}

/** The vectors k-means works on: the sparse TF-IDF vectors (default) or dense bounded rows. */
export type Representation = 'sparse' | 'vocabulary' | 'projection';

export interface TermScore {
  term: string;
  /** Weighted log-odds ratio, cluster vs the rest of the study. */
  weight: number;
  z: number;
}

export interface Cluster {
  /** C1, C2, ... by size (largest first), ties by the cluster's first passage. */
  id: string;
  size: number;
  /** Distinctive terms: log-odds with an informative Dirichlet prior vs the rest of the study. */
  terms: TermScore[];
  /** The passages closest to the centroid (cosine on TF-IDF), closest first. */
  central: { passageId: string; similarity: number }[];
  transcripts: { count: number; names: { name: string; passages: number }[] };
  speakers: { name: string; passages: number }[];
  /** Mean cosine of the members to the centroid (TF-IDF, unit vectors). */
  cohesion: number;
  /** Members, in natural id order. */
  passageIds: string[];
  /** Members that a coder dismissed in an earlier run (see dismissals.ts); empty otherwise. */
  dismissedBefore: string[];
}

/** A cluster held back because it is mostly material a coder already dismissed. */
export interface SuppressedCluster {
  size: number;
  passageIds: string[];
  /** Members never dismissed (too few to bring the cluster back). */
  newPassageIds: string[];
  /** The dismissals its members came from. */
  dismissalIds: string[];
}

export interface Dismissal {
  id: string;
  /** The passages of the dismissed cluster, as they were when the coder dismissed it. */
  passageIds: string[];
}

export interface DiscoverOptions {
  /** Fixed number of clusters; otherwise chosen by mean silhouette over kRange. */
  k?: number;
  /** Inclusive range of k tried (default 2 .. min(12, floor(n / 5))). */
  kRange?: [number, number];
  /** Seeded k-means++ restarts per k; the lowest inertia is kept (default 5). */
  restarts?: number;
  seed?: number;
  maxIterations?: number;
  /** k-means on the sparse TF-IDF vectors (default), or on dense bounded rows (represent.ts). */
  representation?: Representation;
  /** Widest dense rows (default 256); fewer when `maxCells` / passages is smaller. Dense only. */
  dims?: number;
  /** Bound on passages x width of the dense rows, i.e. on memory and time (default 8,000,000). */
  maxCells?: number;
  /** Non-zeros per term in the sparse random projection (default 4). */
  projectionNonZeros?: number;
  /** Pools larger than this choose k on a seeded sample of this many passages (default 2000). */
  sweepSample?: number;
  /** Restarts per k while choosing k (default 2); the chosen k is then fitted with `restarts`. */
  sweepRestarts?: number;
  /** Silhouettes over more passages than this use a seeded sample of this size (default 20000). */
  silhouetteSample?: number;
  /** Distinctive terms per cluster (default 10); central passages per cluster (default 3). */
  terms?: number;
  central?: number;
  /** Total pseudo-count of the log-odds prior (default 500, as the suggester). */
  priorStrength?: number;
  /** Earlier dismissals, and the rule that may bring their passages back (dismissals.ts). */
  dismissals?: Dismissal[];
  minNewShare?: number;
  minNew?: number;
}

export interface DiscoverResult {
  k: number;
  /** How k was set. */
  chosenBy: 'silhouette' | 'option' | 'small-pool' | 'none';
  /** Mean silhouette (cosine, TF-IDF) of the best run for every k tried. */
  silhouette: { k: number; score: number }[];
  /** Whether the sweep ran on a sample of the pool, and on how many passages. */
  sweep: { passages: number; sampled: boolean };
  /** Mean silhouette of the final partition over the whole pool (null for k < 2). */
  finalSilhouette: number | null;
  inertia: number;
  representation: { method: Representation; dims: number; vocabulary: number };
  clusters: Cluster[];
  suppressed: SuppressedCluster[];
  /** Pool passages in no shown cluster: empty vectors and new members of suppressed clusters. */
  unclustered: string[];
  /** Pool passages a dismissal keeps out (they were dismissed and nothing new joined them). */
  dropped: string[];
}
