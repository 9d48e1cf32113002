import { discover } from '../discover/discover.js';
import { unclaimedPool, type PoolOptions } from '../discover/pool.js';
import { triage, type TranscriptTriage } from '../discover/triage.js';
import type { DiscoverOptions, DiscoverResult, Dismissal, PoolCandidate, PoolResult } from '../discover/types.js';
import { UserError } from '../errors.js';
import { addTheme } from '../template/ops.js';
import { findByPath } from '../template/paths.js';
import type { PassageSuggestions } from '../suggest/types.js';
import type { DB } from './db.js';
import { nothingToCode } from './decisions.js';
import { getPassage } from './passages.js';
import { reviseTemplate } from './revise.js';
import { fitModel } from './suggestions.js';
import { currentRevision } from './template.js';

/** What the store keeps of a cluster beside its counts (clusters.detail). */
export interface ClusterDetail {
  terms: { term: string; weight: number; z: number }[];
  central: { passage_id: string; transcript: string; similarity: number; text: string }[];
  transcripts: string[];
  speakers: { name: string; passages: number }[];
  dismissed_before: string[];
}

export interface StoredCluster {
  cluster_id: number;
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
}

interface Scored {
  passages: PoolCandidate[];
  suggestions: PassageSuggestions[];
  pool: PoolResult;
  fingerprint: string;
  codedPassages: Set<string>;
  background: string[][];
}

/** Fits the suggestion model, scores every uncoded passage and sorts out the unclaimed pool. */
function scoreStudy(db: DB, poolOpts: PoolOptions = {}): Scored {
  const { model, inputs, negatives } = fitModel(db);
  const stored = new Map((db.prepare('SELECT id, words, speaker FROM passages').all() as { id: string; words: number; speaker: string | null }[]).map((r) => [r.id, r]));
  const passages: PoolCandidate[] = inputs.passages.map((p) => {
    const row = stored.get(p.id);
    return { id: p.id, transcript: p.transcript, speaker: row?.speaker ?? null, role: p.role, terms: p.terms, words: row?.words };
  });
  const suggestions = model.predict(inputs.uncoded, { reasons: 0 });
  const thresholds = Object.fromEntries(model.themeReports().map((r) => [r.themeId, r.threshold]));
  const pool = unclaimedPool(
    { passages, suggestions, themes: inputs.themes.map((t) => ({ id: t.id, parentId: t.parentId })), codings: inputs.codings, rejected: negatives, nothingToCode: nothingToCode(db), thresholds },
    poolOpts,
  );
  const codedPassages = new Set(inputs.codings.map((c) => c.passageId));
  return { passages, suggestions, pool, fingerprint: model.fingerprint, codedPassages, background: inputs.passages.map((p) => p.terms) };
}

function dismissals(db: DB): Dismissal[] {
  const rows = db.prepare("SELECT id FROM clusters WHERE status = 'dismissed' ORDER BY id").all() as { id: number }[];
  const members = db.prepare('SELECT passage_id FROM cluster_passages WHERE cluster_id = ? ORDER BY passage_id');
  return rows.map((r) => ({ id: String(r.id), passageIds: (members.all(r.id) as { passage_id: string }[]).map((m) => m.passage_id) }));
}

/**
 * `discover`: clusters the unclaimed pool into possible new themes and stores the run; clusters a
 * coder dismissed before do not come back unless new material joins them.
 */
