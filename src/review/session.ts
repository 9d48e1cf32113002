/**
 * A review session, apart from any screen: the rules of going through suggested passages one at
 * a time, for the terminal (src/cli/review.ts) and any other front end.
 *
 *   const session = ReviewSession.start(sqliteReviewStore(db, dir), coder, { order: 'uncertain' });
 *   const { outcome, screen } = session.act({ kind: 'accept', candidate: suggestionId });
 *
 * Actions (ReviewAction): accept, reject, recode (to an existing theme), add (a new sub-theme,
 * created on the spot), defer, note, nothing (nothing to code), undo, next, previous, refresh.
 * Each returns an Outcome and a ScreenModel: plain, serialisable data (no escape codes, no keys).
 * An accept keeps the passage current, so a second or third theme can be accepted or added;
 * `next` moves on. Every write re-checks, inside its own write transaction, that the passage is
 * still open; when another session or coder got there first the outcome is `conflict` and the
 * session moves on. No transaction stays open between actions, and the passage shown is re-read
 * from the study on every move and refresh, so a long-running process sees others' decisions.
 */
import { UserError } from '../errors.js';
import type { Reason } from '../suggest/types.js';
import type { DecisionRow, PassageView, ReviewCandidate, ReviewItem, ReviewSetup, ReviewStore, ThemeRef } from './port.js';
import { describeBriefly } from './describe.js';
import { ReviewQueue } from './queue.js';
import { Tally } from './tally.js';

export type ReviewAction =
  | { kind: 'accept'; candidate: number }
  /** Without a candidate: the top open one. */
  | { kind: 'reject'; candidate?: number }
  /** Code the passage to this theme (id or path): an accept when it is an open candidate. */
  | { kind: 'recode'; theme: string }
  /** Create a theme named `name` under `parent` (id or path; null: top level) and code the passage to it. */
  | { kind: 'add'; parent: string | null; name: string }
  | { kind: 'defer' }
  /** Kept with the next decision; empty text clears it. */
  | { kind: 'note'; text: string }
  | { kind: 'nothing' }
  | { kind: 'undo' }
  | { kind: 'next' }
  | { kind: 'previous' }
  | { kind: 'refresh' };

/** Why an action was not carried out (nothing was written). */
export type Refusal =
  | 'no-passage' // the queue is done
  | 'no-candidate' // no such candidate on this passage
  | 'rejected-already'
  | 'accepted-already'
  | 'all-decided' // every candidate of the passage is decided
  | 'not-decided' // next before any decision on the passage
  | 'no-theme' // recode/add: no such theme
  | 'no-name' // add: empty name
  | 'no-previous'
  | 'invalid'; // the study refused it (a name clash, say): see message

export type Outcome =
  | {
      kind: 'saved';
      decision: DecisionRow;
      /** With `add`: the new template revision and the new theme's path. */
      added?: { rev: number | null; path: string };
      /** stay: the passage stays for more; next: it is done (every candidate decided, defer, nothing to code). */
      then: 'stay' | 'next';
    }
  | { kind: 'conflict'; message: string }
  | { kind: 'refused'; reason: Refusal; message: string }
  | { kind: 'busy'; message: string }
  | {
      kind: 'undone';
      undo: DecisionRow;
      undone: DecisionRow;
      /** same: it was on the passage shown; back: its passage is shown again; taken: decided elsewhere since; gone: no longer in the study. */
      back: 'same' | 'back' | 'taken' | 'gone';
    }
  | { kind: 'nothing-undone'; message: string }
  | { kind: 'noted'; note: string | null }
  | { kind: 'moved' };

/** A candidate as a front end shows it: the queue's candidate, its place, matches and state. */
export interface CandidateModel extends ReviewCandidate {
  /** 1-based place in the list. */
  number: number;
  /** Where the passage text holds the terms its reasons name: [start, end) character offsets. */
  matches: { start: number; end: number }[];
  state: 'open' | 'accepted' | 'rejected';
}

