/**
 * What a review session needs from the study, as an interface: src/jobs/review-store.ts
 * implements it over the study's rows (src/study/review.ts), so src/review itself never touches the database.
 * Every write method runs in its own write transaction and re-checks there that the passage is
 * still open to this session; none keeps a transaction open after it returns.
 */
import type { DecisionRow } from '../study/decisions.js';
import type { Template } from '../template/types.js';
import type { Claim, PassageView, ReviewDecision } from '../study/review.js';
import type { ReviewCandidate, ReviewItem, ReviewSetup, ReviewStart } from './order.js';

export type { Claim, DecisionRow, PassageView, ReviewCandidate, ReviewItem, ReviewSetup, ReviewStart };

/** A theme of the current template, in template order. */
export interface ThemeRef {
  id: string;
  path: string;
  name: string;
}

/** A guarded write: done, or refused because another session or coder got to the passage first. */
export type Written<T = DecisionRow> = { ok: true; value: T } | { ok: false; claim: Claim; message: string };

export interface ReviewStore {
  /**
   * A fresh suggestion run and the queue of passages still open (slow: fits the model). With
   * `setup.phased`, possibly only its first part, and `rest` to score the others.
   */
  start(setup: ReviewSetup, fitting?: () => void): ReviewStart;
  /** Another coder's or session's claim on the passage (`mine`: this session's decision ids). */
  claim(passageId: string, mine: ReadonlySet<number>): Claim | null;
  /** The passage with its tokens and the turns around it; undefined when it is gone. */
  passage(passageId: string): PassageView | undefined;
  /** Of these suggestions, those with a standing reject, and those with a standing accept or re-code. */
  standing(suggestionIds: number[]): { rejected: Set<number>; accepted: Set<number> };
  decide(passageId: string, d: ReviewDecision, mine: ReadonlySet<number>): Written;
  nothingToCode(passageId: string, coder: string, note: string | undefined, mine: ReadonlySet<number>): Written;
  /** A new theme under parentId (null: top level) and the passage coded to it, in one transaction. */
  addTheme(
    passageId: string,
    d: { suggestionId: number; parentId: string | null; name: string; note?: string; coder: string },
    mine: ReadonlySet<number>,
  ): Written<{ decision: DecisionRow; rev: number | null; path: string }>;
  /** Undoes the coder's latest standing decision; throws a UserError when there is none. */
  undoLatest(coder: string, note?: string): { undo: DecisionRow; undone: DecisionRow };
  /** The queue item for a passage outside the queue, from the run its suggestion came from. */
  itemFromRun(suggestionId: number): ReviewItem | undefined;
  /** The current template's themes, in template order. */
  themes(): ThemeRef[];
  /** The current template (read afresh: another session may have added a theme). */
  template(): Template;
}