export function runDiscovery(db: DB, opts: DiscoverOptions = {}): DiscoveryRun {
  const rev = currentRevision(db);
  if (!rev) throw new UserError('the study has no template yet: run "trellis template set FILE" first');
  const scored = scoreStudy(db);
  const result = discover(scored.pool.pool, scored.background, { ...opts, dismissals: dismissals(db) });
  return db.transaction(() => {
    const runId = Number(
      db
        .prepare('INSERT INTO discovery_runs (created_at, rev, fingerprint, pool, k, silhouettes, options) VALUES (?, ?, ?, ?, ?, ?, ?)')
        .run(new Date().toISOString(), rev.rev, scored.fingerprint, scored.pool.pool.length, result.k, JSON.stringify(result.silhouette), JSON.stringify(opts))
        .lastInsertRowid,
    );
    const insC = db.prepare('INSERT INTO clusters (run_id, label, size, cohesion, detail) VALUES (?, ?, ?, ?, ?)');
    const insP = db.prepare('INSERT INTO cluster_passages (cluster_id, passage_id, similarity) VALUES (?, ?, ?)');
    const clusters = result.clusters.map((c): StoredCluster => {
      const detail: ClusterDetail = {
        terms: c.terms.map((t) => ({ term: t.term, weight: t.weight, z: t.z })),
        central: c.central.map((x) => {
          const p = getPassage(db, x.passageId)!;
          return { passage_id: x.passageId, transcript: p.transcript, similarity: x.similarity, text: p.text };
        }),
        transcripts: c.transcripts.names.map((n) => n.name),
        speakers: c.speakers,
        dismissed_before: c.dismissedBefore,
      };
      const id = Number(insC.run(runId, c.id, c.size, c.cohesion, JSON.stringify(detail)).lastInsertRowid);
      const sim = new Map(c.central.map((x) => [x.passageId, x.similarity]));
      for (const p of c.passageIds) insP.run(id, p, sim.get(p) ?? 0);
      return { cluster_id: id, label: c.id, size: c.size, cohesion: c.cohesion, status: 'open', passage_ids: c.passageIds, detail };
    });
    return { runId, result, pool: scored.pool, clusters };
  })();
}

export function getCluster(db: DB, id: number): StoredCluster {
  const r = db.prepare('SELECT id, label, size, cohesion, status, detail FROM clusters WHERE id = ?').get(id) as
    | { id: number; label: string; size: number; cohesion: number; status: StoredCluster['status']; detail: string }
    | undefined;
  if (!r) throw new UserError(`no cluster ${id} in this study (see "trellis discover")`);
  const ids = (db.prepare('SELECT passage_id FROM cluster_passages WHERE cluster_id = ? ORDER BY passage_id').all(id) as { passage_id: string }[]).map((x) => x.passage_id);
  return { cluster_id: r.id, label: r.label, size: r.size, cohesion: r.cohesion, status: r.status, passage_ids: ids, detail: JSON.parse(r.detail) as ClusterDetail };
}

function openCluster(db: DB, id: number): StoredCluster {
  const c = getCluster(db, id);
  if (c.status !== 'open') throw new UserError(`cluster ${id} was already ${c.status}`);
  const latest = (db.prepare('SELECT MAX(id) AS id FROM discovery_runs').get() as { id: number }).id;
  const run = (db.prepare('SELECT run_id FROM clusters WHERE id = ?').get(id) as { run_id: number }).run_id;
  if (run !== latest) throw new UserError(`cluster ${id} is from an earlier discovery run; run "trellis discover" again and use its cluster ids`);
  return c;
}

function logClusterDecision(db: DB, action: 'promote' | 'dismiss', clusterId: number, coder: string, note: string | null, themeId: string | null): number {
  const rev = currentRevision(db);
  return Number(
    db
      .prepare('INSERT INTO decisions (at, coder, action, cluster_id, chosen_theme, note, rev) VALUES (?, ?, ?, ?, ?, ?, ?)')
      .run(new Date().toISOString(), coder, action, clusterId, themeId, note, rev?.rev ?? null).lastInsertRowid,
  );
}

export interface Promotion {
  themeId: string;
  rev: number;
  decisionId: number;
  runId: number;
  suggestions: number;
}

/**
 * `promote`: the cluster becomes a theme (a template revision, its distinctive terms as seed
 * terms), and each of its passages a suggestion of that theme for review, not a coding. The
 * suggestions' confidence is the passage's closeness to the cluster (cosine), since the new
 * theme has no coded passage to calibrate on yet; its reasons say so.
 */
