// The coded demo study: the whole demo corpus, the demo template and priya's first-batch coding.
import { spawnSync } from 'node:child_process';
import { readdirSync } from 'node:fs';
import { join, resolve } from 'node:path';

export const BIN = resolve(import.meta.dirname, '../../bin/trellis');
export const CORPUS = resolve(import.meta.dirname, '../../corpora/handover');

/** Builds the coded demo study in `dir` (an empty folder) with the built CLI; returns `dir`. */
export function buildCodedDemo(dir: string): string {
  const ok = (args: string[]) => {
    const r = spawnSync(process.execPath, [BIN, ...args], {
      cwd: dir,
      encoding: 'utf8',
      env: { ...process.env, TRELLIS_CODER: 'tester' },
    });
    if (r.status !== 0) throw new Error(`trellis ${args.join(' ')} failed: ${r.stderr}`);
  };
  ok(['init', '.']);
  ok(['template', 'set', join(CORPUS, 'template.txt')]);
  const files = readdirSync(CORPUS).filter((f) => /^t\d\d-.*\.(txt|md|vtt|docx)$/.test(f)).sort();
  ok(['add', ...files.map((f) => join(CORPUS, f))]);
  ok(['sheet', 'import', join(CORPUS, 'initial-coding.csv'), '--coder', 'priya']);
  return dir;
}
