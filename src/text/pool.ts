import { existsSync } from 'node:fs';
import { availableParallelism } from 'node:os';
import { fileURLToPath } from 'node:url';
import { Worker } from 'node:worker_threads';
import { unpack, type PackedAnalysis, type TextAnalysis } from './analysis.js';
import { analyse } from './nlp.js';

/** Below this many characters, starting workers costs more than it saves. */
const IN_PROCESS_CHARS = 300_000;
/** Characters per message to a worker: large enough to amortise messaging, small enough to balance. */
const BATCH_CHARS = 60_000;

/** The compiled worker script; when running from TypeScript sources, the built copy in dist/. */
function workerScript(): string | null {
  const here = fileURLToPath(new URL('./worker.js', import.meta.url));
  if (existsSync(here)) return here;
  const built = fileURLToPath(new URL('../../dist/text/worker.js', import.meta.url));
  return existsSync(built) ? built : null;
}

let warm: Worker[] = [];

/**
 * Starts the worker threads ahead of a large job, so that loading the language model in them
 * overlaps with reading the files. The next `analyseMany` uses them.
 */
export function warmUp(workers = availableParallelism()): void {
  const script = workerScript();
  if (!script || warm.length) return;
  warm = Array.from({ length: Math.max(1, Math.min(workers, 8)) }, () => new Worker(script));
  for (const w of warm) w.unref(); // an unused warm pool must not keep the process alive
}

function takeWarm(script: string, workers: number): Worker[] {
  const pool = warm.length ? warm : Array.from({ length: workers }, () => new Worker(script));
  warm = [];
  for (const w of pool) w.ref();
  return pool;
}

/**
 * Analyses many texts, in worker threads when the job is large. `onResult` is called once per
 * text, in input order, as soon as that text and all before it are done, so callers can store
 * results while later texts are still being analysed.
 */
export async function analyseMany(
  texts: string[],
  onResult: (index: number, analysis: TextAnalysis) => void,
  opts: { workers?: number } = {},
): Promise<void> {
  const total = texts.reduce((n, t) => n + t.length, 0);
  const script = workerScript();
  const workers = Math.max(1, Math.min(opts.workers ?? availableParallelism(), 8));
  if (total < IN_PROCESS_CHARS || !script || workers === 1) {
    await Promise.all(warm.splice(0).map((w) => w.terminate()));
    texts.forEach((t, i) => onResult(i, analyse(t)));
    return;
  }

  const batches: { first: number; texts: string[] }[] = [];
  let cur: string[] = [];
  let chars = 0;
  let first = 0;
  texts.forEach((t, i) => {
    cur.push(t);
    chars += t.length;
    if (chars >= BATCH_CHARS) {
      batches.push({ first, texts: cur });
      cur = [];
      chars = 0;
      first = i + 1;
    }
  });
  if (cur.length) batches.push({ first, texts: cur });

  // Batches go to workers in a fixed rotation (batch b to worker b mod W), not to whichever is
  // free: wink-nlp's lexicon cache learns new words as it goes, so a lemma can depend on what the
  // worker analysed before, and the same import must give the same analysis every time.
  const done = new Map<number, PackedAnalysis[]>();
  let nextToEmit = 0;
  const started = takeWarm(script, Math.min(workers, batches.length));
  const pool = started.slice(0, Math.max(1, Math.min(workers, batches.length)));
  try {
    await new Promise<void>((resolve, reject) => {
      pool.forEach((w, k) => {
        let mine = k;
        w.on('error', reject);
        w.on('message', (msg: { id: number; results: PackedAnalysis[] }) => {
          done.set(msg.id, msg.results);
          mine += pool.length;
          if (mine < batches.length) w.postMessage({ id: mine, texts: batches[mine]!.texts });
          try {
            while (done.has(nextToEmit)) {
              const b = batches[nextToEmit]!;
              done.get(nextToEmit)!.forEach((r, i) => onResult(b.first + i, unpack(r)));
              done.delete(nextToEmit);
              nextToEmit++;
            }
          } catch (e) {
            reject(e);
            return;
          }
          if (nextToEmit === batches.length) resolve();
        });
        w.postMessage({ id: mine, texts: batches[mine]!.texts });
      });
    });
  } finally {
    await Promise.all(started.map((w) => w.terminate()));
  }
}