export function promoteCluster(db: DB, studyDir: string, id: number, name: string, parentPath: string | undefined, coder: string, note?: string): Promotion {
  return db
    .transaction((): Promotion => {
      const c = openCluster(db, id);
      let newId = '';
      const seeds = c.detail.terms.slice(0, 8).map((t) => t.term);
      const rev = reviseTemplate(
        db,
        studyDir,
        'promote',
        (t, allocate) => {
          const parent = parentPath ? findByPath(t, parentPath).id : null;
          const r = addTheme(t, parent, name, allocate, { seeds, definition: `Promoted from cluster ${c.label} (${c.size} unclaimed passages).` });
          newId = r.id;
          return r;
        },
        coder,
        note ?? `promoted from cluster ${id}`,
      );
      const decisionId = logClusterDecision(db, 'promote', id, coder, note ?? null, newId);
      db.prepare("UPDATE clusters SET status = 'promoted', theme_id = ? WHERE id = ?").run(newId, id);
      const fingerprint = `cluster-${id}`;
      const runId = Number(
        db
          .prepare('INSERT INTO suggestion_runs (created_at, rev, fingerprint, options, passages, unclaimed) VALUES (?, ?, ?, ?, ?, 0)')
          .run(new Date().toISOString(), rev.rev!, fingerprint, JSON.stringify({ source: 'promote', cluster: id }), c.passage_ids.length)
          .lastInsertRowid,
      );
      const sims = db.prepare('SELECT passage_id, similarity FROM cluster_passages WHERE cluster_id = ?').all(id) as { passage_id: string; similarity: number }[];
      const closeness = new Map(sims.map((s) => [s.passage_id, s.similarity]));
      const ins = db.prepare('INSERT INTO suggestions (run_id, passage_id, theme_id, rank, confidence, above, chosen, reasons) VALUES (?, ?, ?, 1, ?, 1, 1, ?)');
      for (const p of c.passage_ids) {
        // Only the central passages' closeness is kept; the others get the cluster's cohesion.
        const sim = closeness.get(p) || c.cohesion;
        ins.run(runId, p, newId, sim, JSON.stringify([{ kind: 'cluster', clusterId: id, label: c.label, similarity: sim }]));
      }
      return { themeId: newId, rev: rev.rev!, decisionId, runId, suggestions: c.passage_ids.length };
    })
    .immediate();
}

export function dismissCluster(db: DB, id: number, coder: string, note: string): number {
  return db
    .transaction(() => {
      openCluster(db, id);
      const d = logClusterDecision(db, 'dismiss', id, coder, note, null);
      db.prepare("UPDATE clusters SET status = 'dismissed' WHERE id = ?").run(id);
      return d;
    })
    .immediate();
}

/** The clusters of the latest discovery run. */
export function latestClusters(db: DB): StoredCluster[] {
  const run = db.prepare('SELECT MAX(id) AS id FROM discovery_runs').get() as { id: number | null };
  if (run.id === null) return [];
  return (db.prepare('SELECT id FROM clusters WHERE run_id = ? ORDER BY id').all(run.id) as { id: number }[]).map((r) => getCluster(db, r.id));
}

/** `triage`: transcripts with passages left to code, ranked by how much of that part the template fails to claim. */
export function triageStudy(db: DB, transcripts?: string[]): { rows: TranscriptTriage[]; clusters: StoredCluster[] } {
  const scored = scoreStudy(db);
  const clusters = latestClusters(db).filter((c) => c.status === 'open');
  const done = new Set([...scored.codedPassages, ...nothingToCode(db)]);
  let rows = triage({
    passages: scored.passages,
    done,
    suggestions: scored.suggestions,
    unclaimed: scored.pool.pool.map((p) => p.id),
    clusters: clusters.map((c) => ({ id: String(c.cluster_id), passageIds: c.passage_ids })),
  });
  if (transcripts?.length) rows = rows.filter((r) => transcripts.includes(r.transcript));
  return { rows, clusters };
}
