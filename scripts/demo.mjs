// npm run demo — builds the demo study from the invented hospital-handover corpus in a fresh
// folder (./demo-study), and walks through what trellis does with it.
import { existsSync, readdirSync, rmSync } from 'node:fs';
import { join, relative, resolve } from 'node:path';
import { main } from '../dist/cli/main.js';

const root = resolve(import.meta.dirname, '..');
const corpus = join(root, 'corpora', 'handover');
const study = join(root, 'demo-study');
const rel = (p) => relative(process.cwd(), p) || '.';

/** Runs a command without echoing it, and returns what it printed (for --json). */
async function quietly(...args) {
  const write = process.stdout.write.bind(process.stdout);
  let out = '';
  process.stdout.write = (chunk) => ((out += chunk), true);
  try {
    if ((await main(['node', 'trellis', ...args])) !== 0) throw new Error(`trellis ${args[0]} failed`);
  } finally {
    process.stdout.write = write;
  }
  return out;
}

async function trellis(...args) {
  console.log(`\n$ trellis ${args.map((a) => (/\s/.test(a) ? `"${a}"` : a)).join(' ')}`);
  const code = await main(['node', 'trellis', ...args]);
  if (code !== 0) {
    console.error(`demo: "trellis ${args[0]}" failed (exit ${code})`);
    process.exit(code);
  }
}

rmSync(study, { recursive: true, force: true });
console.log(`Building the demo study in ${study}`);
console.log('The corpus is invented: a fictional hospital, its staff and their new electronic handover system.');

const transcripts = readdirSync(corpus)
  .filter((f) => /^t\d\d-.*\.(txt|md|docx|vtt|srt)$/.test(f))
  .sort()
  .map((f) => rel(join(corpus, f)));

await trellis('init', rel(study), '--coder', 'priya');
await trellis('template', 'set', '--study', rel(study), rel(join(corpus, 'template.txt')), '--coder', 'priya', '--reason', 'starting template after coding t01-t04');
await trellis('add', '--study', rel(study), ...transcripts);
const sheet = join(corpus, 'initial-coding.csv');
if (existsSync(sheet)) await trellis('sheet', 'import', '--study', rel(study), rel(sheet), '--coder', 'priya');
await trellis('status', '--study', rel(study));
await trellis('template', 'show', '--study', rel(study));

console.log('\nNow trellis learns a profile for every theme from the coded batch, and suggests themes');
console.log('for a later interview, with confidence and reasons. Suggestions are aids: the researcher decides.');
await trellis('suggest', '--study', rel(study), '--transcript', 't09-harbour-junior-sister');
// A second, invented coder reviews two later interviews. Their judgement of each passage is
// shipped as a sheet; replaying it: the best suggestion is accepted when it names one of the
// coder's themes, re-coded to the coder's theme otherwise, and rejected when the coder saw no theme.
const key = join(corpus, 'review-key-t05-t06.csv');
if (existsSync(key)) {
  const { parse } = await import('csv-parse/sync');
  const { readFileSync } = await import('node:fs');
  const judged = new Map(parse(readFileSync(key, 'utf8'), { bom: true, columns: true }).filter((r) => r.role === 'participant').map((r) => [r.passage_id, r.themes.split(';').map((t) => t.trim()).filter(Boolean)]));
  const run = JSON.parse(await quietly('suggest', '--study', rel(study), '--json', '--top', '3', '--transcript', 't05-ward9-fy2', '--transcript', 't06-kestrel-night-nurse'));
  let n = 0;
  for (const p of run.passages) {
    const themes = judged.get(p.passage_id);
    // Unclaimed passages are left for discovery; the reviewer decides what trellis claimed:
    // each theme it chose is accepted if it is one of the coder's, rejected otherwise; when none
    // was right, the best is re-coded to the coder's theme.
    if (!themes || p.unclaimed) continue;
    const chosen = p.candidates.filter((c) => c.chosen);
    const right = chosen.filter((c) => themes.includes(c.theme));
    for (const c of chosen) {
      const args = ['decide', '--study', rel(study), String(c.suggestion_id)];
      if (right.includes(c)) args.push('accept');
      else if (!right.length && c === chosen[0] && themes.length) args.push('accept', '--theme', themes[0]);
      else args.push('reject', '--note', themes.length ? 'not this theme' : 'no theme of the template fits');
      await quietly(...args, '--coder', 'tom');
      n++;
    }
  }
  console.log(`\nReplayed ${n} review decisions by the invented coder "tom" on t05 and t06 (see corpora/handover/review-key-t05-t06.csv).`);
  await trellis('stats', '--study', rel(study));
}
const second = join(corpus, 'second-coding-t01-t02.csv');
if (existsSync(second)) {
  await trellis('sheet', 'import', '--study', rel(study), rel(second), '--coder', 'tom');
  await trellis('agree', '--study', rel(study), '--coders', 'priya,tom', '--transcript', 't01-larch-staff-nurse', '--transcript', 't02-kestrel-fy1');
}

console.log('\nWhat does the template miss? Clusters of the passages no theme claims, then the uncoded');
console.log('interviews, most novel first (the later interviews talk about informal paper workarounds).');
await trellis('discover', '--study', rel(study));
await trellis('triage', '--study', rel(study));

await trellis('report', '--study', rel(study), '--out', rel(join(study, 'report.html')), '--title', 'Vellmoor General: the e-handover study (invented demo)');
await trellis('codebook', '--study', rel(study), '--out', rel(join(study, 'codebook.md')));
console.log(`\nReport:   ${join(study, 'report.html')}`);
console.log(`Codebook: ${join(study, 'codebook.md')}`);

console.log(`\nThe demo study is in ${study}. Try: node bin/trellis status --study ${rel(study)}`);
