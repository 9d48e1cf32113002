import { discover } from '../discover/discover.js';
import { NONE_FITS_AT, unclaimedPool, type PoolOptions } from '../discover/pool.js';
import { triage, type TranscriptTriage } from '../discover/triage.js';
import type { DiscoverOptions, DiscoverResult, Dismissal, PoolCandidate, PoolResult } from '../discover/types.js';
import { UserError } from '../errors.js';
import { addTheme } from '../template/ops.js';
import { findByPath } from '../template/paths.js';
import { byNovelty, clusterNearness } from '../discover/nearest.js';
import { CLUSTER_KEY, clusterKey, clusterLabel } from '../discover/key.js';
import type { PassageSuggestions } from '../suggest/types.js';
import type { DB } from './db.js';
import { nothingToCode } from './decisions.js';
import { getPassage } from './passages.js';
import { reviseTemplate } from './revise.js';
import { fitModel } from './suggestions.js';
import { currentRevision, currentTemplate, themePaths } from './template.js';

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

export interface DiscoveryRun {
  runId: number;
  result: DiscoverResult;
  pool: PoolResult;
  clusters: StoredCluster[];
  /** The pool rule's cut: a passage is unclaimed when its chance that no theme applies reaches it. */
  noneFitsAt: number;
}

interface Scored {
  passages: PoolCandidate[];
  suggestions: PassageSuggestions[];
  pool: PoolResult;
  fingerprint: string;
  codedPassages: Set<string>;
  background: string[][];
  /** Stores the fitted model state (call inside the command's write, once it has succeeded). */
  keep: () => void;
}

/** How far a discovery or triage is: the step, and the share of it done (0 to 1). */
export type DiscoveryProgress = (step: 'fit' | 'score' | 'cluster', done: number) => void;

/** Fits the suggestion model, scores every uncoded passage and sorts out the unclaimed pool. */
function scoreStudy(db: DB, poolOpts: PoolOptions = {}, progress?: DiscoveryProgress): Scored {
  const { model, inputs, negatives, keep } = fitModel(db, {}, progress && ((d) => progress('fit', d)));
  const stored = new Map((db.prepare('SELECT id, words, speaker FROM passages').all() as { id: string; words: number; speaker: string | null }[]).map((r) => [r.id, r]));
  const passages: PoolCandidate[] = inputs.passages.map((p) => {
    const row = stored.get(p.id);
    return { id: p.id, transcript: p.transcript, speaker: row?.speaker ?? null, role: p.role, terms: p.terms, words: row?.words };
  });
  const suggestions = model.predict(inputs.uncoded, { reasons: 0, progress: progress && ((d) => progress('score', d)) });
  const thresholds = Object.fromEntries(model.themeReports().map((r) => [r.themeId, r.threshold]));
  const pool = unclaimedPool(
    { passages, suggestions, themes: inputs.themes.map((t) => ({ id: t.id, parentId: t.parentId })), codings: inputs.codings, rejected: negatives, nothingToCode: nothingToCode(db), thresholds },
    poolOpts,
  );
  const codedPassages = new Set(inputs.codings.map((c) => c.passageId));
  return { passages, suggestions, pool, fingerprint: model.fingerprint, codedPassages, background: inputs.passages.map((p) => p.terms), keep };
}

function dismissals(db: DB): Dismissal[] {
  const rows = db.prepare("SELECT id, key FROM clusters WHERE status = 'dismissed' ORDER BY id").all() as { id: number; key: string | null }[];
  const members = db.prepare('SELECT passage_id FROM cluster_passages WHERE cluster_id = ? ORDER BY passage_id');
  return rows.map((r) => ({ id: r.key ?? String(r.id), passageIds: (members.all(r.id) as { passage_id: string }[]).map((m) => m.passage_id) }));
}

/**
 * `discover`: clusters the unclaimed pool into possible new themes and stores the run; clusters a
 * coder dismissed before do not come back unless new material joins them.
 */
