// Runs the built CLI (bin/trellis -> dist/) as a user would, in temporary folders.
import Database from 'better-sqlite3';
import { spawn, spawnSync } from 'node:child_process';
import { cpSync, existsSync, mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import { pathToFileURL } from 'node:url';
import { Worker } from 'node:worker_threads';
import { inject } from 'vitest';
import { BIN, CORPUS, buildCodedDemo } from './demo-fixture.js';

export { BIN, CORPUS };

/** A new empty folder under the run's temporary root (tests/setup/global.ts removes it at the end). */
export function tempFolder(prefix = 'study-'): string {
  const root = inject('tmpRoot');
  return mkdtempSync(root && existsSync(root) ? join(root, prefix) : join(tmpdir(), `trellis-test-${prefix}`));
}

export interface Run {
  status: number;
  stdout: string;
  stderr: string;
}

/**
 * Runs `trellis ARGS` in `cwd` as a user would and returns its exit status and output. Commands run
 * in one warm process per test file (tests/cli/warm-server.mjs: same `main`, same arguments, cwd and
 * environment), which saves Node's start-up for each; TRELLIS_TEST_SPAWN=1 spawns every command.
 */
export function trellis(args: string[], cwd: string, env: Record<string, string> = {}): Run {
  const fullEnv = { ...process.env, TRELLIS_CODER: 'tester', ...env } as Record<string, string>;
  if (process.env.TRELLIS_TEST_SPAWN !== '1') {
    const r = warmRun(args, cwd, fullEnv);
    if (r) return r;
  }
  return spawned(args, cwd, fullEnv);
}

/** The command in a process of its own (what `trellis()` did before the warm runner). */
export function spawned(args: string[], cwd: string, env: Record<string, string>): Run {
  const r = spawnSync(process.execPath, [BIN, ...args], { cwd, encoding: 'utf8', maxBuffer: 256 * 1024 * 1024, env });
  return { status: r.status ?? -1, stdout: r.stdout, stderr: r.stderr };
}

interface Warm {
  socket: string;
  client: Worker;
  folder: string;
}
let warm: Warm | null | undefined;

function sleep(ms: number): void {
  Atomics.wait(new Int32Array(new SharedArrayBuffer(4)), 0, 0, ms);
}

function startWarm(): Warm | null {
  const folder = tempFolder('warm-');
  const socket = join(folder, 's');
  const main = pathToFileURL(resolve(import.meta.dirname, '../../dist/cli/main.js')).href;
  const server = spawn(process.execPath, ['--max-semi-space-size=32', join(import.meta.dirname, 'warm-server.mjs'), socket, main], {
    stdio: ['pipe', 'ignore', 'inherit'],
  });
  server.unref();
  (server.stdin as unknown as { unref?: () => void } | null)?.unref?.();
  for (let i = 0; i < 1000 && !existsSync(socket); i++) {
    if (server.exitCode !== null) return null;
    sleep(20);
  }
  if (!existsSync(socket)) return null;
  const client = new Worker(join(import.meta.dirname, 'warm-client.mjs'));
  client.unref();
  return { socket, client, folder };
}

let replies = 0;
function warmRun(args: string[], cwd: string, env: Record<string, string>): Run | null {
  if (warm === undefined) warm = startWarm();
  if (!warm) return null;
  const flag = new SharedArrayBuffer(4);
  const reply = join(warm.folder, `reply-${replies++}.json`);
  warm.client.postMessage({ socketPath: warm.socket, request: { args, cwd: resolve(cwd), env, reply }, flag });
  const view = new Int32Array(flag);
  Atomics.wait(view, 0, 0);
  if (Atomics.load(view, 0) !== 1 || !existsSync(reply)) {
    warm = null; // the server is gone: this and later commands are spawned
    return null;
  }
  const r = JSON.parse(readFileSync(reply, 'utf8')) as Run;
  rmSync(reply);
  return r;
}

/** A fresh temporary folder with an initialised study in it. */
export function freshStudy(initArgs: string[] = []): string {
  const dir = tempFolder();
  const r = trellis(['init', '.', ...initArgs], dir);
  if (r.status !== 0) throw new Error(`init failed: ${r.stderr}`);
  return dir;
}

/** A copy of a study folder in a new temporary folder (the study must not be open for writing). */
export function copyStudy(dir: string): string {
  const copy = tempFolder('copy-');
  cpSync(dir, copy, { recursive: true });
  return copy;
}

/**
 * `build` run once per test file, then a fresh copy of its study for every call: tests that need
 * the same starting study get their own without paying for the imports again.
 */
export function onceStudy(build: () => string): () => string {
  let built: string | undefined;
  return () => copyStudy((built ??= build()));
}

/**
 * A fresh study holding the whole demo corpus, with the demo template and priya's first-batch coding:
 * a copy of the one built for the whole run by tests/setup/global.ts.
 */
export function codedDemoStudy(): string {
  const shared = inject('codedDemo');
  return shared && existsSync(shared) ? copyStudy(shared) : buildCodedDemo(tempFolder());
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
