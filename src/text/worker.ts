// Worker thread: runs the language pipeline on batches of texts sent by the pool.
import { parentPort } from 'node:worker_threads';
import { analyse } from './nlp.js';
import { pack, type PackedAnalysis } from './analysis.js';

interface Job { id: number; texts: string[] }

// Load the model now, while the main thread is still reading files.
analyse('');

parentPort!.on('message', (job: Job) => {
  const results: PackedAnalysis[] = job.texts.map((t) => pack(analyse(t)));
  const transfer = results.flatMap((r) => [r.stop.buffer, r.starts.buffer, r.ends.buffer, r.sentences.buffer]);
  parentPort!.postMessage({ id: job.id, results }, transfer as ArrayBuffer[]);
});
