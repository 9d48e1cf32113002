import { createHash } from 'node:crypto';
import { gunzipSync, gzipSync } from 'node:zlib';
import type { ResolvedOptions, SuggesterState } from '../suggest/suggester.js';
import type { Coding } from '../suggest/types.js';
import type { DB } from './db.js';
import type { ModelInputs } from './model.js';

/** How many fitted states a study keeps (the most recently used): a few MB each on a large study. */
export const KEPT_STATES = 3;

/**
 * A hash of everything a fit learns from. Two fits on the same inputs give the same state (every
 * random choice is seeded), so a state stored under this key can stand in for a new fit.
 */
export function inputsKey(inputs: ModelInputs, negatives: readonly Coding[], options: ResolvedOptions, version: number): string {
  const h = createHash('sha256');
  const put = (s: string) => h.update(s).update('\u0000');
  put(`state ${version}`);
  put(JSON.stringify(options));
  for (const p of inputs.passages) put(`${p.id}\u0001${p.transcript}\u0001${p.ordinal}\u0001${p.role}\u0001${p.words ?? ''}\u0001${p.terms.join(' ')}`);
  for (const c of inputs.codings) put(`c ${c.passageId}\u0001${c.themeId}`);
  for (const n of negatives) put(`n ${n.passageId}\u0001${n.themeId}`);
  put(JSON.stringify(inputs.themes));
  return h.digest('hex').slice(0, 32);
}

/** The stored state fitted on these inputs, if the study keeps one (reading changes nothing). */
export function loadState(db: DB, key: string): { state: SuggesterState; fingerprint: string } | null {
  const row = db.prepare('SELECT fingerprint, state FROM model_states WHERE inputs = ?').get(key) as { fingerprint: string; state: Buffer } | undefined;
  if (!row) return null;
  let state: SuggesterState;
  try {
    state = JSON.parse(gunzipSync(row.state).toString('utf8')) as SuggesterState;
  } catch {
    return null; // unreadable: the caller fits again
  }
  return { state, fingerprint: row.fingerprint };
}

/** Marks a stored state used (it is then among the last to be dropped). */
export function touchState(db: DB, key: string): void {
  if (!db.readonly) db.prepare('UPDATE model_states SET used_at = ? WHERE inputs = ?').run(new Date().toISOString(), key);
}

/**
 * Stores a fitted state under its inputs' key and drops all but the KEPT_STATES most recently
 * used. Call it inside the command's own write, once the command has succeeded: a command that
 * fails leaves the study as it was.
 */
export function saveState(db: DB, key: string, state: SuggesterState, fp: string): void {
  if (db.readonly) return;
  const blob = gzipSync(JSON.stringify(state), { level: 1 });
  const now = new Date().toISOString();
  db.transaction(() => {
    db.prepare('INSERT OR REPLACE INTO model_states (inputs, fingerprint, state, created_at, used_at) VALUES (?, ?, ?, ?, ?)').run(key, fp, blob, now, now);
    db.prepare('DELETE FROM model_states WHERE inputs NOT IN (SELECT inputs FROM model_states ORDER BY used_at DESC, rowid DESC LIMIT ?)').run(KEPT_STATES);
  })();
}
