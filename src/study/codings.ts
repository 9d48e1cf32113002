import type { DB } from './db.js';

export type CodingOrigin = 'sheet' | 'inline' | 'accepted' | 're-coded' | 'bulk';

export interface CodingRow {
  passage_id: string;
  theme_id: string;
  coder: string;
  origin: string;
  created_at: string;
}

/** Current codings (not removed), optionally of one coder. */
export function currentCodings(db: DB, coder?: string): CodingRow[] {
  const sql = `SELECT passage_id, theme_id, coder, origin, created_at FROM codings WHERE removed_at IS NULL
               ${coder ? 'AND coder = ?' : ''} ORDER BY id`;
  return (coder ? db.prepare(sql).all(coder) : db.prepare(sql).all()) as CodingRow[];
}

/**
 * Makes `themeIds` exactly the set of themes `coder` gives `passageId`: new ones are added,
 * missing ones marked removed (kept for the audit trail). Returns how many were added and removed.
 */
export function codingSetter(db: DB) {
  const existing = db.prepare('SELECT id, theme_id FROM codings WHERE passage_id = ? AND coder = ? AND removed_at IS NULL');
  const ins = db.prepare(
    'INSERT INTO codings (passage_id, theme_id, coder, origin, created_at, rev) VALUES (?, ?, ?, ?, ?, ?)',
  );
  const rm = db.prepare('UPDATE codings SET removed_at = ?, removed_by = ? WHERE id = ?');
  const now = new Date().toISOString();
  return (passageId: string, coder: string, themeIds: string[], origin: CodingOrigin, rev: number) => {
    const have = existing.all(passageId, coder) as { id: number; theme_id: string }[];
    const want = new Set(themeIds);
    let added = 0;
    let removed = 0;
    for (const h of have) {
      if (!want.has(h.theme_id)) {
        rm.run(now, coder, h.id);
        removed++;
      }
    }
    const had = new Set(have.map((h) => h.theme_id));
    for (const t of want) {
      if (!had.has(t)) {
        ins.run(passageId, t, coder, origin, now, rev);
        added++;
      }
    }
    return { added, removed };
  };
}

/** Adds codings without touching others (inline codes, accepted suggestions). */
export function codingAdder(db: DB) {
  const ins = db.prepare(
    `INSERT INTO codings (passage_id, theme_id, coder, origin, created_at, rev)
     SELECT ?, ?, ?, ?, ?, ? WHERE NOT EXISTS
       (SELECT 1 FROM codings WHERE passage_id = ? AND theme_id = ? AND coder = ? AND removed_at IS NULL)`,
  );
  const now = new Date().toISOString();
  return (passageId: string, themeId: string, coder: string, origin: CodingOrigin, rev: number): boolean =>
    ins.run(passageId, themeId, coder, origin, now, rev, passageId, themeId, coder).changes > 0;
}

/** Records that a coder has seen passages (they read them while coding, even if they coded nothing). */
export function seenMarker(db: DB) {
  const ins = db.prepare('INSERT OR IGNORE INTO seen (coder, passage_id) VALUES (?, ?)');
  return (coder: string, passageId: string): void => void ins.run(coder, passageId);
}

/** Everyone who made a coding or a decision in the study. */
export function knownCoders(db: DB): string[] {
  return (db.prepare('SELECT coder FROM codings UNION SELECT coder FROM decisions ORDER BY 1').all() as { coder: string }[]).map((r) => r.coder);
}
