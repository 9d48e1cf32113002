import { gunzipSync, gzipSync } from 'node:zlib';
import type { DB } from './db.js';

/** How many fitted states a study keeps (the most recently used): a few MB each on a large study. */
export const KEPT_STATES = 3;

/**
 * The stored state fitted on these inputs, if the study keeps one, as the bytes it was saved
 * from (reading changes nothing).
 */
export function loadState(db: DB, key: string): { bytes: Buffer; fingerprint: string } | null {
  const row = db.prepare('SELECT fingerprint, state FROM model_states WHERE inputs = ?').get(key) as { fingerprint: string; state: Buffer } | undefined;
  if (!row) return null;
  try {
    return { bytes: gunzipSync(row.state), fingerprint: row.fingerprint };
  } catch {
    return null; // unreadable: the caller fits again
  }
}

/** Marks a stored state used (it is then among the last to be dropped). */
export function touchState(db: DB, key: string): void {
  if (!db.readonly) db.prepare('UPDATE model_states SET used_at = ? WHERE inputs = ?').run(new Date().toISOString(), key);
}

/**
 * Stores a fitted state (its bytes) under its inputs' key and drops all but the KEPT_STATES most
 * recently used. Call it inside the command's own write, once the command has succeeded: a
 * command that fails leaves the study as it was.
 */
export function saveState(db: DB, key: string, bytes: Buffer, fp: string): void {
  if (db.readonly) return;
  const blob = gzipSync(bytes, { level: 1 });
  const now = new Date().toISOString();
  db.transaction(() => {
    db.prepare('INSERT OR REPLACE INTO model_states (inputs, fingerprint, state, created_at, used_at) VALUES (?, ?, ?, ?, ?)').run(key, fp, blob, now, now);
    db.prepare('DELETE FROM model_states WHERE inputs NOT IN (SELECT inputs FROM model_states ORDER BY used_at DESC, rowid DESC LIMIT ?)').run(KEPT_STATES);
  })();
}
