// bench:discover-brown — the earlier discovery benchmark, on the Brown Corpus (kept for the results
// of docs/discovery.md, section 5): the Brown protocol of
// bench:quality with one category left out of the template (and uncoded): how much of that
// category lands in the unclaimed pool, how much of everything else does, and how well the best
// cluster matches it; beside scikit-learn's KMeans on the same pool, in the same run.
// A benchmark, not a test: the machine is shared and noisy.
import { parse } from 'csv-parse/sync';
import { stringify } from 'csv-stringify/sync';
import { mkdirSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { brownCategories, brownTemplate, leafPath, LEAVES, seededBatch, wordCount, writeBrownTexts } from './brown.mjs';
import { peer, trellis } from './cli.mjs';
import { adjustedRandIndex } from '../dist/measure/partitions.js';

const SEED = Number(process.env.SEED ?? 1);
const LEFT_OUT = (process.env.LEFT_OUT ?? 'religion,science_fiction,humor').split(',');
const files = writeBrownTexts(join(import.meta.dirname, 'out', 'brown-txt'));
const cats = brownCategories();
const batch = seededBatch(0.25, SEED);

for (const left of LEFT_OUT) {
  const out = join(import.meta.dirname, 'out', `discover-${left}`);
  rmSync(out, { recursive: true, force: true });
  mkdirSync(out, { recursive: true });
  const study = join(out, 'study');
  trellis(['init', study, '--window', '100000']);
  writeFileSync(join(out, 'template.txt'), brownTemplate(LEAVES.filter((c) => c !== left)));
  trellis(['template', 'set', '--study', study, join(out, 'template.txt')]);
  trellis(['add', '--study', study, ...files]);
  trellis(['sheet', 'export', '--study', study, '--out', join(out, 'sheet.csv'), '--force']);
  const rows = parse(readFileSync(join(out, 'sheet.csv'), 'utf8'), { bom: true, columns: true });
  const isPassage = (r) => wordCount(r.text) >= 20;
  for (const r of rows) r.themes = batch.has(r.transcript) && isPassage(r) && cats.get(r.transcript) !== left ? leafPath(cats.get(r.transcript)) : '';
  writeFileSync(join(out, 'coded.csv'), '\ufeff' + stringify(rows, { header: true }));
  trellis(['sheet', 'import', '--study', study, join(out, 'coded.csv'), '--coder', 'bench']);

  const run = trellis(['discover', '--study', study, '--json'], { out: join(out, 'discover.json') });
  const found = JSON.parse(run.stdout);
  const pool = new Set(found.unclaimed);
  const test = rows.filter((r) => !batch.has(r.transcript) && isPassage(r));
  const target = test.filter((r) => cats.get(r.transcript) === left);
  const others = test.filter((r) => cats.get(r.transcript) !== left);
  const share = (rs) => rs.filter((r) => pool.has(r.passage_id)).length / rs.length;
  const targetIds = new Set(target.map((r) => r.passage_id));
  let best = { f1: 0, precision: 0, recall: 0, size: 0, terms: [] };
  for (const c of found.clusters) {
    const hit = c.passage_ids.filter((p) => targetIds.has(p)).length;
    const precision = hit / c.size;
    const recall = hit / target.length;
    const f1 = precision + recall ? (2 * precision * recall) / (precision + recall) : 0;
    if (f1 > best.f1) best = { f1, precision, recall, size: c.size, terms: c.terms.slice(0, 8) };
  }
  // Our partition of the pool against the corpus labels, and scikit-learn's KMeans on the same pool.
  const byId = new Map(rows.map((r) => [r.passage_id, r]));
  const clusterOf = new Map(found.clusters.flatMap((c) => c.passage_ids.map((p) => [p, c.cluster_id])));
  const poolRows = [...pool].map((id) => byId.get(id)).filter((r) => r && clusterOf.has(r.passage_id));
  const ours = adjustedRandIndex(poolRows.map((r) => cats.get(r.transcript)), poolRows.map((r) => clusterOf.get(r.passage_id)));
  const jsonl = join(out, 'pool.jsonl');
  writeFileSync(jsonl, poolRows.map((r) => JSON.stringify({ id: r.passage_id, text: r.text, split: 'test', label: cats.get(r.transcript) })).join('\n') + '\n');
  const p = peer('cluster', jsonl, String(found.k));
  console.log(`\nleft out: ${left} (${target.length} test passages; ${others.length} others)`);
  console.log(`  in the unclaimed pool: ${(100 * share(target)).toFixed(1)}% of ${left} (target >= 60%), ${(100 * share(others)).toFixed(1)}% of the rest (target <= 30%); pool ${pool.size} passages`);
  console.log(`  best-matching cluster: F1 ${best.f1.toFixed(3)} (target >= 0.5), precision ${best.precision.toFixed(3)}, recall ${best.recall.toFixed(3)}, size ${best.size}; terms: ${best.terms.join(', ')}`);
  console.log(`  mean silhouette by k: ${found.silhouette.map((x) => `${x.k}:${x.score.toFixed(4)}`).join(' ')}`);
  console.log(`  k = ${found.k}; ARI against the corpus labels: trellis ${ours.toFixed(3)}, scikit-learn KMeans ${p.ari.toFixed(3)} (NMI ${p.nmi.toFixed(3)})`);
  console.log(`  time: trellis discover ${run.seconds.toFixed(2)} s (fit, score, pool, k sweep, clusters); scikit-learn vectorise + KMeans at the same k ${p.seconds.toFixed(2)} s; peak memory ${run.maxRssMiB.toFixed(0)} MiB`);
}
