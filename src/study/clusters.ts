/** The rows of discovery runs, their clusters, and the decisions taken on clusters. */
import { CLUSTER_KEY, clusterKey, clusterLabel } from '../discover/key.js';
import type { Dismissal } from '../discover/types.js';
import { UserError } from '../errors.js';
import type { DB } from './db.js';
import { currentRevision } from './template.js';

/** What the store keeps of a cluster beside its counts (clusters.detail). */
export interface ClusterDetail {
  terms: { term: string; weight: number; z: number }[];
  central: { passage_id: string; transcript: string; similarity: number; text: string }[];
  transcripts: string[];
  speakers: { name: string; passages: number }[];
  dismissed_before: string[];
  /** The nearest existing theme (nearest.ts): its id and path when the run was made. */
  nearest_theme?: { theme_id: string; path: string; closeness: number; top_share: number } | null;
  /** Mean chance over the members that no theme applies. */
  novelty?: number;
}

export interface StoredCluster {
  /** The row of this run's cluster (internal). */
  row_id: number;
  /** The stable id, as printed and accepted by commands: the same whenever the members are. */
  cluster_id: string;
  /** Its top terms: the name a researcher reads. */
  label: string;
  size: number;
  cohesion: number;
  status: 'open' | 'promoted' | 'dismissed';
  passage_ids: string[];
  detail: ClusterDetail;
}

/** Each passage's word count and speaker label, by passage id. */
export function passageFacts(db: DB): Map<string, { id: string; words: number; speaker: string | null }> {
  return new Map((db.prepare('SELECT id, words, speaker FROM passages').all() as { id: string; words: number; speaker: string | null }[]).map((r) => [r.id, r]));
}

/** The clusters a coder dismissed, with their members (they do not come back unless new material joins them). */
export function dismissals(db: DB): Dismissal[] {
  const rows = db.prepare("SELECT id, key FROM clusters WHERE status = 'dismissed' ORDER BY id").all() as { id: number; key: string | null }[];
  const members = db.prepare('SELECT passage_id FROM cluster_passages WHERE cluster_id = ? ORDER BY passage_id');
  return rows.map((r) => ({ id: r.key ?? String(r.id), passageIds: (members.all(r.id) as { passage_id: string }[]).map((m) => m.passage_id) }));
}

export interface NewCluster {
  /** The clustering's own name for it (clusters.label). */
  label: string;
  size: number;
  cohesion: number;
  detail: ClusterDetail;
  key: string;
  passageIds: readonly string[];
  /** Closeness of the central passages; the others are stored as 0. */
  similarity: ReadonlyMap<string, number>;
}

/** Stores a discovery run and its clusters (call inside the command's write); returns the run id and each cluster's row id. */
export function storeDiscoveryRun(
  db: DB,
  run: { rev: number; fingerprint: string; pool: number; k: number; silhouettes: unknown; options: unknown },
  clusters: readonly NewCluster[],
): { runId: number; rowIds: number[] } {
  const runId = Number(
    db
      .prepare('INSERT INTO discovery_runs (created_at, rev, fingerprint, pool, k, silhouettes, options) VALUES (?, ?, ?, ?, ?, ?, ?)')
      .run(new Date().toISOString(), run.rev, run.fingerprint, run.pool, run.k, JSON.stringify(run.silhouettes), JSON.stringify(run.options)).lastInsertRowid,
  );
  const insC = db.prepare('INSERT INTO clusters (run_id, label, size, cohesion, detail, key) VALUES (?, ?, ?, ?, ?, ?)');
  const insP = db.prepare('INSERT INTO cluster_passages (cluster_id, passage_id, similarity) VALUES (?, ?, ?)');
  const rowIds = clusters.map((c) => {
    const id = Number(insC.run(runId, c.label, c.size, c.cohesion, JSON.stringify(c.detail), c.key).lastInsertRowid);
    for (const p of c.passageIds) insP.run(id, p, c.similarity.get(p) ?? 0);
    return id;
  });
  return { runId, rowIds };
}

function storedCluster(db: DB, rowId: number): StoredCluster {
  const r = db.prepare('SELECT id, key, size, cohesion, status, detail FROM clusters WHERE id = ?').get(rowId) as {
    id: number;
    key: string | null;
    size: number;
    cohesion: number;
    status: StoredCluster['status'];
    detail: string;
  };
  const ids = (db.prepare('SELECT passage_id FROM cluster_passages WHERE cluster_id = ? ORDER BY passage_id').all(rowId) as { passage_id: string }[]).map((x) => x.passage_id);
  const detail = JSON.parse(r.detail) as ClusterDetail;
  return { row_id: r.id, cluster_id: r.key ?? clusterKey(ids), label: clusterLabel(detail.terms.map((t) => t.term)), size: r.size, cohesion: r.cohesion, status: r.status, passage_ids: ids, detail };
}

