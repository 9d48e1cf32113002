// lab:suggest — measures theme suggestions on the Brown Corpus against scikit-learn peers.
//
// Each of the 500 samples is a transcript; each paragraph of at least 20 words a passage. The
// template has two levels: Informative and Imaginative, with the 15 Brown categories as leaves.
// A seeded 25% of each category's samples is the coded batch (every paragraph coded to its
// sample's leaf); the other passages are scored by their highest-ranked leaf theme.
//
//   node bench/lab-suggest.mjs                  the chosen model + the peers
//   VARIANTS=all node bench/lab-suggest.mjs     every variant in VARIANTS below (no peers)
//   SEED=2 SKIP_PEER=1 ...                      another split / skip the Python peers
//   PROTOCOL=cli ...                            the passages of bench:quality (see below)
//   PROTOCOL=cli REVIEW=1 [ROUNDS=n] ...        bench:review's simulated reviewer, in-process
//
// PROTOCOL=cli reproduces bench:quality in-process: a study made by the CLI (every paragraph a
// passage, short ones included and left uncoded in coded samples), its modelInputs, the same
// codings and the same scoring, so the lab's figures are the benchmark's without the subprocess.
//
// Needs the build (npx tsc -p tsconfig.json). Analysed passages are cached in bench/out/.
import { execFileSync } from 'node:child_process';
import { existsSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { ThemeSuggester } from '../dist/suggest/index.js';
import { brownCategories, brownTemplate, LEAVES, rng, seededBatch, wordCount, writeBrownTexts } from './brown.mjs';
import { PEER_SCRIPT } from './cli.mjs';
import { labPassages, labSplit, labThemes } from './lab-brown.mjs';

const OUT = join(import.meta.dirname, 'out');
const SEED = Number(process.env.SEED ?? 1);


/** Every variant tried; the first is the default model (the layered scorer's variants went with it). */
const VARIANTS = {
  default: {},
  bigrams: { bigrams: true },
  'prior 100': { priorStrength: 100 },
  'prior 2000': { priorStrength: 2000 },
  'no Rocchio': { rocchio: 0 },
  'Rocchio 0.5': { rocchio: 0.5 },
  'Rocchio 1': { rocchio: 1 },
};


function measure(preds, truth, leafOf = (id) => (LEAVES.includes(id) ? id : null)) {
  let top1 = 0;
  let top3 = 0;
  const tp = Object.fromEntries(LEAVES.map((l) => [l, 0]));
  const fp = { ...tp };
  const fn = { ...tp };
  const bins = Array.from({ length: 10 }, () => ({ n: 0, conf: 0, acc: 0 }));
  preds.forEach((p, i) => {
    // Ranked as \`trellis suggest\` ranks them: the chosen themes first, then the rest by confidence.
    const ranked = [...p.candidates.filter((c) => c.chosen), ...p.candidates.filter((c) => !c.chosen)];
    const leaves = ranked.filter((c) => leafOf(c.themeId));
    const y = truth[i];
    const best = leaves[0];
    const ok = leafOf(best.themeId) === y;
    if (ok) top1++, tp[y]++;
    else fp[leafOf(best.themeId)]++, fn[y]++;
    if (leaves.slice(0, 3).some((c) => leafOf(c.themeId) === y)) top3++;
    const b = bins[Math.min(9, Math.floor(best.confidence * 10))];
    b.n++;
    b.conf += best.confidence;
    b.acc += ok ? 1 : 0;
  });
  const n = preds.length;
  const f1 = LEAVES.map((l) => (tp[l] ? (2 * tp[l]) / (2 * tp[l] + fp[l] + fn[l]) : 0));
  const ece = bins.reduce((s, b) => s + (b.n ? (b.n / n) * Math.abs(b.acc / b.n - b.conf / b.n) : 0), 0);
  const unclaimed = preds.filter((p) => p.unclaimed).length / n;
  if (process.env.BINS) console.log('    bins n:conf/acc ' + bins.map((b) => `${b.n}:${(b.conf / b.n).toFixed(2)}/${(b.acc / b.n).toFixed(2)}`).join(' '));
  return { top1: top1 / n, top3: top3 / n, macroF1: f1.reduce((a, b) => a + b, 0) / f1.length, ece, unclaimed };
}

function runOurs(name, opts, data) {
  const { passages, codings, themes, testIds, truth, negatives } = data;
  const leafOf = data.leafOf ?? ((id) => (LEAVES.includes(id) ? id : null));
  const t0 = performance.now();
  const model = new ThemeSuggester(opts).fit(passages, codings, themes, { negatives });
  const t1 = performance.now();
  const preds = model.predict(testIds);
  const t2 = performance.now();
  const m = measure(preds, truth, leafOf);
  // The same measures on the coded batch's own LOTO confidences: what calibration was fitted on.
  const coded = [...new Map(codings.map((c) => [c.passageId, c.themeId]))];
  const loto = measure(model.predict(coded.map(([id]) => id), { reasons: 0 }), coded.map(([, t]) => leafOf(t)), leafOf);
  m.lotoEce = loto.ece;
  m.lotoTop1 = loto.top1;
  const ctx = model.state.context;
  const weights = Object.fromEntries(ctx.inputs.map((n, j) => [n, +ctx.weights[j].toFixed(3)]));
  const base = Object.fromEntries(model.state.base.inputs.map((n, j) => [n, +model.state.base.weights[j].toFixed(3)]));
  return { name, ...m, fitSeconds: (t1 - t0) / 1000, predictSeconds: (t2 - t1) / 1000, decay: ctx.decay, base, weights, fingerprint: model.fingerprint };
}

/** The paragraph protocol: only paragraphs of at least 20 words, every one coded in the batch. */
function paragraphData(all, seed) {
  const train = labSplit(seed);
  const passages = all.map((p) => ({ id: p.id, transcript: p.transcript, ordinal: p.ordinal, role: 'participant', terms: p.terms }));
  const codings = all.filter((p) => train.has(p.transcript)).map((p) => ({ passageId: p.id, themeId: p.label }));
  const test = all.filter((p) => !train.has(p.transcript));
  return { passages, codings, themes: labThemes(), testIds: test.map((p) => p.id), truth: test.map((p) => p.label), train, all };
}

/** The study bench:quality builds, made once by the CLI in bench/out/lab-study. */
async function cliStudy() {
  const { main } = await import('../dist/cli/main.js');
  const { openStudy } = await import('../dist/study/study.js');
  const { modelInputs } = await import('../dist/jobs/model-inputs.js');
  const dir = join(OUT, 'lab-study');
  if (!existsSync(join(dir, 'study.db'))) {
    const run = async (...args) => {
      const write = process.stdout.write.bind(process.stdout);
      process.stdout.write = () => true;
      try {
        if ((await main(['node', 'trellis', ...args])) !== 0) throw new Error(`trellis ${args[0]} failed`);
      } finally {
        process.stdout.write = write;
      }
    };
    const files = writeBrownTexts(join(OUT, 'brown-txt'));
    await run('init', dir, '--window', '100000');
    writeFileSync(join(OUT, 'lab-template.txt'), brownTemplate());
    await run('template', 'set', '--study', dir, join(OUT, 'lab-template.txt'));
    await run('add', '--study', dir, ...files);
  }
  const { db } = openStudy(dir);
  const inputs = modelInputs(db);
  const words = new Map(db.prepare('SELECT id, text FROM passages').all().map((r) => [r.id, r.text]));
  db.close();
  return { inputs, words };
}

function cliData({ inputs, words }, seed) {
  const cats = brownCategories();
  const batch = seededBatch(0.25, seed);
  const leafId = new Map(inputs.themes.filter((t) => t.parentId !== null).map((t) => [t.name, t.id]));
  const leafName = new Map([...leafId].map(([n, id]) => [id, n]));
  const isPassage = (p) => wordCount(words.get(p.id)) >= 20;
  const codings = inputs.passages.filter((p) => batch.has(p.transcript) && isPassage(p)).map((p) => ({ passageId: p.id, themeId: leafId.get(cats.get(p.transcript)) }));
  const test = inputs.passages.filter((p) => !batch.has(p.transcript) && isPassage(p));
  return {
    passages: inputs.passages,
    codings,
    themes: inputs.themes,
    testIds: test.map((p) => p.id),
    truth: test.map((p) => cats.get(p.transcript)),
    leafOf: (id) => leafName.get(id) ?? null,
    train: batch,
  };
}

/**
 * bench:review in-process: 10 uncoded transcripts a round, in the same seeded order; the best
 * leaf (ranked as \`suggest\` ranks) is accepted when it is the label, else re-coded to the label,
 * which also counts as a rejection of the suggested theme; the next round refits on all of it.
 */
function review(name, opts, data, seed) {
  const { passages, themes, leafOf, train } = data;
  const cats = brownCategories();
  const leafId = new Map(themes.filter((t) => t.parentId !== null).map((t) => [t.name, t.id]));
  const isTest = new Set(data.testIds);
  const next = rng(seed + 1);
  const queue = [...cats.keys()].filter((f) => !train.has(f)).sort();
  for (let i = queue.length - 1; i > 0; i--) {
    const j = Math.floor(next() * (i + 1));
    [queue[i], queue[j]] = [queue[j], queue[i]];
  }
  const codings = data.codings.slice();
  const negatives = [];
  const rates = [];
  const rounds = Math.min(Number(process.env.ROUNDS ?? Infinity), Math.ceil(queue.length / 10));
  for (let round = 0; round < rounds; round++) {
    const names = new Set(queue.slice(round * 10, (round + 1) * 10));
    const model = new ThemeSuggester(opts).fit(passages, codings, themes, { negatives });
    const ids = passages.filter((p) => names.has(p.transcript) && isTest.has(p.id)).map((p) => p.id);
    let a = 0;
    for (const p of model.predict(ids, { reasons: 0 })) {
      const ranked = [...p.candidates.filter((c) => c.chosen), ...p.candidates.filter((c) => !c.chosen)];
      const best = ranked.find((c) => leafOf(c.themeId));
      const label = leafId.get(cats.get(p.transcript));
      codings.push({ passageId: p.passageId, themeId: label });
      if (best.themeId === label) a++;
      else negatives.push({ passageId: p.passageId, themeId: best.themeId });
    }
    rates.push({ a, n: ids.length });
  }
  const pct = (r) => (100 * r.reduce((s, x) => s + x.a, 0)) / r.reduce((s, x) => s + x.n, 0);
  console.log(`  ${name.padEnd(28)} review seed ${seed}: rounds ${rates.map((r) => ((100 * r.a) / r.n).toFixed(0)).join(' ')}`);
  console.log(`  ${''.padEnd(28)} first ${pct(rates.slice(0, 1)).toFixed(1)}%, last ${pct(rates.slice(-1)).toFixed(1)}%, first five ${pct(rates.slice(0, 5)).toFixed(1)}%, last five ${pct(rates.slice(-5)).toFixed(1)}%, first ten ${pct(rates.slice(0, 10)).toFixed(1)}%, last ten ${pct(rates.slice(-10)).toFixed(1)}%, overall ${pct(rates).toFixed(1)}%`);
}

const PROTOCOL = process.env.PROTOCOL ?? 'paragraphs';
const SEEDS = (process.env.SEEDS ?? String(SEED)).split(',').map(Number);
// OPTIONS='{"decays":[0.6]}' adds a variant with those options (named "options").
if (process.env.OPTIONS) VARIANTS.options = JSON.parse(process.env.OPTIONS);
const names = process.env.VARIANTS === 'all' ? Object.keys(VARIANTS) : (process.env.VARIANTS ?? (process.env.OPTIONS ? 'options' : 'default')).split(',');
const fmt = (v) => (typeof v === 'number' ? v.toFixed(3) : String(v));
const all = PROTOCOL === 'paragraphs' ? await labPassages() : null;
const cli = PROTOCOL === 'cli' ? await cliStudy() : null;
const results = new Map();
let data = null;
for (const seed of SEEDS) {
  data = all ? paragraphData(all, seed) : cliData(cli, seed);
  console.log(`lab:suggest  ${PROTOCOL} protocol, seed ${seed}: ${data.train.size} coded samples (${data.codings.length} coded passages), ${data.testIds.length} test passages`);
  if (process.env.REVIEW && cli) {
    for (const name of names) review(name, VARIANTS[name], data, seed);
    continue;
  }
  for (const name of names) {
    const r = runOurs(name, VARIANTS[name], data);
    (results.get(name) ?? results.set(name, []).get(name)).push(r);
    console.log(
      `  ${name.padEnd(28)} top1 ${fmt(r.top1)}  top3 ${fmt(r.top3)}  macroF1 ${fmt(r.macroF1)}  ECE ${fmt(r.ece)} (LOTO ${fmt(r.lotoEce)}, top1 ${fmt(r.lotoTop1)})  unclaimed ${fmt(r.unclaimed)}  ` +
        `fit ${r.fitSeconds.toFixed(2)} s  predict ${r.predictSeconds.toFixed(2)} s  decay ${r.decay}  base ${JSON.stringify(r.base)}  context ${JSON.stringify(r.weights)}  fp ${r.fingerprint}`,
    );
  }
}
if (SEEDS.length > 1) {
  console.log(`means over seeds ${SEEDS.join(', ')}:`);
  const mean = (rs, k) => rs.reduce((s, r) => s + r[k], 0) / rs.length;
  for (const [name, rs] of results) {
    console.log(
      `  ${name.padEnd(28)} top1 ${fmt(mean(rs, 'top1'))}  top3 ${fmt(mean(rs, 'top3'))}  macroF1 ${fmt(mean(rs, 'macroF1'))}  ECE ${fmt(mean(rs, 'ece'))} (${rs.map((r) => r.ece.toFixed(3)).join(' / ')})  ` +
        `fit+predict ${(mean(rs, 'fitSeconds') + mean(rs, 'predictSeconds')).toFixed(2)} s`,
    );
  }
}
console.log(`  peak memory (max RSS): ${(process.resourceUsage().maxRSS / 1024).toFixed(0)} MiB`);
const { train } = data;

if (!process.env.SKIP_PEER && process.env.VARIANTS !== 'all' && PROTOCOL === 'paragraphs' && SEEDS.length === 1) {
  const file = join(OUT, `brown-split-${SEED}.jsonl`);
  writeFileSync(file, all.map((p) => JSON.stringify({ id: p.id, text: p.text, split: train.has(p.transcript) ? 'train' : 'test', label: p.label })).join('\n') + '\n');
  const peer = JSON.parse(execFileSync('/usr/bin/python3', [PEER_SCRIPT, 'classify', file], { encoding: 'utf8', maxBuffer: 1 << 26 }));
  console.log(`  peers (train ${peer.train}, test ${peer.test}; vectorize ${peer.vectorize_seconds.toFixed(2)} s):`);
  for (const [name, m] of Object.entries(peer.models)) {
    console.log(`    ${name.padEnd(22)} top1 ${fmt(m.top1)}  top3 ${m.top3 === null ? '-' : fmt(m.top3)}  macroF1 ${fmt(m.macro_f1)}  fit+predict ${m.seconds.toFixed(2)} s (with vectorize ${(m.seconds + peer.vectorize_seconds).toFixed(2)} s)`);
  }
  console.log(`    best                   top1 ${fmt(peer.best.top1)}  top3 ${fmt(peer.best.top3)}  macroF1 ${fmt(peer.best.macro_f1)}`);
}
