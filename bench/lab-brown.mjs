// What the in-process labs (lab-suggest, lab-discover) share: the Brown paragraphs analysed once
// and cached, their seeded coded batch, and the benchmark template as model themes.
import { existsSync, mkdirSync, readFileSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { analyseMany } from '../dist/text/pool.js';
import { contentLemmas } from '../dist/text/terms.js';
import { brownCategories, brownText, IMAGINATIVE, INFORMATIVE, LEAVES, rng } from './brown.mjs';

const OUT = join(import.meta.dirname, 'out');
const CACHE = join(OUT, 'brown-passages.json');

/** Every paragraph of at least 20 words, with its content lemmas (cached in bench/out/). */
export async function labPassages() {
  if (existsSync(CACHE)) return JSON.parse(readFileSync(CACHE, 'utf8'));
  mkdirSync(OUT, { recursive: true });
  const passages = [];
  for (const [file, cat] of brownCategories()) {
    let ord = 0;
    for (const para of brownText(file).split(/\n\n/)) {
      const text = para.trim();
      if (text.split(/\s+/).filter((w) => /[A-Za-z0-9]/.test(w)).length < 20) continue;
      passages.push({ id: `${file}#${++ord}`, transcript: file, ordinal: ord, label: cat, text });
    }
  }
  // wink-nlp leaves no lemma on the expansion of "cannot" before a comma, which makes analyse()
  // throw; "can not" is the same two stop words.
  await analyseMany(
    passages.map((p) => p.text.replace(/\bcannot\b/gi, 'can not')),
    (i, a) => (passages[i].terms = contentLemmas(a)),
  );
  writeFileSync(CACHE, JSON.stringify(passages));
  return passages;
}

/**
 * The labs' coded batch: a seeded 25% of each category's samples, drawn category by category in
 * template order (bench:quality's seededBatch draws in name order, so its splits differ).
 */
export function labSplit(seed) {
  const byCat = new Map();
  for (const [file, cat] of brownCategories()) (byCat.get(cat) ?? byCat.set(cat, []).get(cat)).push(file);
  const rand = rng(seed);
  const train = new Set();
  for (const cat of LEAVES) {
    const files = byCat.get(cat).slice().sort();
    for (let i = files.length - 1; i > 0; i--) {
      const j = Math.floor(rand() * (i + 1));
      [files[i], files[j]] = [files[j], files[i]];
    }
    files.slice(0, Math.max(1, Math.round(files.length * 0.25))).forEach((f) => train.add(f));
  }
  return train;
}

/** The benchmark template as the model's themes, with only the given leaves. */
export function labThemes(leaves = LEAVES) {
  const theme = (id, parentId, name, path) => ({ id, parentId, name, path, apriori: false, definition: '', seeds: [] });
  const out = [theme('informative', null, 'Informative', 'Informative'), theme('imaginative', null, 'Imaginative', 'Imaginative')];
  for (const l of INFORMATIVE.filter((c) => leaves.includes(c))) out.push(theme(l, 'informative', l, `Informative > ${l}`));
  for (const l of IMAGINATIVE.filter((c) => leaves.includes(c))) out.push(theme(l, 'imaginative', l, `Imaginative > ${l}`));
  return out;
}