export interface TurnModel {
  speaker: string | null;
  start: number | null;
  text: string;
}

export interface PassageModel {
  id: string;
  transcript: string;
  /** 1-based place in the transcript, and how many passages it has. */
  ordinal: number;
  passagesInTranscript: number;
  /** 1-based place in the queue; null for a passage brought back from outside it (after an undo). */
  position: number | null;
  speaker: string | null;
  start: number | null;
  text: string;
  /** The interviewer's question this passage answers, when known. */
  question: string | null;
  before: TurnModel | null;
  after: TurnModel | null;
  candidates: CandidateModel[];
  /** This session has a standing decision on it: `next` moves on. */
  decidedHere: boolean;
}

export interface ScreenModel {
  coder: string;
  order: string;
  filters: string[];
  passage: PassageModel | null;
  progress: {
    total: number;
    /** Passages of the queue not yet decided, deferred or closed. */
    left: number;
    done: number;
    accepted: number;
    recoded: number;
    rejected: number;
    deferred: number;
    nothingToCode: number;
    /** accepted + re-coded + rejected, as trellis stats counts them. */
    decided: number;
    undone: number;
  };
  /** The note waiting for the next decision. */
  note: string | null;
  /** What the last action did, in words (no key names). */
  messages: string[];
}

export interface ActResult {
  outcome: Outcome;
  screen: ScreenModel;
}

/** What is on screen now; `view` holds the passage's tokens for front ends that mark terms themselves. */
export interface Current {
  item: ReviewItem;
  view: PassageView;
  rejected: ReadonlySet<number>;
  accepted: ReadonlySet<number>;
  position: number | null;
  decidedHere: boolean;
}

export class ReviewSession {
  private current: Current | undefined;
  private note: string | undefined;
  private messages: string[] = [];
  readonly tally = new Tally();
  /** Passages shown before the current one, for `previous`. */
  private readonly history: ReviewItem[] = [];
  /** The rest of a queue given in parts (ReviewStart.rest), until it is asked for. */
  private rest: (() => { items: ReviewItem[] }) | undefined;

  constructor(
    private readonly store: ReviewStore,
    readonly coder: string,
    readonly queue: ReviewQueue,
    readonly order: string = 'transcript',
    readonly filters: string[] = [],
  ) {
    this.advance();
  }

  /** A fresh suggestion run (slow), then the first open passage. */
  static start(store: ReviewStore, coder: string, setup: ReviewSetup = {}, fitting?: () => void): ReviewSession {
    const start = store.start(setup, fitting);
    const filters = [...(setup.transcripts ?? []).map((t) => `transcript ${t}`), ...(setup.theme ? [`theme ${setup.theme}`] : [])];
    const session = new ReviewSession(store, coder, new ReviewQueue(start.items), setup.order ?? 'transcript', filters);
    session.rest = start.rest;
    return session;
  }

  /** Whether part of the queue is still to come (a phased start): `scoreRest` brings it. */
  get scoring(): boolean {
    return this.rest !== undefined;
  }

  /** Scores the transcripts still to come (slow) and adds their passages to the queue. */
  scoreRest(): void {
    const rest = this.rest;
    if (!rest) return;
    this.rest = undefined;
    this.extend(rest().items);
  }

  /**
   * More passages at the end of the queue: the passage shown, the decisions and the place in
   * the queue stay; a session that had run out of passages goes on with the first of them.
   */
  extend(items: readonly ReviewItem[]): void {
    this.queue.add(items);
    if (!this.current) this.advance();
  }

  /** The passage shown, with its tokens (not serialisable: for the terminal's drawing). */
  get showing(): Current | undefined {
    return this.current;
  }

  get pendingNote(): string | undefined {
    return this.note;
  }

  /** The current template's themes, in template order: what recode and add can name. */
  themes(): ThemeRef[] {
    return this.store.themes();
  }

  act(action: ReviewAction): ActResult {
    this.messages = [];
    const outcome = this.run(action);
    return { outcome, screen: this.screen() };
  }

