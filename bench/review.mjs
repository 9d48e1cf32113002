// bench:review — does deciding teach the model? Replays the Brown protocol of bench:quality with
// a simulated reviewer: 10 uncoded transcripts a round, `trellis suggest` for them, then for each
// passage the best leaf suggestion is accepted when it matches the corpus label and re-coded to
// the label otherwise (`trellis decide`); the next round's suggestions learn from those
// decisions. Prints the acceptance rate per round and overall. A benchmark, not a test.
//
// Rounds differ in which categories they hold, so a round's rate also depends on how hard its
// transcripts are. The control arm removes that: before any decision, the initial model suggests
// for every uncoded transcript once, and each round is also scored with those suggestions. The
// difference between the two arms on the same passages is what the decisions taught.
import { parse } from 'csv-parse/sync';
import { stringify } from 'csv-stringify/sync';
import { mkdirSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { main } from '../dist/cli/main.js';
import { brownCategories, brownTemplate, leafPath, rng, seededBatch, wordCount, writeBrownTexts } from './brown.mjs';

const SEED = Number(process.env.SEED ?? 1);
const PER_ROUND = 10;
const ROUNDS = Number(process.env.ROUNDS ?? Infinity);
const out = join(import.meta.dirname, 'out', 'review');
rmSync(out, { recursive: true, force: true });
mkdirSync(out, { recursive: true });
const study = join(out, 'study');

/** Runs a trellis command in this process and returns its stdout. */
async function trellis(...args) {
  const write = process.stdout.write.bind(process.stdout);
  let captured = '';
  process.stdout.write = (chunk) => ((captured += chunk), true);
  try {
    const code = await main(['node', 'trellis', ...args]);
    if (code !== 0) throw new Error(`trellis ${args.slice(0, 3).join(' ')} exited ${code}`);
  } finally {
    process.stdout.write = write;
  }
  return captured;
}

const files = writeBrownTexts(join(import.meta.dirname, 'out', 'brown-txt'));
const cats = brownCategories();
const batch = seededBatch(0.25, SEED);
await trellis('init', study, '--window', '100000');
writeFileSync(join(out, 'template.txt'), brownTemplate());
await trellis('template', 'set', '--study', study, join(out, 'template.txt'));
await trellis('add', '--study', study, ...files);
await trellis('sheet', 'export', '--study', study, '--out', join(out, 'sheet.csv'), '--force');
const rows = parse(readFileSync(join(out, 'sheet.csv'), 'utf8'), { bom: true, columns: true });
const isPassage = new Set(rows.filter((r) => wordCount(r.text) >= 20).map((r) => r.passage_id));
for (const r of rows) r.themes = batch.has(r.transcript) && isPassage.has(r.passage_id) ? leafPath(cats.get(r.transcript)) : '';
writeFileSync(join(out, 'coded.csv'), '\ufeff' + stringify(rows, { header: true }));
await trellis('sheet', 'import', '--study', study, join(out, 'coded.csv'), '--coder', 'bench');

// The uncoded transcripts in a seeded order, so rounds mix the categories.
const next = rng(SEED + 1);
const queue = [...cats.keys()].filter((f) => !batch.has(f)).sort();
for (let i = queue.length - 1; i > 0; i--) {
  const j = Math.floor(next() * (i + 1));
  [queue[i], queue[j]] = [queue[j], queue[i]];
}

// Control arm: the initial model's best leaf for every uncoded passage, before any decision.
const initial = new Map();
for (const p of JSON.parse(await trellis('suggest', '--study', study, '--json', '--top', '20')).passages) {
  const best = p.candidates.find((c) => c.theme.includes(' > '));
  if (best) initial.set(p.passage_id, best.theme);
}

const perRound = [];
let accepted = 0;
let decided = 0;
const t0 = performance.now();
for (let round = 0; round * PER_ROUND < queue.length && round < ROUNDS; round++) {
  const names = queue.slice(round * PER_ROUND, (round + 1) * PER_ROUND);
  const sug = JSON.parse(await trellis('suggest', '--study', study, '--json', '--top', '20', ...names.flatMap((n) => ['--transcript', n])));
  let a = 0;
  let n = 0;
  let control = 0;
  for (const p of sug.passages) {
    if (!isPassage.has(p.passage_id)) continue;
    const best = p.candidates.find((c) => c.theme.includes(' > '));
    if (!best) continue;
    const label = leafPath(cats.get(p.transcript));
    const args = ['decide', '--study', study, String(best.suggestion_id), 'accept', '--coder', 'reviewer'];
    if (best.theme !== label) args.push('--theme', label);
    await trellis(...args);
    n++;
    if (best.theme === label) a++;
    if (initial.get(p.passage_id) === label) control++;
  }
  perRound.push({ round: round + 1, transcripts: names.length, decided: n, accepted: a, rate: n ? a / n : 0, control: n ? control / n : 0 });
  accepted += a;
  decided += n;
  const r = perRound.at(-1);
  const gain = 100 * (r.rate - r.control);
  console.log(`round ${String(r.round).padStart(2)}: ${r.accepted}/${r.decided} accepted (${(100 * r.rate).toFixed(1)}%); initial model on the same passages ${(100 * r.control).toFixed(1)}% (${gain >= 0 ? '+' : ''}${gain.toFixed(1)} points from the decisions so far)`);
}
const first = perRound[0];
const last = perRound.at(-1);
console.log(`\noverall: ${accepted}/${decided} accepted (${((100 * accepted) / decided).toFixed(1)}%) over ${perRound.length} rounds in ${((performance.now() - t0) / 1000).toFixed(0)} s`);
console.log(`first round ${(100 * first.rate).toFixed(1)}%, last round ${(100 * last.rate).toFixed(1)}%: ${(100 * (last.rate - first.rate)).toFixed(1)} points (target >= +5)`);
const firstFive = perRound.slice(0, 5);
const lastFive = perRound.slice(-5);
const mean = (rs) => rs.reduce((s, r) => s + r.accepted, 0) / rs.reduce((s, r) => s + r.decided, 0);
const meanControl = (rs) => rs.reduce((s, r) => s + r.control * r.decided, 0) / rs.reduce((s, r) => s + r.decided, 0);
console.log(`first five rounds ${(100 * mean(firstFive)).toFixed(1)}%, last five ${(100 * mean(lastFive)).toFixed(1)}% (less noisy)`);
console.log(
  `learning, net of round composition (each arm on the same passages): first round ${(100 * (first.rate - first.control)).toFixed(1)} points, ` +
    `last round ${(100 * (last.rate - last.control)).toFixed(1)} points; last five rounds ${(100 * (mean(lastFive) - meanControl(lastFive))).toFixed(1)} points ` +
    `(${(100 * mean(lastFive)).toFixed(1)}% with the decisions against ${(100 * meanControl(lastFive)).toFixed(1)}% without)`,
);
const later = perRound.slice(1);
console.log(`rounds 2-${perRound.length}: ${(100 * mean(later)).toFixed(1)}% accepted with the decisions, ${(100 * meanControl(later)).toFixed(1)}% without: ${(100 * (mean(later) - meanControl(later))).toFixed(1)} points`);
