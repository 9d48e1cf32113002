import { discover } from '../discover/discover.js';
import { NONE_FITS_AT, unclaimedPool, type PoolOptions } from '../discover/pool.js';
import { triage, type TranscriptTriage } from '../discover/triage.js';
import type { DiscoverOptions, DiscoverResult, PoolCandidate, PoolResult } from '../discover/types.js';
import { UserError } from '../errors.js';
import { addTheme } from '../template/ops.js';
import { findByPath } from '../template/paths.js';
import { byNovelty, clusterNearness } from '../discover/nearest.js';
import { clusterKey, clusterLabel } from '../discover/key.js';
import type { ThemeScores } from '../suggest/types.js';
import { dismissals, latestClusters, openCluster, passageFacts, storeDiscoveryRun, storePromotion, type ClusterDetail, type NewCluster, type StoredCluster } from '../study/clusters.js';
import type { DB } from '../study/db.js';
import { nothingToCode } from '../study/decisions.js';
import { getPassage } from '../study/passages.js';
import type { Study } from '../study/study.js';
import { currentRevision, currentTemplate, themePaths } from '../study/template.js';
import { reviseTemplate } from './revise.js';
import { fitModel } from './suggest.js';

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
  scores: ThemeScores;
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
  const stored = passageFacts(db);
  const passages: PoolCandidate[] = inputs.passages.map((p) => {
    const row = stored.get(p.id);
    return { id: p.id, transcript: p.transcript, speaker: row?.speaker ?? null, role: p.role, terms: p.terms, words: row?.words };
  });
  // Compact scores, not predict()'s candidates: one object per passage and theme is 7 million
  // objects (1.5 GB) at 20,000 passages and 367 themes.
  const scores = model.scores(inputs.uncoded, { progress: progress && ((d) => progress('score', d)) });
  const thresholds = Object.fromEntries(model.themeReports().map((r) => [r.themeId, r.threshold]));
  const pool = unclaimedPool(
    { passages, scores, themes: inputs.themes.map((t) => ({ id: t.id, parentId: t.parentId })), codings: inputs.codings, rejected: negatives, nothingToCode: nothingToCode(db), thresholds },
    poolOpts,
  );
  const codedPassages = new Set(inputs.codings.map((c) => c.passageId));
  return { passages, scores, pool, fingerprint: model.fingerprint, codedPassages, background: inputs.passages.map((p) => p.terms), keep };
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
    const keys = new Set<string>();
    const paths = themePaths(db);
    const near = {
      scores: new Map(scored.scores.passages.map((s) => [s.passageId, s])),
      themes: scored.scores,
      noneFits: new Map(scored.pool.pool.map((p) => [p.id, p.noneFits])),
    };
    const made = byNovelty(result.clusters.map((c) => ({ c, ...clusterNearness(c.passageIds, near), size: c.size }))).map(({ c, themeId, closeness, topShare, novelty }): NewCluster => {
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
      return { label: c.id, size: c.size, cohesion: c.cohesion, detail, key, passageIds: c.passageIds, similarity: new Map(c.central.map((x) => [x.passageId, x.similarity])) };
    });
    const { runId, rowIds } = storeDiscoveryRun(
      db,
      { rev: rev.rev, fingerprint: scored.fingerprint, pool: scored.pool.pool.length, k: result.k, silhouettes: result.silhouette, options: opts },
      made,
    );
    const clusters = made.map(
      (c, i): StoredCluster => ({ row_id: rowIds[i]!, cluster_id: c.key, label: clusterLabel(c.detail.terms.map((t) => t.term)), size: c.size, cohesion: c.cohesion, status: 'open', passage_ids: [...c.passageIds].sort(), detail: c.detail }),
    );
    scored.keep();
    progress?.('cluster', 1);
    return { runId, result, pool: scored.pool, clusters, noneFitsAt };
  })();
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
export function promoteCluster(study: Study, ref: string, target: PromoteTarget, coder: string, note?: string): Promotion {
  const { db } = study;
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
          study,
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
      const { decisionId, runId } = storePromotion(db, c, themeId, rev, into, coder, note ?? null);
      const path = themePaths(db).get(themeId)!;
      return { cluster_id: c.cluster_id, themeId, path, into_existing: into, rev, decisionId, runId, suggestions: c.passage_ids.length };
    })
    .immediate();
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
    scores: scored.scores,
    unclaimed: scored.pool.pool.map((p) => p.id),
    clusters: clusters.map((c) => ({ id: c.cluster_id, passageIds: c.passage_ids })),
  });
  if (transcripts?.length) rows = rows.filter((r) => transcripts.includes(r.transcript));
  if (!db.readonly) db.transaction(scored.keep)();
  return { rows, clusters };
}
