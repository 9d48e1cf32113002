import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { sourceFiles, src } from '../helpers/imports.js';

// The maths layer sits at the bottom: src/math imports nothing from src/, and discovery does
// not reach into the suggestion model for maths that now lives in src/math.
const all = sourceFiles().map((f) => ({ file: f.file, imports: f.imports.map((i) => i.path) }));
const mathFiles = new Set(all.filter((f) => f.file.startsWith('math/')).map((f) => f.file.replace(/\.ts$/, '')));

describe('the maths layer', () => {
  it('exists and holds the shared maths', () => {
    for (const f of ['math/sparse', 'math/random', 'math/logodds', 'math/sigmoid', 'math/cholesky', 'math/newton']) expect(mathFiles.has(f), f).toBe(true);
  });

  it('imports nothing else from src/', () => {
    const outside = all.filter((f) => f.file.startsWith('math/')).flatMap((f) => f.imports.filter((i) => !i.startsWith('math/')).map((i) => `${f.file} -> ${i}`));
    expect(outside).toEqual([]);
  });

  it('is imported directly: discovery never imports the suggestion code for maths', () => {
    // A file of src/suggest that re-exports or defines maths would be a way round the layer.
    const mathNames = /\b(sigmoid|softplus|solveSpd|symmetrise|addRidge|backtrack|logOdds|logOddsDelta|seededRandom|sampleIndices|SparseVector)\b/;
    const bad = all
      .filter((f) => f.file.startsWith('discover/'))
      .flatMap((f) => {
        const text = readFileSync(join(src, f.file), 'utf8');
        return [...text.matchAll(/import\s+(?:type\s+)?\{([^}]*)\}\s*from\s*'(\.\.\/suggest\/[^']+)'/g)]
          .filter((m) => mathNames.test(m[1]!))
          .map((m) => `${f.file}: ${m[0].replace(/\s+/g, ' ')}`);
      });
    expect(bad).toEqual([]);
  });

  it('finds the imports it checks (the scan itself works)', () => {
    const kmeans = all.find((f) => f.file === 'discover/kmeans.ts');
    expect(kmeans?.imports).toContain('math/random');
  });
});
