// lab:fewshot — the few-example scorer on the studies bench:fewshot built, in-process, scored as
// ../shared/bench/fewshot.py scores them (same passage mapping, same measures), so variants can
// be compared in seconds. Run `npm run bench:fewshot` once first (it leaves the studies in
// bench/out/fewshot/work/), then:
//
//   node bench/lab-fewshot.mjs [--runs interviews-1,survey-1] [--variants default,no-context]
//
// The figures are trellis' scorer alone; bench:fewshot measures the whole command.
import { readFileSync, readdirSync, existsSync } from 'node:fs';
import { join } from 'node:path';
import { parse } from 'csv-parse/sync';
import { openStudy } from '../dist/study/study.js';
import { modelInputs } from '../dist/jobs/model-inputs.js';
import { fitFewshot } from '../dist/suggest/fewshot.js';
import { ThemeSuggester } from '../dist/suggest/index.js';

const OUT = join(import.meta.dirname, 'out', 'fewshot');
const args = process.argv.slice(2);
const opt = (n, d) => (args.includes(n) ? args[args.indexOf(n) + 1] : d);
const runs = opt('--runs', readdirSync(join(OUT, 'work')).sort().join(',')).split(',');

export const VARIANTS = {
  default: {},
  'no-context': { decay: 0 },
  'decay-0.8': { decay: 0.8 },
  'reach-6': { decay: 0.8, reach: 6 },
  'ridge-10': { ridge: 10 },
  'ridge-30': { ridge: 30 },
  'em-0.1': { em: 0.1 },
  'em-0.3': { em: 0.3 },
  'em-1': { em: 1 },
  'em-2': { em: 2 },
  'combo': { em: 2, emRounds: 2, alpha: 0.1 },
  'combo-mu8': { em: 2, emRounds: 2, alpha: 0.1, mu: 8 },
  'combo1': { em: 2, alpha: 0.1 },
  'combo-r30': { em: 2, emRounds: 2, alpha: 0.1, mu: 8, ridge: 30 },
  'combo-r100': { em: 2, emRounds: 2, alpha: 0.1, mu: 8, ridge: 100 },
  'combo-em1': { em: 1, emRounds: 2, alpha: 0.1, mu: 8 },
  'em-2x2': { em: 2, emRounds: 2 },
  'alpha-0.1': { alpha: 0.1 },
  'reach-2': { reach: 2 },
  'decay-0.4': { decay: 0.4 },
  'em-self-in': { emLeaveOut: false },
  'em-1-heldout': { em: 1, threshold: 'heldout' },
  'em-0.3x2': { em: 0.3, emRounds: 2 },
  'ridge-100': { ridge: 100 },
  'mu-0.5': { mu: 0.5 },
  'mu-8': { mu: 8 },
  'alpha-1': { alpha: 1 },
  'no-mnb': { drop: ['mnb_z', 'ctx_mnb'] },
  'no-cnb': { drop: ['cnb_z', 'ctx_cnb'] },
  'no-knn': { drop: ['knn', 'ctx_knn'] },
  'no-seed': { drop: ['seed', 'ctx_seed', 'seed_uncoded', 'ctx_seed_uncoded'] },
  'no-rank': { drop: ['first', 'log_rank'] },
  'no-transcript': { drop: ['tr_mnb', 'tr_cnb', 'tr_knn'] },
  'no-seed-model': { drop: ['seed_only_model'] },
  'no-seed-z': { drop: ['seed_z', 'ctx_seed_z'] },
};
const variants = opt('--variants', 'default').split(',');

const norm = (s) => s.split(/\s+/).filter(Boolean).join(' ');
const under = (t, root) => t === root || t.startsWith(root + ' > ');

function load(run) {
  const [kind, seed] = run.split('-');
  const src = join(OUT, run);
  const work = join(OUT, 'work', run);
  const rows = readFileSync(join(src, 'truth.jsonl'), 'utf8').trim().split('\n').map((l) => JSON.parse(l));
  const byT = new Map();
  for (const r of rows) (byT.get(r.transcript) ?? byT.set(r.transcript, []).get(r.transcript)).push(r);
  const sheet = parse(readFileSync(join(work, 'sheet.csv'), 'utf8'), { columns: true, bom: true });
  const passages = new Map();
  for (const s of sheet) {
    let t = s.transcript.replace(/\.[^.]*$/, '').split('/').pop();
    if (!byT.has(t) && t.startsWith('survey-')) t = t.slice(7);
    const text = norm(s.text);
    const hit = (byT.get(t) ?? []).find((r) => text && norm(r.text).includes(text));
    if (hit) passages.set(s.passage_id, { split: hit.split, themes: hit.themes });
  }
  const coded = new Map();
  for (const p of passages.values()) if (p.split === 'train') for (const th of p.themes) coded.set(th, (coded.get(th) ?? 0) + 1);
  const { db } = openStudy(join(work, 'study'), { readonly: true });
  const inputs = modelInputs(db);
  db.close();
  return { kind, seed, passages, coded, inputs };
}

