/**
 * The browser's review session: a thin adapter over the review session of src/review/ (the same
 * rules, guarded writes and decision log as the terminal review), so a tab and a terminal open at
 * once never decide one suggestion twice. Form fields in, the session's screen model out; the
 * only thing added here is the memo on a passage, which is not a review decision.
 */
import { UserError } from '../errors.js';
import { ReviewSession, type ReviewAction, type ScreenModel } from '../review/session.js';
import type { ThemeRef } from '../review/port.js';
import type { Study } from '../study/study.js';
import { addMemo } from '../study/memos.js';
import { sqliteReviewStore } from '../jobs/review-store.js';

export type Act = ReviewAction | { kind: 'memo'; text: string } | { kind: 'restart' };

export interface ReviewView {
  screen: ScreenModel;
  themes: ThemeRef[];
  /** What the latest action did, in words. */
  message: string;
}

export class WebReview {
  private session!: ReviewSession;
  private message = '';

  constructor(
    private readonly study: Study,
    readonly coder: string,
  ) {
    this.restart();
  }

  /** A fresh queue (a new suggestion run), as when a terminal review starts. */
  restart(): void {
    this.session = ReviewSession.start(sqliteReviewStore(this.study), this.coder);
  }

  /** Read afresh on every page: another session may have decided the passage meanwhile. */
  view(): ReviewView {
    const screen = this.session.act({ kind: 'refresh' }).screen;
    const message = [this.message, ...screen.messages].filter(Boolean).join(' ');
    this.message = '';
    return { screen, themes: this.session.themes(), message };
  }

  act(a: Act): void {
    if (a.kind === 'restart') {
      this.restart();
      this.message = 'A fresh queue, from a new suggestion run.';
      return;
    }
    if (a.kind === 'memo') {
      const p = this.session.screen().passage;
      try {
        if (!p) throw new UserError('the queue is done: no passage to write a memo on');
        if (!a.text.trim()) throw new UserError('the memo is empty');
        const m = addMemo(this.study.db, { kind: 'passage', value: p.id }, a.text.trim(), this.coder);
        this.message = `Memo #${m.memo_id} saved on ${p.id}.`;
      } catch (e) {
        if (!(e instanceof UserError)) throw e;
        this.message = `Not saved: ${e.message}`;
      }
      return;
    }
    this.message = this.session.act(a).screen.messages.join(' ');
  }
}
