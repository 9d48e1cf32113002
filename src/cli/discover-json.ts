/**
 * The JSON of `trellis discover`, `promote`, `dismiss` and `triage` (docs/schema/), keys in
 * snake_case. The keys the scripting contract names (clusters[].cluster_id, size, terms,
 * passage_ids; unclaimed) come first and keep their meaning.
 */
import type { TranscriptTriage } from '../discover/triage.js';
import type { DiscoveryRun, Promotion } from '../jobs/discovery.js';
import type { StoredCluster } from '../study/clusters.js';

export function discoverJson(run: DiscoveryRun) {
  const pool = run.pool.pool;
  return {
    run_id: run.runId,
    k: run.result.k,
    silhouette: run.result.silhouette,
    clusters: run.clusters.map((c) => ({
      cluster_id: c.cluster_id,
      label: c.label,
      size: c.size,
      terms: c.detail.terms.map((t) => t.term),
      passage_ids: c.passage_ids,
      term_weights: c.detail.terms,
      central: c.detail.central,
      transcripts: c.detail.transcripts,
      speakers: c.detail.speakers,
      cohesion: c.cohesion,
      dismissed_before: c.detail.dismissed_before,
      nearest_theme: c.detail.nearest_theme?.path ?? null,
      nearest_theme_id: c.detail.nearest_theme?.theme_id ?? null,
      closeness: c.detail.nearest_theme?.closeness ?? 0,
      nearest_top_share: c.detail.nearest_theme?.top_share ?? 0,
      novelty: c.detail.novelty ?? 1,
    })),
    unclaimed: pool.map((p) => p.id),
    // Maps keyed by passage id: the keys are ids, not names.
    nearest: Object.fromEntries(
      pool.map((p) => [p.id, p.nearest && { theme_id: p.nearest.themeId, confidence: p.nearest.confidence, ...(p.nearest.threshold === undefined ? {} : { threshold: p.nearest.threshold }) }]),
    ),
    none_fits: Object.fromEntries(pool.map((p) => [p.id, p.noneFits])),
    none_fits_at: run.noneFitsAt,
    suppressed: run.result.suppressed.map((s) => ({ size: s.size, passage_ids: s.passageIds, new_passage_ids: s.newPassageIds, dismissal_ids: s.dismissalIds })),
  };
}

export function promoteJson(p: Promotion) {
  return { cluster_id: p.cluster_id, theme_id: p.themeId, path: p.path, into_existing: p.into_existing, rev: p.rev, decision_id: p.decisionId, run_id: p.runId, suggestions: p.suggestions };
}

export function triageJson(rows: TranscriptTriage[], clusters: StoredCluster[]) {
  const labels = new Map(clusters.map((c) => [c.cluster_id, c.label]));
  return {
    transcripts: rows.map((r) => ({
      transcript: r.transcript,
      coded_passages: r.coded_passages,
      partly_coded: r.partly_coded,
      unclaimed_share: r.unclaimedShare,
      unclaimed_words: r.unclaimedWords,
      substantive_words: r.substantiveWords,
      unclaimed_passages: r.unclaimedPassages,
      substantive_passages: r.substantivePassages,
      themes: r.themes.map((t) => ({ theme_id: t.themeId, passages: t.passages })),
      clusters: r.clusters.map((c) => ({
        cluster_id: c.clusterId,
        passages: c.passages,
        share_of_cluster: c.shareOfCluster,
        share_of_transcript: c.shareOfTranscript,
        label: labels.get(c.clusterId) ?? null,
      })),
    })),
  };
}