  private run(a: ReviewAction): Outcome {
    if (a.kind === 'note') {
      this.note = a.text.trim() || undefined;
      return this.say({ kind: 'noted', note: this.note ?? null }, this.note ? 'The note will be kept with your next decision.' : 'No note.');
    }
    if (a.kind === 'undo') return this.undo();
    if (a.kind === 'refresh') return this.refresh();
    if (a.kind === 'previous') return this.previous();
    const cur = this.current;
    if (!cur) return this.refuse('no-passage', 'No passage is waiting: the queue is done.');
    switch (a.kind) {
      case 'next':
        if (!cur.decidedHere) return this.refuse('not-decided', 'Decide this passage first, or defer it.');
        this.queue.done.add(cur.item.passageId);
        this.advance();
        return { kind: 'moved' };
      case 'accept': {
        const c = this.candidate(a.candidate);
        if ('kind' in c) return c;
        return this.afterWrite(this.decideOn(c.suggestionId, 'accept'), (d) => this.stayFor(d, c.suggestionId, 'accepted'));
      }
      case 'reject': {
        const id = a.candidate ?? this.openIds()[0];
        if (id === undefined) return this.refuse('all-decided', 'Every candidate of this passage is decided.');
        const c = this.candidate(id);
        if ('kind' in c) return c;
        return this.afterWrite(this.decideOn(c.suggestionId, 'reject'), (d) => this.stayFor(d, c.suggestionId, 'rejected'));
      }
      case 'recode': {
        const theme = this.theme(a.theme);
        if (!theme) return this.refuse('no-theme', `There is no theme "${a.theme}" in the template.`);
        const open = this.openCandidates();
        if (!open.length) return this.refuse('all-decided', 'Every candidate of this passage is decided.');
        // The chosen theme is one of the open candidates: that is an accept of it, not a re-code.
        // After an accept the passage gets the theme as well (the accepted one stays).
        const same = open.find((c) => c.themeId === theme.id);
        const on = same ?? open[0]!;
        return this.afterWrite(this.decideOn(on.suggestionId, 'accept', same ? undefined : theme.path), (d) => this.stayFor(d, on.suggestionId, 'accepted'));
      }
      case 'add':
        return this.add(a.parent, a.name);
      case 'defer': {
        const top = this.openIds()[0];
        if (top === undefined) return this.refuse('all-decided', 'Every candidate of this passage is decided.');
        return this.afterWrite(this.decideOn(top, 'defer'), (d) => {
          this.queue.deferred.add(cur.item.passageId);
          this.advance();
          return { kind: 'saved', decision: d, then: 'next' };
        });
      }
      case 'nothing': {
        const pid = cur.item.passageId;
        return this.afterWrite(
          this.write(() => this.store.nothingToCode(pid, this.coder, this.note, this.tally.ids)),
          (d) => {
            this.queue.done.add(pid);
            this.advance();
            return { kind: 'saved', decision: d, then: 'next' };
          },
        );
      }
    }
  }

  // ---- the screen model

  screen(): ScreenModel {
    const t = this.tally;
    return {
      coder: this.coder,
      order: this.order,
      filters: [...this.filters],
      passage: this.current ? passageModel(this.current) : null,
      progress: {
        total: this.queue.total,
        left: this.queue.remaining,
        done: this.queue.total - this.queue.remaining,
        accepted: t.count('accept'),
        recoded: t.count('recode'),
        rejected: t.count('reject'),
        deferred: this.queue.deferred.size,
        nothingToCode: t.count('nocode'),
        decided: t.decided,
        undone: t.undos,
      },
      note: this.note ?? null,
      messages: [...this.messages],
    };
  }

  // ---- moving through the queue

