import { describe, expect, it } from 'vitest';
import { sourceFiles } from './helpers/imports.js';

// Storage apart from use cases: src/study/ holds the rows (schema, queries, transactions), and
// src/jobs/ the use cases above it (ranking, fitting, queues, quotes, measures, discovery, import).
const all = sourceFiles();
const folder = (path: string) => path.split('/')[0]!;
const inFolder = (name: string) => all.filter((f) => folder(f.file) === name);

/** The analysis folders study/ may use for the types of what it stores, never for their code. */
const ANALYSIS = new Set(['discover', 'suggest', 'measure', 'report', 'text', 'ingest']);
/**
 * The one value import study/ keeps from them: discover/key.ts (a hash of a cluster's members, the
 * label from its terms, and the id pattern), because a stored cluster is named by it when read
 * (rows from before the key column have none) and a cluster id is checked by it when looked up.
 */
const STUDY_MAY_USE = new Set(['discover/key']);

const CORE = new Set(['math', 'text', 'template', 'sheet', 'measure', 'suggest', 'discover', 'report', 'ingest', 'review']);

const list = (files: typeof all, bad: (i: (typeof all)[number]['imports'][number]) => boolean) =>
  files.flatMap((f) => f.imports.filter(bad).map((i) => `${f.file} -> ${i.path}${i.typeOnly ? ' (type)' : ''}`));

describe('the storage layer and the use cases above it', () => {
  it('study/ never imports the use cases or the edges, not even for types', () => {
    expect(list(inFolder('study'), (i) => ['jobs', 'cli', 'web'].includes(folder(i.path)))).toEqual([]);
  });

  it('study/ imports the analysis folders for types only (discover/key apart)', () => {
    expect(list(inFolder('study'), (i) => ANALYSIS.has(folder(i.path)) && !i.typeOnly && !STUDY_MAY_USE.has(i.path))).toEqual([]);
  });

  it('no core folder imports jobs/', () => {
    expect(list(all.filter((f) => CORE.has(folder(f.file))), (i) => folder(i.path) === 'jobs')).toEqual([]);
  });

  it('jobs/ never imports the edges', () => {
    expect(list(inFolder('jobs'), (i) => ['cli', 'web'].includes(folder(i.path)))).toEqual([]);
  });

  it('only study/ touches SQLite: no statement prepared, run or opened anywhere else', () => {
    const sql = /\.(prepare|pragma)\(|\bdb\.exec\(|from 'better-sqlite3'/;
    expect(all.filter((f) => folder(f.file) !== 'study' && sql.test(f.text.replace(/\/\/.*|\/\*[\s\S]*?\*\//g, ''))).map((f) => f.file)).toEqual([]);
  });

  it('finds the imports it checks (the scan itself works)', () => {
    const suggest = all.find((f) => f.file === 'jobs/suggest.ts');
    expect(suggest?.imports).toContainEqual({ path: 'study/suggestion-rows', typeOnly: false });
    const rows = all.find((f) => f.file === 'study/suggestion-rows.ts');
    expect(rows?.imports).toContainEqual({ path: 'suggest/types', typeOnly: true });
    // Every static relative import is found, however its names are spread over lines.
    for (const f of all) expect(f.imports.length, f.file).toBeGreaterThanOrEqual((f.text.match(/from\s*'\.{1,2}\//g) ?? []).length);
  });
});