export function score(items, truthOf, coded) {
  let n = 0, t1 = 0, t3 = 0, lrap = 0, above = 0, ok = 0, gold = 0;
  const pairs = [];
  const per = new Map();
  const bins = new Map();
  const bump = (th, i) => {
    const v = per.get(th) ?? [0, 0, 0];
    v[i]++;
    per.set(th, v);
  };
  for (const [pid, cands] of items) {
    const T = truthOf.get(pid);
    const names = [...new Set(cands.map((c) => c.theme))];
    n++;
    t1 += names.length && T.has(names[0]) ? 1 : 0;
    t3 += names.slice(0, 3).some((x) => T.has(x)) ? 1 : 0;
    const ranks = [...T].filter((t) => names.slice(0, 10).includes(t)).map((t) => names.indexOf(t) + 1).sort((a, b) => a - b);
    lrap += ranks.reduce((a, r, i) => a + (i + 1) / r, 0) / T.size;
    const A = new Set(cands.filter((c) => c.above).map((c) => c.theme));
    above += A.size;
    for (const a of A) if (T.has(a)) ok++;
    gold += T.size;
    for (const a of A) bump(a, T.has(a) ? 0 : 1);
    for (const t of T) if (!A.has(t)) bump(t, 2);
    for (const t of T) {
      const k = coded.get(t) ?? 0;
      const b = k === 0 ? '0' : k <= 2 ? '1-2' : k <= 5 ? '3-5' : k <= 10 ? '6-10' : '11+';
      const v = bins.get(b) ?? [0, 0];
      v[0]++;
      v[1] += names.slice(0, 3).includes(t) ? 1 : 0;
      bins.set(b, v);
    }
    for (const c of cands) pairs.push([c.confidence, T.has(c.theme)]);
  }
  const test = new Set([...truthOf.values()].flatMap((s) => [...s]));
  const f1 = [...test].map((th) => {
    const [tp, fp, fn] = per.get(th) ?? [0, 0, 1];
    return tp ? (2 * tp) / (2 * tp + fp + fn) : 0;
  });
  let ece = 0;
  for (let b = 0; b < 10; b++) {
    const g = pairs.filter(([c]) => Math.min(Math.floor(c * 10), 9) === b);
    if (g.length) ece += (g.length / pairs.length) * Math.abs(g.reduce((a, [c]) => a + c, 0) / g.length - g.filter(([, y]) => y).length / g.length);
  }
  return {
    top1: t1 / n, top3: t3 / n, lrap: lrap / n, macro_f1: f1.reduce((a, b) => a + b, 0) / f1.length,
    precision: above ? ok / above : 0, recall: ok / gold, above: above / n, ece,
    by: Object.fromEntries([...bins].sort().map(([b, [c, h]]) => [b, (h / c).toFixed(2)])),
  };
}

const f = (x) => x.toFixed(3);
for (const run of runs) {
  if (!existsSync(join(OUT, 'work', run, 'study'))) continue;
  const d = load(run);
  const { passages: ps, codings, themes } = d.inputs;
  const pathOf = themes.map((t) => t.path);
  const truthOf = new Map();
  for (const [pid, p] of d.passages) if (p.split === 'test' && p.themes.length) truthOf.set(pid, new Set(p.themes));
  const index = new Map(ps.map((p, i) => [p.id, i]));
  for (const v of variants) {
    if (v === 'suggester') {
      // The whole suggester, ranked as `suggest` ranks (chosen themes first, then by confidence).
      const t0 = performance.now();
      const m = new ThemeSuggester().fit(ps, codings, themes);
      const pred = m.predict([...truthOf.keys()], { reasons: 0 });
      const secs = (performance.now() - t0) / 1000;
      const items = pred.map((p) => {
        const ch = p.candidates.filter((c) => c.chosen);
        const ranked = [...ch, ...p.candidates.filter((c) => !c.chosen)].slice(0, 10);
        return [p.passageId, ranked.map((c) => ({ theme: pathOf[themes.findIndex((t) => t.id === c.themeId)], confidence: c.confidence, above: c.aboveThreshold }))];
      });
      const s = score(items, truthOf, d.coded);
      console.log(`${run.padEnd(13)} ${v.padEnd(12)} top1 ${f(s.top1)} top3 ${f(s.top3)} lrap ${f(s.lrap)} F1 ${f(s.macro_f1)} P ${s.precision.toFixed(2)} R ${s.recall.toFixed(2)} above ${s.above.toFixed(2)} ece ${f(s.ece)} ${secs.toFixed(1)}s`);
      continue;
    }
    const t0 = performance.now();
    const fit = fitFewshot(ps, codings, themes, VARIANTS[v]);
    const secs = (performance.now() - t0) / 1000;
    const nT = themes.length;
    const items = [];
    for (const pid of truthOf.keys()) {
      const p = index.get(pid);
      const order = [...Array(nT).keys()].sort((a, b) => fit.cells.conf[p * nT + b] - fit.cells.conf[p * nT + a] || a - b).slice(0, 10);
      const thr = process.env.THRESHOLD ? Math.max(Number(process.env.THRESHOLD), fit.state.threshold) : fit.state.threshold;
      items.push([pid, order.map((t) => ({ theme: pathOf[t], confidence: fit.cells.conf[p * nT + t], above: fit.cells.conf[p * nT + t] >= thr }))]);
    }
    const s = score(items, truthOf, d.coded);
    if (process.env.WEIGHTS) console.log(fit.state.calibration.features.map((n, q) => `${n} ${fit.state.calibration.weights[q].toFixed(2)}`).join(", "));
    console.log(
      `${run.padEnd(13)} ${v.padEnd(12)} top1 ${f(s.top1)} top3 ${f(s.top3)} lrap ${f(s.lrap)} F1 ${f(s.macro_f1)} P ${s.precision.toFixed(2)} R ${s.recall.toFixed(2)} above ${s.above.toFixed(2)} ece ${f(s.ece)} thr ${fit.state.threshold.toFixed(2)} ${secs.toFixed(1)}s ${JSON.stringify(s.by)}`,
    );
  }
}