  /** Shows the next open passage; passages decided or coded elsewhere meanwhile are passed over. */
  private advance(): void {
    if (this.current) this.history.push(this.current.item);
    for (;;) {
      const item = this.queue.next();
      if (!item) {
        this.current = undefined;
        return;
      }
      const shown = this.load(item);
      if (!shown) {
        this.queue.closed.add(item.passageId);
        continue;
      }
      this.current = shown;
      if (shown.rejected.size + shown.accepted.size >= item.candidates.length) {
        this.queue.done.add(item.passageId);
        continue;
      }
      return;
    }
  }

  /** Reads the passage and its standing decisions afresh; undefined when it is closed to this session. */
  private load(item: ReviewItem): Current | undefined {
    const claim = this.store.claim(item.passageId, this.tally.ids);
    const view = claim ? undefined : this.store.passage(item.passageId);
    if (!view) return undefined;
    const { rejected, accepted } = this.store.standing(item.candidates.map((c) => c.suggestionId));
    return { item, view, rejected, accepted, position: this.queue.positionOf(item.passageId), decidedHere: rejected.size + accepted.size > 0 };
  }

  /** Re-reads the passage shown: decided or coded elsewhere meanwhile, the session moves on. */
  private refresh(): Outcome {
    const cur = this.current;
    if (!cur) return { kind: 'moved' };
    const claim = this.store.claim(cur.item.passageId, this.tally.ids);
    if (claim) {
      const message = claim.kind === 'decision' ? `${cur.item.passageId} was decided meanwhile (by ${claim.coder})` : `${cur.item.passageId} was coded meanwhile (by ${claim.coder})`;
      this.closeAndMove();
      return this.say({ kind: 'conflict', message }, `${message}. On to the next passage.`);
    }
    const again = this.load(cur.item);
    if (again) this.current = again;
    return { kind: 'moved' };
  }

  private previous(): Outcome {
    while (this.history.length) {
      const item = this.history.pop()!;
      if (this.current && item.passageId === this.current.item.passageId) continue;
      const shown = this.load(item);
      if (!shown || shown.rejected.size + shown.accepted.size >= item.candidates.length) continue;
      if (this.current) this.queue.revisit(this.current.item);
      this.queue.revisit(item);
      const before = this.history.length;
      this.current = undefined;
      this.advance();
      this.history.length = before; // going back is not a step forward
      return { kind: 'moved' };
    }
    return this.refuse('no-previous', 'No earlier passage of this session is still open.');
  }

  private closeAndMove(): void {
    if (this.current) this.queue.closed.add(this.current.item.passageId);
    this.advance();
  }

  // ---- candidates and themes

  private openCandidates() {
    const cur = this.current;
    return cur ? cur.item.candidates.filter((c) => !cur.rejected.has(c.suggestionId) && !cur.accepted.has(c.suggestionId)) : [];
  }

  private openIds(): number[] {
    return this.openCandidates().map((c) => c.suggestionId);
  }

  private candidate(suggestionId: number) {
    const cur = this.current!;
    const n = cur.item.candidates.findIndex((c) => c.suggestionId === suggestionId);
    const c = cur.item.candidates[n];
    if (!c) return this.refuse('no-candidate', `Suggestion ${suggestionId} is not a candidate of this passage.`);
    if (cur.rejected.has(c.suggestionId)) return this.refuse('rejected-already', `Candidate ${n + 1} (${c.path}) is rejected already.`);
    if (cur.accepted.has(c.suggestionId)) return this.refuse('accepted-already', `Candidate ${n + 1} (${c.path}) is accepted already.`);
    return c;
  }

  /** A theme by id or path (levels joined by " > "), in the current template. */
  private theme(ref: string): ThemeRef | undefined {
    const themes = this.store.themes();
    const key = ref.trim();
    return themes.find((t) => t.id === key) ?? themes.find((t) => t.path === key) ?? themes.find((t) => t.path.toLowerCase() === key.toLowerCase());
  }

  // ---- writes

  private decideOn(suggestionId: number, action: 'accept' | 'reject' | 'defer', themePath?: string) {
    const pid = this.current!.item.passageId;
    return this.write(() => this.store.decide(pid, { suggestionId, action, themePath, note: this.note, coder: this.coder }, this.tally.ids));
  }

