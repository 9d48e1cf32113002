// bench:quality — suggestion quality on the Brown Corpus, driven through the CLI as a user would,
// beside the scikit-learn peers on the same passages and split, in the same run.
//
// Protocol: each of the 500 samples is a transcript, each paragraph of at least 20 words a
// passage; the template is Informative and Imaginative with the 15 genre categories as leaves; a
// seeded 25% of each category's samples is the coded batch, coded through `sheet export` /
// `sheet import`; `trellis suggest --json --top 20` for the rest. Each test passage is scored by
// its highest-ranked leaf theme. A benchmark, not a test: the machine is shared and noisy.
import { parse } from 'csv-parse/sync';
import { stringify } from 'csv-stringify/sync';
import { mkdirSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { brownCategories, brownTemplate, leafPath, LEAVES, seededBatch, wordCount, writeBrownTexts } from './brown.mjs';
import { peer, trellis } from './cli.mjs';

const SEED = Number(process.env.SEED ?? 1);
// BATCH: the coded share of each category (the protocol's 0.25 unless set, to see how quality grows with it).
const out = join(import.meta.dirname, 'out', 'quality');
rmSync(out, { recursive: true, force: true });
mkdirSync(out, { recursive: true });
const study = join(out, 'study');
const files = writeBrownTexts(join(import.meta.dirname, 'out', 'brown-txt'));
const cats = brownCategories();
const batch = seededBatch(Number(process.env.BATCH ?? 0.25), SEED);

// A window larger than any paragraph: the protocol's passage is the whole paragraph.
trellis(['init', study, '--window', '100000']);
writeFileSync(join(out, 'template.txt'), brownTemplate());
trellis(['template', 'set', '--study', study, join(out, 'template.txt')]);
const add = trellis(['add', '--study', study, '--json', ...files]);
console.log(`imported ${files.length} samples in ${add.seconds.toFixed(1)} s`);

trellis(['sheet', 'export', '--study', study, '--out', join(out, 'sheet.csv'), '--force']);
const rows = parse(readFileSync(join(out, 'sheet.csv'), 'utf8'), { bom: true, columns: true });
const isPassage = (r) => wordCount(r.text) >= 20;
for (const r of rows) r.themes = batch.has(r.transcript) && isPassage(r) ? leafPath(cats.get(r.transcript)) : '';
writeFileSync(join(out, 'coded.csv'), '\ufeff' + stringify(rows, { header: true }));
trellis(['sheet', 'import', '--study', study, join(out, 'coded.csv'), '--coder', 'bench']);

const test = rows.filter((r) => !batch.has(r.transcript) && isPassage(r));
const train = rows.filter((r) => batch.has(r.transcript) && isPassage(r));
console.log(`coded batch: ${batch.size} samples, ${train.length} passages; test: ${500 - batch.size} samples, ${test.length} passages`);

const run = trellis(['suggest', '--study', study, '--json', '--top', '20'], { out: join(out, 'suggest.json') });
const suggested = new Map(JSON.parse(run.stdout).passages.map((p) => [p.passage_id, p.candidates]));

// Scores by the highest-ranked leaf.
const truth = (r) => cats.get(r.transcript);
const isLeaf = (theme) => theme.includes(' > ');
const leafOf = (theme) => theme.split(' > ')[1];
let top1 = 0;
let top3 = 0;
const tp = new Map(LEAVES.map((c) => [c, 0]));
const fp = new Map(LEAVES.map((c) => [c, 0]));
const fn = new Map(LEAVES.map((c) => [c, 0]));
const top1Conf = [];
const pairs = [];
for (const r of test) {
  const cands = suggested.get(r.passage_id) ?? [];
  const leaves = cands.filter((c) => isLeaf(c.theme));
  const best = leaves[0] ? leafOf(leaves[0].theme) : null;
  const y = truth(r);
  if (best === y) {
    top1++;
    tp.set(y, tp.get(y) + 1);
  } else {
    fn.set(y, fn.get(y) + 1);
    if (best) fp.set(best, fp.get(best) + 1);
  }
  if (leaves.slice(0, 3).some((c) => leafOf(c.theme) === y)) top3++;
  if (leaves[0]) top1Conf.push([leaves[0].confidence, best === y ? 1 : 0]);
  const yes = new Set([leafPath(y), leafPath(y).split(' > ')[0]]);
  for (const c of cands) pairs.push([c.confidence, yes.has(c.theme) ? 1 : 0]);
}
const f1 = LEAVES.map((c) => {
  const p = tp.get(c) + fp.get(c) ? tp.get(c) / (tp.get(c) + fp.get(c)) : 0;
  const q = tp.get(c) + fn.get(c) ? tp.get(c) / (tp.get(c) + fn.get(c)) : 0;
  return p + q ? (2 * p * q) / (p + q) : 0;
});
const ours = { top1: top1 / test.length, top3: top3 / test.length, macro_f1: f1.reduce((a, b) => a + b, 0) / f1.length };

/** Expected calibration error, 10 equal-width bins (Naeini, Cooper & Hauskrecht, 2015). */
function ece(items, bins = 10) {
  const sum = Array.from({ length: bins }, () => [0, 0, 0]);
  for (const [c, y] of items) {
    const b = Math.min(bins - 1, Math.floor(c * bins));
    sum[b][0] += c;
    sum[b][1] += y;
    sum[b][2]++;
  }
  return sum.reduce((e, [c, y, n]) => e + (n ? (n / items.length) * Math.abs(c / n - y / n) : 0), 0);
}

// The peers, on the same passages and split.
const jsonl = join(out, 'passages.jsonl');
writeFileSync(
  jsonl,
  [...train.map((r) => ({ r, split: 'train' })), ...test.map((r) => ({ r, split: 'test' }))]
    .map(({ r, split }) => JSON.stringify({ id: r.passage_id, text: r.text, split, label: truth(r) }))
    .join('\n') + '\n',
);
const p = peer('classify', jsonl);
const bestModel = Object.entries(p.models).sort((a, b) => b[1].top1 - a[1].top1)[0];
const peerTime = p.vectorize_seconds + bestModel[1].seconds;
const peerAll = p.vectorize_seconds + Object.values(p.models).reduce((s, m) => s + m.seconds, 0);

const f = (x) => (x === null || x === undefined ? '  -  ' : x.toFixed(3));
console.log('\nmodel                 top-1   top-3   macro-F1  seconds');
console.log(`trellis suggest       ${f(ours.top1)}   ${f(ours.top3)}   ${f(ours.macro_f1)}     ${run.seconds.toFixed(2)} (wall ${run.wall.toFixed(2)})`);
for (const [name, m] of Object.entries(p.models)) console.log(`${name.padEnd(22)}${f(m.top1)}   ${f(m.top3)}   ${f(m.macro_f1)}     ${m.seconds.toFixed(2)}`);
console.log(`best peer             ${f(p.best.top1)}   ${f(p.best.top3)}   ${f(p.best.macro_f1)}`);
console.log(`\nmargins over the best peer (target >= +0.03): top-1 ${(ours.top1 - p.best.top1).toFixed(3)}, top-3 ${(ours.top3 - p.best.top3).toFixed(3)}, macro-F1 ${(ours.macro_f1 - p.best.macro_f1).toFixed(3)}`);
console.log(`expected calibration error (target <= 0.05): top-1 leaf ${ece(top1Conf).toFixed(3)}; all ${pairs.length} candidate pairs ${ece(pairs).toFixed(3)}`);
console.log(`time: suggest ${run.seconds.toFixed(2)} s in-command (${run.wall.toFixed(2)} s wall with start-up) vs peer vectorise + fit + predict of its best model (${bestModel[0]}) ${peerTime.toFixed(2)} s: ratio ${(run.seconds / peerTime).toFixed(2)} (target <= 1.0); vs all five peer models ${peerAll.toFixed(2)} s: ratio ${(run.seconds / peerAll).toFixed(2)}`);
console.log(`peak memory of suggest: ${run.maxRssMiB.toFixed(0)} MiB (target < 1024)`);
