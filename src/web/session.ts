/**
 * One browser review session over the study's review rules (src/study/review.ts): the same queue,
 * the same guarded writes and the same decision log as the terminal review, so a tab and a
 * terminal open at once never decide one suggestion twice. The page only shows what view() returns
 * and sends the actions below.
 */
import { UserError } from '../errors.js';
import type { DB } from '../study/db.js';
import type { DecisionRow } from '../study/decisions.js';
import { addMemo } from '../study/memos.js';
import {
  AlreadyDecided,
  claimOn,
  itemFromRun,
  passageView,
  recodeToNewTheme,
  ReviewQueue,
  reviewDecide,
  reviewNothingToCode,
  standingAccepts,
  standingRejects,
  startReview,
  Tally,
  undoLatest,
  type PassageView,
  type ReviewCandidate,
  type ReviewItem,
} from '../study/review.js';
import { currentTemplate } from '../study/template.js';
import { walk } from '../template/paths.js';

export interface CandidateView extends ReviewCandidate {
  state: 'open' | 'accepted' | 'rejected';
}

export interface ReviewView {
  item?: ReviewItem;
  view?: PassageView;
  candidates: CandidateView[];
  position: number | null;
  total: number;
  remaining: number;
  accepted: number;
  decided: number;
  /** The outcome of the latest action, said on the page. */
  message: string;
  canPrevious: boolean;
  themes: { path: string; id: string }[];
}

export type Act =
  | { kind: 'accept'; n: number }
  | { kind: 'reject'; n: number }
  | { kind: 'recode'; path: string }
  | { kind: 'new-theme'; parent: string; name: string }
  | { kind: 'defer' }
  | { kind: 'nothing' }
  | { kind: 'note'; text: string }
  | { kind: 'memo'; text: string }
  | { kind: 'undo' }
  | { kind: 'next' }
  | { kind: 'previous' }
  | { kind: 'restart' };

export class WebReview {
  private queue!: ReviewQueue;
  private readonly tally = new Tally();
  private current?: ReviewItem;
  /** Passages shown before the current one, for "previous". */
  private readonly back: ReviewItem[] = [];
  private note?: string;
  private message = '';

  constructor(
    private readonly db: DB,
    private readonly studyDir: string,
    readonly coder: string,
  ) {
    this.restart();
  }

  /** A fresh queue (a new suggestion run), as when a terminal review starts. */
  restart(): void {
    this.queue = new ReviewQueue(startReview(this.db).items);
    this.back.length = 0;
    this.current = undefined;
    this.advance();
  }

  private advance(): void {
    for (;;) {
      const it = this.queue.next();
      if (!it) {
        this.current = undefined;
        return;
      }
      if (claimOn(this.db, it.passageId, this.tally.ids) || !passageView(this.db, it.passageId)) {
        this.queue.closed.add(it.passageId);
        continue;
      }
      this.current = it;
      if (this.states(it).every((s) => s !== 'open')) {
        this.queue.done.add(it.passageId);
        continue;
      }
      return;
    }
  }

  private states(it: ReviewItem): CandidateView['state'][] {
    const ids = it.candidates.map((c) => c.suggestionId);
    const rej = standingRejects(this.db, ids);
    const acc = standingAccepts(this.db, ids);
    return it.candidates.map((c) => (acc.has(c.suggestionId) ? 'accepted' : rej.has(c.suggestionId) ? 'rejected' : 'open'));
  }

  view(): ReviewView {
    const it = this.current;
    const states = it ? this.states(it) : [];
    const themes = [...walk(currentTemplate(this.db))].map((e) => ({ path: e.path, id: e.node.id }));
    return {
      item: it,
      view: it ? passageView(this.db, it.passageId) : undefined,
      candidates: it ? it.candidates.map((c, i) => ({ ...c, state: states[i]! })) : [],
      position: it ? this.queue.positionOf(it.passageId) : null,
      total: this.queue.total,
      remaining: this.queue.remaining,
      accepted: this.tally.accepted,
      decided: this.tally.decided,
      message: this.message,
      canPrevious: this.back.length > 0,
      themes,
    };
  }

  /** Runs one action; a refusal (another session got there, a bad name) becomes the message. */
  act(a: Act): void {
    this.message = '';
    try {
      this.run(a);
    } catch (e) {
      if (e instanceof AlreadyDecided) {
        this.queue.closed.add(e.passageId);
        this.moveOn();
        this.message = `Not saved: ${e.message}. On to the next passage.`;
      } else if (e instanceof UserError) this.message = `Not saved: ${e.message}`;
      else throw e;
    }
  }

  private open(n: number): ReviewCandidate {
    const it = this.current;
    if (!it) throw new UserError('the queue is done: nothing to decide');
    const c = it.candidates[n - 1];
    if (!c) throw new UserError(`there is no candidate ${n} for this passage`);
    // Another session (a terminal review, another tab) may have decided it since the page was drawn.
    const claim = claimOn(this.db, it.passageId, this.tally.ids);
    if (claim) throw new AlreadyDecided(it.passageId, claim);
    const s = this.states(it)[n - 1];
    if (s !== 'open') throw new UserError(`candidate ${n} (${c.path}) is ${s} already; undo changes that`);
    return c;
  }