  /** Runs one guarded write; a refusal or a busy study becomes an outcome, other errors go on up. */
  private write<T>(work: () => { ok: true; value: T } | { ok: false; message: string }): { ok: true; value: T } | Outcome {
    try {
      const w = work();
      if (w.ok) return w;
      // Another session got there first: nothing of ours was written; go on.
      this.closeAndMove();
      return this.say({ kind: 'conflict', message: w.message }, `not saved: ${w.message}. On to the next passage.`);
    } catch (e) {
      if (e instanceof UserError) return this.say({ kind: 'refused', reason: 'invalid', message: e.message }, `not saved: ${e.message}`);
      if (isBusy(e)) {
        const message = 'another process has been writing to the study for a while; try again in a moment';
        return this.say({ kind: 'busy', message }, `not saved: ${message}.`);
      }
      throw e;
    }
  }

  private afterWrite(w: { ok: true; value: DecisionRow } | Outcome, then: (d: DecisionRow) => Outcome): Outcome {
    if (!('ok' in w)) return w;
    this.tally.add(w.value);
    this.note = undefined;
    this.messages.push(`saved: ${this.describe(w.value)}`);
    return then(w.value);
  }

  /**
   * After an accept, re-code or reject the passage stays, so that a second or third theme can be
   * accepted or added; with no candidate left open it is done and the session moves on.
   */
  private stayFor(d: DecisionRow, suggestionId: number, as: 'accepted' | 'rejected'): Outcome {
    const cur = this.current!;
    if (as === 'accepted') cur.accepted = new Set([...cur.accepted, suggestionId]);
    else cur.rejected = new Set([...cur.rejected, suggestionId]);
    cur.decidedHere = true;
    if (this.openCandidates().length === 0) {
      this.queue.done.add(cur.item.passageId);
      this.advance();
      this.messages.push(as === 'accepted' ? 'Every candidate is decided: on to the next passage.' : 'Every candidate is rejected: on to the next passage.');
      return { kind: 'saved', decision: d, then: 'next' };
    }
    return { kind: 'saved', decision: d, then: 'stay' };
  }

  private add(parentRef: string | null, rawName: string): Outcome {
    const name = rawName.trim();
    if (!name) return this.refuse('no-name', 'A new theme needs a name.');
    let parentId: string | null = null;
    if (parentRef !== null && parentRef.trim() !== '') {
      const p = this.theme(parentRef);
      if (!p) return this.refuse('no-theme', `There is no theme "${parentRef}" in the template.`);
      parentId = p.id;
    }
    const cur = this.current!;
    const top = this.openCandidates()[0];
    if (!top) return this.refuse('all-decided', 'Every candidate of this passage is decided.');
    const w = this.write(() => this.store.addTheme(cur.item.passageId, { suggestionId: top.suggestionId, parentId, name, note: this.note, coder: this.coder }, this.tally.ids));
    if (!('ok' in w)) return w;
    const { decision, rev, path } = w.value;
    return this.afterWrite({ ok: true, value: decision }, (d) => {
      this.messages.push(`template revision ${rev} adds ${path}`);
      const o = this.stayFor(d, top.suggestionId, 'accepted');
      return o.kind === 'saved' ? { ...o, added: { rev, path } } : o;
    });
  }