export function runDiscovery(db: DB, opts: DiscoverOptions = {}, progress?: DiscoveryProgress): DiscoveryRun {
  const rev = currentRevision(db);
  if (!rev) throw new UserError('the study has no template yet: run "trellis template set FILE" first');
  const noneFitsAt = NONE_FITS_AT;
  const scored = scoreStudy(db, { noneFitsAt }, progress);
  progress?.('cluster', 0);
  const n = scored.pool.pool.length;
  if (opts.k !== undefined && n > 0 && opts.k > n) throw new UserError(`--k ${opts.k} is out of range: the unclaimed pool holds ${n} passage${n === 1 ? '' : 's'}, so k can be 1 to ${n}`);
  const result = discover(scored.pool.pool, scored.background, { ...opts, dismissals: dismissals(db) }, progress && ((d) => progress('cluster', d)));
  return db.transaction(() => {
    const runId = Number(
      db
        .prepare('INSERT INTO discovery_runs (created_at, rev, fingerprint, pool, k, silhouettes, options) VALUES (?, ?, ?, ?, ?, ?, ?)')
        .run(new Date().toISOString(), rev.rev, scored.fingerprint, scored.pool.pool.length, result.k, JSON.stringify(result.silhouette), JSON.stringify(opts))
        .lastInsertRowid,
    );
    const insC = db.prepare('INSERT INTO clusters (run_id, label, size, cohesion, detail, key) VALUES (?, ?, ?, ?, ?, ?)');
    const keys = new Set<string>();
    const insP = db.prepare('INSERT INTO cluster_passages (cluster_id, passage_id, similarity) VALUES (?, ?, ?)');
    const paths = themePaths(db);
    const near = {
      candidates: new Map(scored.suggestions.map((s) => [s.passageId, s.candidates])),
      noneFits: new Map(scored.pool.pool.map((p) => [p.id, p.noneFits])),
    };
    const clusters = byNovelty(result.clusters.map((c) => ({ c, ...clusterNearness(c.passageIds, near), size: c.size }))).map(({ c, themeId, closeness, topShare, novelty }): StoredCluster => {
      const detail: ClusterDetail = {
        terms: c.terms.map((t) => ({ term: t.term, weight: t.weight, z: t.z })),
        central: c.central.map((x) => {
          const p = getPassage(db, x.passageId)!;
          return { passage_id: x.passageId, transcript: p.transcript, similarity: x.similarity, text: p.text };
        }),
        transcripts: c.transcripts.names.map((n) => n.name),
        speakers: c.speakers,
        dismissed_before: c.dismissedBefore,
        nearest_theme: themeId === null ? null : { theme_id: themeId, path: paths.get(themeId) ?? themeId, closeness, top_share: topShare },
        novelty,
      };
      // Two clusters of one run never share members, so a clash of short keys is a hash collision.
      let key = clusterKey(c.passageIds);
      for (let n = 8; keys.has(key); n += 2) key = clusterKey(c.passageIds, n);
      keys.add(key);
      const id = Number(insC.run(runId, c.id, c.size, c.cohesion, JSON.stringify(detail), key).lastInsertRowid);
      const sim = new Map(c.central.map((x) => [x.passageId, x.similarity]));
      for (const p of c.passageIds) insP.run(id, p, sim.get(p) ?? 0);
      return { row_id: id, cluster_id: key, label: clusterLabel(detail.terms.map((t) => t.term)), size: c.size, cohesion: c.cohesion, status: 'open', passage_ids: [...c.passageIds].sort(), detail };
    });
    scored.keep();
    progress?.('cluster', 1);
    return { runId, result, pool: scored.pool, clusters, noneFitsAt };
  })();
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

function openCluster(db: DB, ref: string): StoredCluster {
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

export interface Promotion {
  cluster_id: string;
  themeId: string;
  /** The theme's path: the new theme's, or the existing one's it was sent into. */
  path: string;
  /** A new theme (a template revision), or an existing theme (no revision). */
  into_existing: boolean;
  rev: number;
  decisionId: number;
  runId: number;
  suggestions: number;
}

/** A new theme (a name, optionally under a parent), or an existing theme (`into`). */
export type PromoteTarget = { name: string; parentPath?: string } | { into: string };

/**
 * `promote`: the cluster's passages become suggestions of a theme for review, not codings. The
 * theme is new (a template revision recording the cluster, with its distinctive terms as seed
 * terms and no definition yet: the researcher writes it), or an existing theme of the template.
 * The suggestions' confidence is the passage's closeness to the cluster (cosine), since there is
 * no calibration for this grouping; their reasons say so.
 */
export function promoteCluster(db: DB, studyDir: string, ref: string, target: PromoteTarget, coder: string, note?: string): Promotion {
  return db
    .transaction((): Promotion => {
      const c = openCluster(db, ref);
      let themeId = '';
      let rev: number;
      const into = 'into' in target;
      if ('into' in target) {
        themeId = findByPath(currentTemplate(db), target.into).id;
        rev = currentRevision(db)!.rev;
      } else {
        const seeds = c.detail.terms.slice(0, 8).map((t) => t.term);
        const r = reviseTemplate(
          db,
          studyDir,
          `promote cluster ${c.cluster_id} (${c.label})`,
          (t, allocate) => {
            const parent = target.parentPath ? findByPath(t, target.parentPath).id : null;
            const out = addTheme(t, parent, target.name, allocate, { seeds });
            themeId = out.id;
            return out;
          },
          coder,
          note ?? `promoted from cluster ${c.cluster_id} (${c.size} unclaimed passages)`,
        );
        rev = r.rev!;
      }
      const decisionId = logClusterDecision(db, 'promote', c, coder, note ?? null, themeId);
      db.prepare("UPDATE clusters SET status = 'promoted', theme_id = ? WHERE id = ?").run(themeId, c.row_id);
      const runId = Number(
        db
          .prepare('INSERT INTO suggestion_runs (created_at, rev, fingerprint, options, passages, unclaimed) VALUES (?, ?, ?, ?, ?, 0)')
          .run(new Date().toISOString(), rev, `cluster-${c.cluster_id}`, JSON.stringify({ source: 'promote', cluster: c.cluster_id, into_existing: into }), c.passage_ids.length)
          .lastInsertRowid,
      );
      const sims = db.prepare('SELECT passage_id, similarity FROM cluster_passages WHERE cluster_id = ?').all(c.row_id) as { passage_id: string; similarity: number }[];
      const closeness = new Map(sims.map((s) => [s.passage_id, s.similarity]));
      const ins = db.prepare('INSERT INTO suggestions (run_id, passage_id, theme_id, rank, confidence, above, chosen, reasons) VALUES (?, ?, ?, 1, ?, 1, 1, ?)');
      for (const p of c.passage_ids) {
        // Only the central passages' closeness is kept; the others get the cluster's cohesion.
        const sim = closeness.get(p) || c.cohesion;
        ins.run(runId, p, themeId, sim, JSON.stringify([{ kind: 'cluster', clusterId: c.cluster_id, label: c.label, similarity: sim }]));
      }
      const path = themePaths(db).get(themeId)!;
      return { cluster_id: c.cluster_id, themeId, path, into_existing: into, rev, decisionId, runId, suggestions: c.passage_ids.length };
    })
    .immediate();
}

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

/** `triage`: transcripts with passages left to code, ranked by how much of that part the template fails to claim. */
export function triageStudy(db: DB, transcripts?: string[], progress?: DiscoveryProgress): { rows: TranscriptTriage[]; clusters: StoredCluster[] } {
  const noneFitsAt = NONE_FITS_AT;
  const scored = scoreStudy(db, { noneFitsAt }, progress);
  const clusters = latestClusters(db).filter((c) => c.status === 'open');
  const done = new Set([...scored.codedPassages, ...nothingToCode(db)]);
  let rows = triage({
    passages: scored.passages,
    done,
    suggestions: scored.suggestions,
    unclaimed: scored.pool.pool.map((p) => p.id),
    clusters: clusters.map((c) => ({ id: c.cluster_id, passageIds: c.passage_ids })),
  });
  if (transcripts?.length) rows = rows.filter((r) => transcripts.includes(r.transcript));
  if (!db.readonly) db.transaction(scored.keep)();
  return { rows, clusters };
}
