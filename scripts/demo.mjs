// npm run demo — builds the demo study from the invented hospital-handover corpus in a fresh
// folder (./demo-study), and walks through what trellis does with it.
import { existsSync, readdirSync, rmSync } from 'node:fs';
import { join, relative, resolve } from 'node:path';
import { main } from '../dist/cli/main.js';

const root = resolve(import.meta.dirname, '..');
const corpus = join(root, 'corpora', 'handover');
const study = join(root, 'demo-study');
const rel = (p) => relative(process.cwd(), p) || '.';

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

await trellis('init', rel(study));
await trellis('template', 'set', '--study', rel(study), rel(join(corpus, 'template.txt')), '--coder', 'priya', '--reason', 'starting template after coding t01-t04');
await trellis('add', '--study', rel(study), ...transcripts);
const sheet = join(corpus, 'initial-coding.csv');
if (existsSync(sheet)) await trellis('sheet', 'import', '--study', rel(study), rel(sheet), '--coder', 'priya');
await trellis('status', '--study', rel(study));
await trellis('template', 'show', '--study', rel(study));

console.log('\nNow trellis learns a profile for every theme from the coded batch, and suggests themes');
console.log('for a later interview, with confidence and reasons. Suggestions are aids: the researcher decides.');
await trellis('suggest', '--study', rel(study), '--transcript', 't09-harbour-junior-sister');
console.log(`\nThe demo study is in ${study}. Try: node bin/trellis status --study ${rel(study)}`);
