// Helpers for benchmarks that drive the CLI exactly as a user would.
import { spawnSync } from 'node:child_process';
import { closeSync, openSync, readFileSync } from 'node:fs';
import { join } from 'node:path';

const RUN = join(import.meta.dirname, 'run-cli.mjs');
// The launcher's own node flags (its #! line), so a benchmark runs the command as bin/trellis does.
export const FLAGS = readFileSync(join(import.meta.dirname, '../bin/trellis'), 'utf8').split('\n')[0].split(/\s+/).filter((f) => f.startsWith('--'));

/**
 * Runs `trellis ARGS` in a child process. With `out`, stdout goes to that file. Returns the
 * wall time, the command's own time and peak memory, and stdout (when not sent to a file).
 */
export function trellis(args, { out } = {}) {
  const fd = out ? openSync(out, 'w') : 'pipe';
  const t0 = performance.now();
  const r = spawnSync(process.execPath, [...FLAGS, RUN, ...args], { stdio: ['ignore', fd, 'pipe'], encoding: 'utf8', maxBuffer: 1 << 30 });
  const wall = (performance.now() - t0) / 1000;
  if (out) closeSync(fd);
  const lines = r.stderr.trim().split('\n');
  const stats = JSON.parse(lines.pop());
  if (r.status !== 0) throw new Error(`trellis ${args.join(' ')} exited ${r.status}:\n${lines.join('\n')}`);
  return { wall, seconds: stats.seconds, maxRssMiB: stats.maxRssMiB, stdout: out ? readFileSync(out, 'utf8') : r.stdout, stderr: lines.join('\n') };
}

/** The scikit-learn peer script: shared/ sits beside the repository; SKLEARN_PEER points elsewhere. */
export const PEER_SCRIPT = process.env.SKLEARN_PEER ?? join(import.meta.dirname, '../../shared/peers/sklearn_peer.py');

/** Runs the scikit-learn peer (Debian python3-sklearn) and returns its JSON. */
export function peer(...args) {
  const r = spawnSync('/usr/bin/python3', [PEER_SCRIPT, ...args], { encoding: 'utf8', maxBuffer: 1 << 28 });
  if (r.status !== 0) throw new Error(`sklearn_peer.py failed (is python3-sklearn installed? apt-get install -y python3-sklearn):\n${r.stderr}`);
  return JSON.parse(r.stdout);
}
