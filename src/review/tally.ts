/** What a review session has decided so far (pure). */
import type { DecisionRow } from '../study/decisions.js';

/**
 * Acceptance this session, counted as stats and the report count it (src/measure/acceptance.ts):
 * accepted out of decided, where decided = accepted + re-coded + rejected. A re-code is decided
 * but not accepted (another theme was chosen); a defer is not yet decided; "nothing to code"
 * judges the passage, not a suggestion, and is counted apart.
 */
export class Tally {
  private readonly actions = new Map<number, string>();
  /** Undo entries made this session. */
  undos = 0;

  add(d: DecisionRow): void {
    this.actions.set(d.id, d.action);
  }

  /** Takes an undone decision out, if this session made it. */
  remove(id: number): void {
    this.actions.delete(id);
  }

  get ids(): ReadonlySet<number> {
    return new Set(this.actions.keys());
  }

  count(action: string): number {
    let n = 0;
    for (const a of this.actions.values()) if (a === action) n++;
    return n;
  }

  get accepted(): number {
    return this.count('accept');
  }

  get decided(): number {
    return this.count('accept') + this.count('recode') + this.count('reject');
  }
}
