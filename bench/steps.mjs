// Where the time of `suggest` and `discover` goes, on a copy of a study (bench:scale runs it after
// the real steps): suggest with a fresh fit (the stored model states are removed from the copy),
// split into fitting, scoring and storing; then discover from the state that fit stored, split
// into loading the model and scoring the study with it, sorting out the unclaimed pool, and
// clustering (the k sweep, the final k-means and the clusters' descriptions). The splits come from
// the commands' own progress callbacks, so they time the same code the commands run.
//
//   node bench/steps.mjs STUDY     (prints one line of JSON; STUDY is copied, never changed)
import Database from 'better-sqlite3';
import { cpSync, mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { runDiscovery } from '../dist/jobs/discovery.js';
import { suggest } from '../dist/jobs/suggest.js';
import { openStudy } from '../dist/study/study.js';

const source = process.argv[2];
if (!source) throw new Error('usage: node bench/steps.mjs STUDY');
const dir = mkdtempSync(join(tmpdir(), 'trellis-steps-'));
try {
  cpSync(source, dir, { recursive: true });
  const raw = new Database(join(dir, 'study.db'));
  raw.prepare('DELETE FROM model_states').run();
  raw.close();

  /** Seconds from the start to the first report of each step, and to the end. */
  const timed = (work) => {
    const first = {};
    const t0 = performance.now();
    work((step) => (first[step] ??= (performance.now() - t0) / 1000));
    return { first, total: (performance.now() - t0) / 1000 };
  };
  const study = openStudy(dir);
  const s = timed((mark) => suggest(study.db, { top: 10, progress: (step) => mark(step) }));
  const d = timed((mark) => runDiscovery(study.db, {}, (step) => mark(step)));
  study.close();
  const span = (from, to) => Math.max(0, (to ?? 0) - (from ?? 0));
  console.log(
    JSON.stringify({
      suggest: { fit: s.first.score ?? s.total, score: span(s.first.score, s.first.store ?? s.total), store: span(s.first.store, s.total), total: s.total },
      // discover reports 'fit' once the stored model is loaded and has scored every passage, then
      // 'score' (ranking each passage's themes and sorting out the pool), then 'cluster'.
      discover: { model: d.first.score ?? d.total, pool: span(d.first.score, d.first.cluster ?? d.total), cluster: span(d.first.cluster, d.total), total: d.total },
    }),
  );
} finally {
  rmSync(dir, { recursive: true, force: true });
}