  private undo(): Outcome {
    let result: { undo: DecisionRow; undone: DecisionRow };
    try {
      result = this.store.undoLatest(this.coder, this.note);
    } catch (e) {
      if (e instanceof UserError || isBusy(e)) {
        const message = e instanceof UserError ? e.message : 'another process is writing to the study; try again in a moment';
        return this.say({ kind: 'nothing-undone', message }, `nothing undone: ${message}`);
      }
      throw e;
    }
    const { undo, undone } = result;
    this.note = undefined;
    this.tally.undos++;
    this.tally.remove(undone.id);
    this.messages.push(`undone: ${this.describe(undone)} (undo entry #${undo.id})`);
    const cur = this.current;
    if (cur && cur.item.passageId === undone.passage_id) {
      // A decision on the passage shown: it stays, with that candidate open again.
      const { rejected, accepted } = this.store.standing(cur.item.candidates.map((c) => c.suggestionId));
      cur.rejected = rejected;
      cur.accepted = accepted;
      cur.decidedHere = rejected.size + accepted.size > 0;
      return { kind: 'undone', undo, undone, back: 'same' };
    }
    const item =
      (undone.passage_id ? this.queue.item(undone.passage_id) : undefined) ?? (undone.suggestion_id !== null ? this.store.itemFromRun(undone.suggestion_id) : undefined);
    if (!item) return this.say({ kind: 'undone', undo, undone, back: 'gone' }, 'Its passage is no longer in the study.');
    // Back to that passage now; the one shown comes after it.
    if (cur) this.queue.revisit(cur.item);
    this.queue.revisit(item);
    this.current = undefined;
    this.advance();
    const back = (this.current as Current | undefined)?.item.passageId === item.passageId;
    return this.say({ kind: 'undone', undo, undone, back: back ? 'back' : 'taken' }, back ? 'Back to that passage.' : 'That passage has been decided or coded by someone else meanwhile.');
  }

  /** A decision in words, with the theme paths of the template as it is now. */
  describe(d: DecisionRow): string {
    return describeBriefly(d, this.store.template());
  }

  private refuse(reason: Refusal, message: string): Outcome {
    return this.say({ kind: 'refused', reason, message }, message);
  }

  private say(o: Outcome, message: string): Outcome {
    this.messages.push(message);
    return o;
  }
}

/** The serialisable view of what is shown: offsets instead of token arrays. */
function passageModel(cur: Current): PassageModel {
  const { passage, tokens, before, after, passages } = cur.view;
  return {
    id: passage.id,
    transcript: passage.transcript,
    ordinal: passage.ordinal,
    passagesInTranscript: passages,
    position: cur.position,
    speaker: passage.speaker,
    start: passage.start,
    text: tokens.text,
    question: passage.question,
    before: before ? { ...before } : null,
    after: after ? { ...after } : null,
    candidates: cur.item.candidates.map((c, i) => ({
      number: i + 1,
      suggestionId: c.suggestionId,
      themeId: c.themeId,
      path: c.path,
      confidence: c.confidence,
      above: c.above,
      threshold: c.threshold,
      reasons: c.reasons,
      matches: matchOffsets(tokens.lemmas, tokens.spans, termsOf(c.reasons)),
      state: cur.accepted.has(c.suggestionId) ? 'accepted' : cur.rejected.has(c.suggestionId) ? 'rejected' : 'open',
    })),
    decidedHere: cur.decidedHere,
  };
}

/** The terms a candidate's reasons name (the ones a screen marks in the passage). */
export function termsOf(reasons: Reason[]): Set<string> {
  return new Set(reasons.flatMap((r) => (r.kind === 'terms' ? r.terms.map((t) => t.term) : r.kind === 'seeds' ? r.terms : [])));
}

/** Character ranges of the tokens whose lemma is one of the terms, in order, never overlapping. */
export function matchOffsets(lemmas: string[], spans: ArrayLike<number>, terms: Set<string>): { start: number; end: number }[] {
  const out: { start: number; end: number }[] = [];
  let pos = 0;
  for (let i = 0; i < lemmas.length; i++) {
    if (!terms.has(lemmas[i]!)) continue;
    const start = spans[2 * i]!;
    const end = spans[2 * i + 1]!;
    if (start < pos) continue;
    out.push({ start, end });
    pos = end;
  }
  return out;
}

/** SQLite gave up waiting for another process's write (after the busy timeout). */
export function isBusy(e: unknown): boolean {
  return e instanceof Error && 'code' in e && typeof e.code === 'string' && e.code.startsWith('SQLITE_BUSY');
}