  private saved(d: DecisionRow, what: string): void {
    this.tally.add(d);
    this.note = undefined;
    this.message = `Saved: ${what} (decision #${d.id}).`;
  }

  private moveOn(): void {
    if (this.current) this.back.push(this.current);
    this.advance();
  }

  private firstOpen(): ReviewCandidate {
    const it = this.current;
    if (!it) throw new UserError('the queue is done: nothing to decide');
    const states = this.states(it);
    const c = it.candidates.find((_, i) => states[i] === 'open') ?? it.candidates[0];
    if (!c) throw new UserError('this passage has no candidate to decide on');
    return c;
  }

  private run(a: Act): void {
    const pid = this.current?.passageId ?? '';
    switch (a.kind) {
      case 'accept': {
        const c = this.open(a.n);
        // Accepting stays on the passage, so a second theme can be added.
        this.saved(reviewDecide(this.db, pid, { suggestionId: c.suggestionId, action: 'accept', note: this.note, coder: this.coder }, this.tally.ids), `accepted ${c.path}`);
        return;
      }
      case 'reject': {
        const c = this.open(a.n);
        this.saved(reviewDecide(this.db, pid, { suggestionId: c.suggestionId, action: 'reject', note: this.note, coder: this.coder }, this.tally.ids), `rejected ${c.path}`);
        if (this.states(this.current!).every((s) => s !== 'open')) this.finishPassage();
        return;
      }
      case 'recode': {
        const c = this.firstOpen();
        if (!a.path.trim()) throw new UserError('type a theme of the template to code the passage to');
        const d = reviewDecide(this.db, pid, { suggestionId: c.suggestionId, action: 'accept', themePath: a.path, note: this.note, coder: this.coder }, this.tally.ids);
        this.saved(d, `coded to ${a.path}`);
        return;
      }
      case 'new-theme': {
        const c = this.firstOpen();
        const name = a.name.trim();
        if (!name) throw new UserError('give the new theme a name');
        const parentId = a.parent.trim() ? ([...walk(currentTemplate(this.db))].find((e) => e.path === a.parent.trim())?.node.id ?? null) : null;
        if (a.parent.trim() && !parentId) throw new UserError(`no theme "${a.parent}" in the template to put the new theme under`);
        const r = recodeToNewTheme(this.db, this.studyDir, pid, { suggestionId: c.suggestionId, parentId, name, note: this.note, coder: this.coder }, this.tally.ids);
        this.saved(r.decision, `added ${r.path} to the template and coded the passage to it`);
        return;
      }
      case 'defer': {
        const c = this.firstOpen();
        this.saved(reviewDecide(this.db, pid, { suggestionId: c.suggestionId, action: 'defer', note: this.note, coder: this.coder }, this.tally.ids), 'deferred');
        this.queue.deferred.add(pid);
        this.moveOn();
        return;
      }
      case 'nothing': {
        if (!this.current) throw new UserError('the queue is done: nothing to decide');
        this.saved(reviewNothingToCode(this.db, pid, this.coder, this.note, this.tally.ids), 'nothing to code here');
        this.finishPassage();
        return;
      }
      case 'note': {
        this.note = a.text.trim() || undefined;
        this.message = this.note ? 'Note kept: it goes into the log with your next decision.' : 'Note cleared.';
        return;
      }
      case 'memo': {
        if (!this.current) throw new UserError('the queue is done: no passage to write a memo on');
        if (!a.text.trim()) throw new UserError('the memo is empty');
        const m = addMemo(this.db, { kind: 'passage', value: pid }, a.text.trim(), this.coder);
        this.message = `Memo #${m.memo_id} saved on ${pid}.`;
        return;
      }
      case 'undo': {
        const r = undoLatest(this.db, this.coder, this.note);
        this.tally.remove(r.undone.id);
        this.tally.undos++;
        this.note = undefined;
        const it = r.undone.suggestion_id !== null ? (this.queue.item(r.undone.passage_id ?? '') ?? itemFromRun(this.db, r.undone.suggestion_id)) : this.queue.item(r.undone.passage_id ?? '');
        if (it && it.passageId !== this.current?.passageId) {
          if (this.current) this.queue.revisit(this.current);
          this.queue.revisit(it);
          this.advance();
        } else if (it) this.queue.done.delete(it.passageId);
        this.message = `Undone: decision #${r.undone.id} (${r.undone.action} on ${r.undone.passage_id ?? 'a passage'}).`;
        return;
      }
      case 'next': {
        if (!this.current) throw new UserError('the queue is done');
        this.finishPassage();
        return;
      }
      case 'restart':
        this.restart();
        return;
      case 'previous': {
        const it = this.back.pop();
        if (!it) throw new UserError('this is the first passage of the session');
        if (this.current) this.queue.revisit(this.current);
        this.queue.revisit(it);
        this.current = undefined;
        this.advance();
        return;
      }
    }
  }

  /** Done with the passage: to the next one, remembering it for "previous". */
  private finishPassage(): void {
    if (this.current) {
      const decided = this.states(this.current).some((s) => s !== 'open');
      if (decided) this.queue.done.add(this.current.passageId);
    }
    this.moveOn();
  }
}
