// Runs the built CLI (bin/trellis -> dist/) as a user would, in temporary folders.
import Database from 'better-sqlite3';
import { spawnSync } from 'node:child_process';
import { mkdtempSync, readdirSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';

export const BIN = resolve(import.meta.dirname, '../../bin/trellis');
export const CORPUS = resolve(import.meta.dirname, '../../corpora/handover');

export interface Run {
  status: number;
  stdout: string;
  stderr: string;
}

export function trellis(args: string[], cwd: string, env: Record<string, string> = {}): Run {
  const r = spawnSync(process.execPath, [BIN, ...args], {
    cwd,
    encoding: 'utf8',
    maxBuffer: 256 * 1024 * 1024,
    env: { ...process.env, TRELLIS_CODER: 'tester', ...env },
  });
  return { status: r.status ?? -1, stdout: r.stdout, stderr: r.stderr };
}

/** A fresh temporary folder with an initialised study in it. */
export function freshStudy(initArgs: string[] = []): string {
  const dir = mkdtempSync(join(tmpdir(), 'trellis-test-'));
  const r = trellis(['init', '.', ...initArgs], dir);
  if (r.status !== 0) throw new Error(`init failed: ${r.stderr}`);
  return dir;
}

/** A fresh study holding the whole demo corpus, with the demo template and priya's first-batch coding. */
export function codedDemoStudy(): string {
  const dir = freshStudy();
  const ok = (args: string[]) => {
    const r = trellis(args, dir);
    if (r.status !== 0) throw new Error(`${args.join(' ')} failed: ${r.stderr}`);
  };
  ok(['template', 'set', join(CORPUS, 'template.txt')]);
  const files = readdirSync(CORPUS).filter((f) => /^t\d\d-.*\.(txt|md|vtt|docx)$/.test(f)).sort();
  ok(['add', ...files.map((f) => join(CORPUS, f))]);
  ok(['sheet', 'import', join(CORPUS, 'initial-coding.csv'), '--coder', 'priya']);
  return dir;
}

export function write(dir: string, name: string, content: string | Buffer): string {
  const path = join(dir, name);
  writeFileSync(path, content);
  return path;
}

/** Every table's rows, in a stable order: two equal snapshots mean the study's content is unchanged. */
export function snapshot(dir: string): string {
  const db = new Database(join(dir, 'study.db'), { readonly: true });
  try {
    const tables = (db.prepare("SELECT name FROM sqlite_master WHERE type = 'table' ORDER BY name").all() as { name: string }[]).map(
      (t) => t.name,
    );
    const out: Record<string, unknown[]> = {};
    for (const t of tables) out[t] = db.prepare(`SELECT * FROM "${t}" ORDER BY 1`).all();
    return JSON.stringify(out, (_k, v) => (Buffer.isBuffer(v) ? v.toString('hex') : v));
  } finally {
    db.close();
  }
}
