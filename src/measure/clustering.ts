/** Measures for discovery: how well clusters hold together, and how two partitions agree. */
export {
  silhouetteSamples,
  silhouetteScore,
  type DenseRow,
  type Row,
  type SilhouetteMetric,
  type SilhouetteOptions,
  type SparseRow,
} from './silhouette.js';
export { adjustedRandIndex, normalizedMutualInfo } from './partitions.js';
