/** Discovery: the unclaimed pool, its clusters (possible new themes), dismissals and triage. */
export { SMALL_TALK, claimingThemes, isSubstantive, substantiveCheck, topicTerms, NONE_FITS_AT, noneFits, unclaimedPool, type PoolInput, type PoolOptions } from './pool.js';
export { byNovelty, clusterNearness, type ClusterNearness, type NearnessInput } from './nearest.js';
export { discover, resolveDiscoverOptions } from './discover.js';
export { assign, distinctRows, kmeansRestarts, lloyd, type DenseInput, type KMeansFit, type KMeansInput, type KMeansOptions } from './kmeans.js';
export { denseRows, projectionOf, type DenseOptions } from './represent.js';
export { dismissedIndex, judgeCluster, type ClusterVerdict, type DismissalRule } from './dismissals.js';
export { triage, type TranscriptTriage, type TriageInput } from './triage.js';
export { naturalCompare } from './order.js';
export type * from './types.js';
