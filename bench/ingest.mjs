// bench:ingest — imports the Brown Corpus (500 samples, about 1.16 million words) into a fresh
// study through the CLI, end to end (reading, analysis in worker threads, storage), and prints
// words per second and peak memory. A benchmark, not a test: the machine is shared and noisy.
import { readFileSync, rmSync } from 'node:fs';
import { join } from 'node:path';
import { main } from '../dist/cli/main.js';
import { analyseMany } from '../dist/text/pool.js';
import { brownCategories, brownTokenCount, writeBrownTexts } from './brown.mjs';

const out = join(import.meta.dirname, 'out');
const files = writeBrownTexts(join(out, 'brown-txt'));
const tokens = [...brownCategories().keys()].reduce((n, f) => n + brownTokenCount(f), 0);
const study = join(out, 'ingest-study');

async function quiet(argv) {
  const write = process.stdout.write.bind(process.stdout);
  let captured = '';
  process.stdout.write = (chunk) => ((captured += chunk), true);
  try {
    const code = await main(['node', 'trellis', ...argv]);
    if (code !== 0) throw new Error(`trellis ${argv[0]} exited ${code}`);
  } finally {
    process.stdout.write = write;
  }
  return captured;
}

const runs = Number(process.env.RUNS ?? 3);
const times = [];
let report;
for (let r = 0; r < runs; r++) {
  rmSync(study, { recursive: true, force: true });
  await quiet(['init', study]);
  const t0 = performance.now();
  report = JSON.parse(await quiet(['add', '--study', study, '--json', ...files]));
  times.push((performance.now() - t0) / 1000);
}
const best = Math.min(...times);
const median = times.slice().sort((a, b) => a - b)[Math.floor(times.length / 2)];
const passages = report.added.reduce((n, a) => n + a.passages, 0);
// The ceiling for the same files in the same run: the language pipeline alone in the same worker
// threads (each starting cold and loading the model, as in \`add\`), with no reading of formats,
// segmenting or storage. \`add\` cannot be faster than this on this machine.
const texts = files.map((f) => readFileSync(f, 'utf8'));
const ceiling = [];
for (let r = 0; r < runs; r++) {
  const t0 = performance.now();
  await analyseMany(texts, () => {});
  ceiling.push((performance.now() - t0) / 1000);
}
const bestCeiling = Math.min(...ceiling);
const rss = process.resourceUsage().maxRSS / 1024;
console.log(`bench:ingest  Brown Corpus: ${files.length} files, ${tokens.toLocaleString('en')} corpus tokens, ${report.words.toLocaleString('en')} word tokens stored, ${passages.toLocaleString('en')} passages`);
console.log(`  runs: ${times.map((t) => t.toFixed(2) + ' s').join(', ')}`);
console.log(`  best ${best.toFixed(2)} s: ${Math.round(tokens / best).toLocaleString('en')} corpus words/s (median ${Math.round(tokens / median).toLocaleString('en')}/s); target >= 500,000/s`);
console.log(`  the language pipeline alone on the same files, same workers: ${ceiling.map((t) => t.toFixed(2) + ' s').join(', ')}; best ${Math.round(tokens / bestCeiling).toLocaleString('en')} corpus words/s (add takes ${(best / bestCeiling).toFixed(2)}x it)`);
console.log(`  peak memory (max RSS, main and worker threads): ${rss.toFixed(0)} MiB`);