const NOT_A_CLUSTER = (ref: string) => `no cluster "${ref}" in this study: cluster ids are printed by "trellis discover" (like c3f9a1)`;

/** The latest run's cluster with this id (as printed); a clear UserError when there is none. */
export function getCluster(db: DB, ref: string): StoredCluster {
  const want = ref.trim().toLowerCase();
  if (!CLUSTER_KEY.test(want)) throw new UserError(NOT_A_CLUSTER(ref));
  const row = db.prepare('SELECT id FROM clusters WHERE key = ? ORDER BY id DESC LIMIT 1').get(want) as { id: number } | undefined;
  if (!row) throw new UserError(NOT_A_CLUSTER(ref));
  return storedCluster(db, row.id);
}

/** A cluster of the latest run that no one has promoted or dismissed yet; a UserError otherwise. */
export function openCluster(db: DB, ref: string): StoredCluster {
  const c = getCluster(db, ref);
  const latest = (db.prepare('SELECT MAX(id) AS id FROM discovery_runs').get() as { id: number }).id;
  const run = (db.prepare('SELECT run_id FROM clusters WHERE id = ?').get(c.row_id) as { run_id: number }).run_id;
  if (run !== latest) throw new UserError(`cluster ${c.cluster_id} is not among the clusters of the latest discovery run; run "trellis discover" again and use its cluster ids`);
  if (c.status !== 'open') throw new UserError(`cluster ${c.cluster_id} was already ${c.status}`);
  return c;
}

function logClusterDecision(db: DB, action: 'promote' | 'dismiss', c: StoredCluster, coder: string, note: string | null, themeId: string | null): number {
  const rev = currentRevision(db);
  return Number(
    db
      .prepare('INSERT INTO decisions (at, coder, action, cluster_id, chosen_theme, note, rev) VALUES (?, ?, ?, ?, ?, ?, ?)')
      .run(new Date().toISOString(), coder, action, c.cluster_id, themeId, note, rev?.rev ?? null).lastInsertRowid,
  );
}

/**
 * The rows of a promotion (inside the command's write): the logged decision, the cluster marked
 * promoted, and a suggestion run of the theme for each member. A suggestion's confidence is the
 * passage's closeness to the cluster (only the central passages' is kept; the others get the
 * cluster's cohesion), and its reason says it came from the cluster.
 */
export function storePromotion(db: DB, c: StoredCluster, themeId: string, rev: number, intoExisting: boolean, coder: string, note: string | null): { decisionId: number; runId: number } {
  const decisionId = logClusterDecision(db, 'promote', c, coder, note, themeId);
  db.prepare("UPDATE clusters SET status = 'promoted', theme_id = ? WHERE id = ?").run(themeId, c.row_id);
  const runId = Number(
    db
      .prepare('INSERT INTO suggestion_runs (created_at, rev, fingerprint, options, passages, unclaimed) VALUES (?, ?, ?, ?, ?, 0)')
      .run(new Date().toISOString(), rev, `cluster-${c.cluster_id}`, JSON.stringify({ source: 'promote', cluster: c.cluster_id, into_existing: intoExisting }), c.passage_ids.length)
      .lastInsertRowid,
  );
  const sims = db.prepare('SELECT passage_id, similarity FROM cluster_passages WHERE cluster_id = ?').all(c.row_id) as { passage_id: string; similarity: number }[];
  const closeness = new Map(sims.map((s) => [s.passage_id, s.similarity]));
  const ins = db.prepare('INSERT INTO suggestions (run_id, passage_id, theme_id, rank, confidence, above, chosen, reasons) VALUES (?, ?, ?, 1, ?, 1, 1, ?)');
  for (const p of c.passage_ids) {
    const sim = closeness.get(p) || c.cohesion;
    ins.run(runId, p, themeId, sim, JSON.stringify([{ kind: 'cluster', clusterId: c.cluster_id, label: c.label, similarity: sim }]));
  }
  return { decisionId, runId };
}

/** `dismiss`: sets an open cluster aside (logged); it does not come back unless new material joins it. */
export function dismissCluster(db: DB, ref: string, coder: string, note: string): { cluster_id: string; decision_id: number } {
  return db
    .transaction(() => {
      const c = openCluster(db, ref);
      const d = logClusterDecision(db, 'dismiss', c, coder, note, null);
      db.prepare("UPDATE clusters SET status = 'dismissed' WHERE id = ?").run(c.row_id);
      return { cluster_id: c.cluster_id, decision_id: d };
    })
    .immediate();
}

/** The clusters of the latest discovery run. */
export function latestClusters(db: DB): StoredCluster[] {
  const run = db.prepare('SELECT MAX(id) AS id FROM discovery_runs').get() as { id: number | null };
  if (run.id === null) return [];
  return (db.prepare('SELECT id FROM clusters WHERE run_id = ? ORDER BY id').all(run.id) as { id: number }[]).map((r) => storedCluster(db, r.id));
}
