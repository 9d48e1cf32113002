/** The researcher's pinned and dropped quotes (schema 8), kept one choice per theme and passage. */

import { UserError } from '../errors.js';
import type { QuoteChoice } from '../report/quotes.js';
import { walk } from '../template/paths.js';
import type { DB } from './db.js';
import { getPassage } from './passages.js';
import { currentTemplate } from './template.js';

export interface StoredQuoteChoice extends QuoteChoice {
  at: string;
  coder: string;
}

/** Every choice, in the order made (pins keep that order in the report). */
export function listQuoteChoices(db: DB): StoredQuoteChoice[] {
  return (db.prepare('SELECT theme_id AS themeId, passage_id AS passageId, choice, at, coder FROM quote_choices ORDER BY id').all() as StoredQuoteChoice[]);
}

/** The theme and its sub-themes, by id. */
function subtree(db: DB, themeId: string): string[] {
  for (const e of walk(currentTemplate(db))) {
    if (e.node.id !== themeId) continue;
    const ids: string[] = [];
    const stack = [e.node];
    while (stack.length) {
      const n = stack.pop()!;
      ids.push(n.id);
      stack.push(...n.children);
    }
    return ids;
  }
  return [];
}

/**
 * Pins a passage to a theme's quotes, or drops it from them, in one transaction. The passage must
 * exist and carry the theme or one of its sub-themes. A new choice replaces an earlier one.
 */
export function chooseQuote(db: DB, themeId: string, passageId: string, choice: 'pin' | 'drop', coder: string): StoredQuoteChoice {
  return db.transaction(() => {
    requireCoded(db, themeId, passageId);
    const at = new Date().toISOString();
    db.prepare(
      `INSERT INTO quote_choices (theme_id, passage_id, choice, at, coder) VALUES (?, ?, ?, ?, ?)
       ON CONFLICT (theme_id, passage_id) DO UPDATE SET choice = excluded.choice, at = excluded.at, coder = excluded.coder`,
    ).run(themeId, passageId, choice, at, coder);
    return { themeId, passageId, choice, at, coder };
  })();
}

/** Withdraws a pin or a drop; an error when there is none. */
export function clearQuoteChoice(db: DB, themeId: string, passageId: string, themePath: string): void {
  db.transaction(() => {
    const r = db.prepare('DELETE FROM quote_choices WHERE theme_id = ? AND passage_id = ?').run(themeId, passageId);
    if (!r.changes) throw new UserError(`passage ${passageId} is neither pinned to nor dropped from the quotes of "${themePath}"`);
  })();
}

function requireCoded(db: DB, themeId: string, passageId: string): void {
  if (!getPassage(db, passageId)) throw new UserError(`no passage "${passageId}" in the study (ids as in trellis suggest, the coding sheet or trellis quote list)`);
  const ids = subtree(db, themeId);
  const marks = ids.map(() => '?').join(',');
  const coded = ids.length && db.prepare(`SELECT 1 FROM codings WHERE passage_id = ? AND removed_at IS NULL AND theme_id IN (${marks}) LIMIT 1`).get(passageId, ...ids);
  if (!coded) throw new UserError(`passage ${passageId} is not coded to that theme or any theme under it, so it cannot be one of its quotes`);
}
