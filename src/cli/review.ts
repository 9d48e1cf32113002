import type { Command } from 'commander';
import { UserError } from '../errors.js';
import { ReviewSession, type Outcome, type ReviewAction } from '../review/session.js';
import type { DecisionRow } from '../study/decisions.js';
import { openStudy, type Study } from '../study/study.js';
import { getPassage } from '../study/passages.js';
import { ORDERS, type ReviewCandidate, type ReviewOrder } from '../review/order.js';
import { sqliteReviewStore } from '../jobs/review-store.js';
import { requireTranscripts } from '../study/transcripts.js';
import { coderName, coderOf, collect, studyCommand, type StudyOpts } from './common.js';
import { useColour } from './marks.js';
import type { Snippets } from './reasons.js';
import { plain, plainDeep } from './output.js';
import { decodeKeys, type Key } from './review-keys.js';
import { MAX_MATCHES, layoutScreen, type Mode, type ScreenModel, type Style } from './review-screen.js';
import { matchThemes, type ThemeEntry } from './review-search.js';

interface ReviewOpts extends StudyOpts {
  coder?: string;
  order: string;
  theme?: string;
  transcript?: string[];
  colour: boolean;
}

export const NEEDS_TERMINAL =
  'review needs a terminal (it reads single keys); in scripts use: trellis decide SUGGESTION_ID accept|reject|defer --coder NAME';

export function registerReview(program: Command): void {
  const cmd = studyCommand(program, 'review', 'go through the suggestions one passage at a time, deciding with single keys');
  // Shared by every study command, but an interactive screen has no JSON to give.
  cmd.options.find((o) => o.long === '--json')?.hideHelp();
  cmd
    .option('--coder <name>', 'who decides (default: $TRELLIS_CODER)', coderName)
    .option('--order <order>', `${ORDERS.join(', ')}`, 'transcript')
    .option('--theme <path>', 'only passages with a candidate of this theme or one of its sub-themes')
    .option('--transcript <name>', 'only these transcripts (repeatable)', collect)
    .option('--no-colour', 'plain text only (also when NO_COLOR is set or TERM=dumb)')
    .addHelpText(
      'after',
      `
Starts with a fresh suggestion run, so the queue reflects the latest codings and decisions,
then shows one passage at a time: where it is, the turns before and after it, the passage with
the matched terms in [brackets], and up to five candidate themes with their confidence, a * when
at or above the theme's threshold, and a reason. The queue holds the passages of the run that
are not coded and have no standing decision. The footer counts as trellis stats does: accepted
out of decided, where a re-code is decided but not accepted and a defer is not yet decided.
When an earlier run's model serves (the same codings and decisions), the first screen comes as
soon as the first transcript is scored; the status line says while the other transcripts are
still being scored, and keys pressed meanwhile are taken, in order, once they are.

Keys (single keys, no Enter):
  1-5    accept that candidate; the passage stays, so a second or third theme can be accepted
  x      reject: then 1-5 for that candidate, or x again for the top one
  r      re-code: search the template by typing, or create a new sub-theme there and then;
         after an accept it adds the theme (the accepted one stays)
  d      defer: the passage is skipped for the rest of this session
  0      reviewed, nothing to code: no theme applies (logged; it leaves the queue)
  n      a note, kept with your next decision
  u      undo your latest standing decision, and go back to its passage
  Enter  after a decision: on to the next passage
  ↑ ↓    scroll a passage longer than the screen
  ?      the keys;   q or Ctrl-C quit;   Esc cancels a prompt

Orders:
  transcript  transcript by transcript, in passage order (the default)
  uncertain   top candidate's confidence nearest its theme's threshold first (0.5 when the
              theme has none): where a decision teaches the model the most
  theme       grouped by the top candidate's theme, in template order (transcript order within)
  confidence  the top candidate's confidence, highest first

Each decision is saved (its own transaction) before the next passage is drawn, and the screen
says so; quitting or a crash loses nothing that the screen confirmed. Suggestions are aids:
the researcher decides what each passage is about.

Examples:
  trellis review --coder alex
  trellis review --coder alex --order uncertain --transcript t05-ward9-fy2
  trellis review --coder alex --theme "Patient safety" --no-colour
In scripts (no terminal), decide one suggestion at a time instead:
  trellis decide 412 accept --coder alex`,
    )
    .action(async (opts: ReviewOpts) => {
      if (!process.stdin.isTTY || !process.stdout.isTTY) throw new UserError(NEEDS_TERMINAL);
      if (opts.json) throw new UserError('review is interactive and has no --json output; for scripts use "trellis suggest --json" and "trellis decide"');
      if (!(ORDERS as readonly string[]).includes(opts.order)) throw new UserError(`--order is one of ${ORDERS.join(', ')} (got "${opts.order}")`);
      const study = openStudy(opts.study);
      try {
        const coder = coderOf(opts, study.db);
        requireTranscripts(study.db, opts.transcript);
        const review = ReviewSession.start(sqliteReviewStore(study), coder, { transcripts: opts.transcript, theme: opts.theme, order: opts.order as ReviewOrder, phased: true }, () =>
          process.stdout.write('Fitting theme profiles and scoring passages...\n'),
        );
        const session = new Session(study, review, {
          colour: opts.colour && useColour(),
          dumb: process.env.TERM === 'dumb',
        });
        const summary = await session.run();
        process.stdout.write(summary + '\n');
      } finally {
        study.close();
      }
    });
}

const SIGNALS = ['SIGTERM', 'SIGHUP', 'SIGINT'] as const;

/** One interactive session: reads keys, acts through the review session (src/review/), redraws. */
class Session {
  private mode: Mode = { kind: 'main' };
  private message = '';
  /** Lines of the current passage scrolled past, and how far it can go on this screen. */
  private scroll = 0;
  private maxScroll = 0;
  private finish = false;
  private readonly snippets: Snippets;

  constructor(
    private readonly study: Study,
    private readonly review: ReviewSession,
    private readonly look: { colour: boolean; dumb: boolean },
  ) {
    const cache = new Map<string, { transcript: string; text: string } | undefined>();
    this.snippets = {
      get: (id) => {
        if (!cache.has(id)) {
          const p = getPassage(study.db, id);
          cache.set(id, p ? { transcript: plain(p.transcript), text: plain(p.text) } : undefined);
        }
        return cache.get(id);
      },
    };
  }

  /** Runs until q or Ctrl-C; resolves with a summary to print after the screen is restored. */
  run(): Promise<string> {
    const stdin = process.stdin;
    const stdout = process.stdout;
    const alt = !this.look.dumb;
    return new Promise((done, fail) => {
      // Keys pressed while the other transcripts are scored wait, and are then taken in order.
      let waiting: (Buffer | string)[] | null = null;
      const onData = (chunk: Buffer | string) => {
        if (waiting) {
          waiting.push(chunk);
          return;
        }
        try {
          for (const key of decodeKeys(chunk.toString())) {
            this.handle(key);
            if (this.finish) break;
          }
          if (!this.finish) this.draw();
        } catch (e) {
          // Not the coder's doing: restore the terminal, then report it as an internal error.
          restore();
          return fail(e);
        }
        if (this.finish) {
          restore();
          done(this.summary());
        }
      };
      const onResize = () => this.draw();
      const onSignal = (signal: NodeJS.Signals) => {
        // The terminal is gone: nothing to restore or print to. Every decision is committed.
        if (signal === 'SIGHUP') process.exit(0);
        restore();
        done(this.summary());
      };
      const restore = () => {
        stdin.off('data', onData);
        stdout.off('resize', onResize);
        for (const s of SIGNALS) process.off(s, onSignal);
        if (stdin.isTTY) stdin.setRawMode(false);
        stdin.pause();
        if (alt) stdout.write('\x1b[?25h\x1b[?1049l');
      };
      stdin.setRawMode(true);
      stdin.setEncoding('utf8');
      stdin.on('data', onData);
      stdout.on('resize', onResize);
      for (const s of SIGNALS) process.on(s, onSignal);
      // The other screen of the terminal: the coder's scrollback is left as it was.
      if (alt) stdout.write('\x1b[?1049h\x1b[?25l');
      try {
        if (this.review.queue.total === 0 && !this.review.scoring) this.message = 'No passage is waiting: every suggested passage is coded or decided.';
        this.draw();
      } catch (e) {
        restore();
        return fail(e);
      }
      stdin.resume();
      if (!this.review.scoring) return;
      // The first screen is on the terminal (the write's callback) before the slow part starts.
      waiting = [];
      stdout.write('', () =>
        setImmediate(() => {
          try {
            this.review.scoreRest();
            this.draw();
          } catch (e) {
            restore();
            return fail(e);
          }
          const keys = waiting ?? [];
          waiting = null;
          for (const chunk of keys) {
            if (this.finish) break;
            onData(chunk);
          }
        }),
      );
    });
  }

  private style(): Style {
    const cols = process.stdout.columns || Number(process.env.COLUMNS) || 80;
    return { ...this.look, width: Math.max(40, Math.min(cols, 120) - 1), rows: process.stdout.rows || undefined };
  }

  private matches(): ThemeEntry[] {
    return this.mode.kind === 'search' ? matchThemes(this.mode.entries, this.mode.query).slice(0, MAX_MATCHES) : [];
  }

  private draw(): void {
    const r = this.review;
    const m: ScreenModel = {
      coder: r.coder,
      order: r.order,
      filters: r.filters,
      showing: r.showing,
      total: r.queue.total,
      remaining: r.queue.remaining,
      scoring: r.scoring,
      accepted: r.tally.accepted,
      decided: r.tally.decided,
      deferred: r.queue.deferred.size,
      message: this.message,
      note: r.pendingNote,
      mode: this.mode,
      matches: this.matches(),
      snippets: this.snippets,
      scroll: this.scroll,
    };
    // Passage text, names and reasons come from files: shown as text, never as terminal commands.
    const { screen, maxScroll } = layoutScreen({ ...plainDeep(m), snippets: this.snippets }, this.style());
    this.maxScroll = maxScroll;
    this.scroll = Math.min(this.scroll, maxScroll);
    // Clear and draw in one write; a dumb terminal gets the screens one after another.
    process.stdout.write(this.look.dumb ? '\n\n' + screen + '\n' : '\x1b[H\x1b[2J' + screen);
  }

  private summary(): string {
    const t = this.review.tally;
    const parts = [`${t.count('accept')} accepted`, `${t.count('recode')} re-coded`, `${t.count('reject')} rejected`, `${t.count('defer')} deferred`, `${t.count('nocode')} nothing to code`, `${t.undos} undone`];
    const pct = t.decided ? ` (${Math.round((100 * t.accepted) / t.decided)}%)` : '';
    return (
      `Review ended. This session: ${parts.join(', ')}.\n` +
      `Suggestions accepted: ${t.accepted} of ${t.decided} decided${pct} (a re-code is decided, not accepted). Every decision is in the log: trellis log --study ${this.study.dir}`
    );
  }

  // ---- acting through the review session

  /** One action; when the passage on screen changes, back to the main keys at its top. */
  private act(action: ReviewAction): Outcome {
    const before = this.review.showing;
    const { outcome } = this.review.act(action);
    if (this.review.showing !== before) {
      this.mode = { kind: 'main' };
      this.scroll = 0;
    }
    return outcome;
  }

  private openCandidates(): ReviewCandidate[] {
    const cur = this.review.showing;
    return cur ? cur.item.candidates.filter((c) => !cur.rejected.has(c.suggestionId) && !cur.accepted.has(c.suggestionId)) : [];
  }

  private saved(d: DecisionRow): string {
    return `saved: ${this.review.describe(d)}`;
  }

  /** The line for an action that wrote nothing; undefined when it was saved. */
  private failure(o: Outcome): string | undefined {
    switch (o.kind) {
      case 'conflict':
        // Another session got there first: nothing of ours was written; the session moved on.
        return `not saved: ${o.message}. On to the next passage.`;
      case 'busy':
        return 'not saved: another process has been writing to the study for a while; press the key again in a moment.';
      case 'refused':
        return `not saved: ${o.message}`;
      default:
        return undefined;
    }
  }

  // ---- keys

  private handle(key: Key): void {
    if (key.name === 'ctrl-c') return this.quit();
    switch (this.mode.kind) {
      case 'help':
        this.mode = { kind: 'main' };
        return;
      case 'reject':
        return this.onReject(key);
      case 'note':
        return this.onNote(key, this.mode);
      case 'search':
        return this.onSearch(key, this.mode);
      case 'name':
        return this.onName(key, this.mode);
      case 'main':
        return this.onMain(key);
    }
  }

  /** A prompt replaces the last outcome line, which would only distract from it. */
  private enter(mode: Mode): void {
    this.mode = mode;
    this.message = '';
  }

  private quit(): void {
    this.finish = true;
  }

  private onMain(key: Key): void {
    const ch = key.name === 'char' ? key.char : '';
    if (ch === 'q' || key.name === 'ctrl-d') return this.quit();
    if (ch === '?') return this.enter({ kind: 'help' });
    if (ch === 'u') return this.undo();
    if (key.name === 'escape') {
      this.message = '';
      return;
    }
    const cur = this.review.showing;
    if (!cur) {
      this.message = 'The queue is done: u undoes your latest decision, q quits.';
      return;
    }
    if (key.name === 'up' || key.name === 'down') {
      if (!this.maxScroll) this.message = 'The whole passage is on the screen.';
      else this.scroll = Math.max(0, Math.min(this.maxScroll, this.scroll + (key.name === 'down' ? 1 : -1)));
      return;
    }
    if (/^[1-9]$/.test(ch)) return this.accept(Number(ch));
    if (ch === 'x') return this.enter({ kind: 'reject' });
    if (ch === 'd') return this.defer();
    if (ch === '0') return this.nothingToCode();
    if (ch === 'n') return this.enter({ kind: 'note', text: this.review.pendingNote ?? '' });
    if (ch === 'r') return this.enter({ kind: 'search', purpose: 'recode', query: '', sel: 0, entries: this.themeEntries() });
    if (key.name === 'enter' || ch === ' ') {
      if (cur.decidedHere) {
        this.act({ kind: 'next' });
        this.message = '';
      } else this.message = 'Decide first (1-5 accept, x reject, r re-code, 0 nothing to code), or d to defer it.';
      return;
    }
    this.message = `"${ch || key.name}" is not a key here: press ? for the keys.`;
  }

  private candidate(n: number): ReviewCandidate | undefined {
    const cur = this.review.showing!;
    const c = cur.item.candidates[n - 1];
    if (!c) {
      this.message = `There is no candidate ${n} for this passage.`;
      return undefined;
    }
    if (cur.rejected.has(c.suggestionId)) {
      this.message = `Candidate ${n} (${c.path}) is rejected already; u undoes that.`;
      return undefined;
    }
    if (cur.accepted.has(c.suggestionId)) {
      this.message = `Candidate ${n} (${c.path}) is accepted already; u undoes that.`;
      return undefined;
    }
    return c;
  }

  private accept(n: number): void {
    const c = this.candidate(n);
    if (c) this.accepted(this.act({ kind: 'accept', candidate: c.suggestionId }));
  }

  /**
   * After an accept or a re-code the passage stays on screen, so that a second or third theme
   * can be accepted or added; the researcher moves on with Enter. With no candidate left open
   * the session has moved on by itself.
   */
  private accepted(o: Outcome, saved?: string): void {
    if (o.kind !== 'saved') {
      this.message = this.failure(o) ?? '';
      return;
    }
    this.message =
      (saved ?? this.saved(o.decision)) +
      (o.then === 'next' ? '. Every candidate is decided: on to the next passage.' : '. Accept another, r to add a theme, or Enter for the next passage.');
  }

  private reject(n: number): void {
    const c = this.candidate(n);
    if (!c) return;
    const o = this.act({ kind: 'reject', candidate: c.suggestionId });
    if (o.kind !== 'saved') {
      this.message = this.failure(o) ?? '';
      return;
    }
    this.message =
      this.saved(o.decision) + (o.then === 'next' ? '. Every candidate is rejected: on to the next passage.' : '. Decide another candidate, or Enter for the next passage.');
  }

  /** Defer, or "reviewed, nothing to code" (no theme applies): the passage is done, on to the next. */
  private defer(): void {
    const o = this.act({ kind: 'defer' });
    this.message = o.kind === 'saved' ? this.saved(o.decision) : (this.failure(o) ?? '');
  }

  private nothingToCode(): void {
    // After rejecting candidates, the coder may judge that no theme applies at all.
    const o = this.act({ kind: 'nothing' });
    this.message = o.kind === 'saved' ? this.saved(o.decision) : (this.failure(o) ?? '');
  }

  private onReject(key: Key): void {
    this.mode = { kind: 'main' };
    const ch = key.name === 'char' ? key.char : '';
    if (key.name === 'escape') {
      this.message = 'Reject cancelled.';
      return;
    }
    if (/^[1-9]$/.test(ch)) return this.reject(Number(ch));
    if (ch === 'x' || key.name === 'enter') {
      const top = this.openCandidates()[0]!;
      return this.reject(this.review.showing!.item.candidates.indexOf(top) + 1);
    }
    this.message = 'Reject cancelled (press x, then 1-5 or x).';
  }

  private onNote(key: Key, mode: Extract<Mode, { kind: 'note' }>): void {
    if (key.name === 'escape') {
      this.mode = { kind: 'main' };
      this.message = 'Note cancelled.';
    } else if (key.name === 'enter') {
      this.act({ kind: 'note', text: mode.text });
      this.mode = { kind: 'main' };
      this.message = this.review.pendingNote ? 'The note will be kept with your next decision.' : 'No note.';
    } else editLine(mode, key);
  }

  // ---- re-coding

  private themeEntries(): ThemeEntry[] {
    return this.review.themes();
  }

  private onSearch(key: Key, mode: Extract<Mode, { kind: 'search' }>): void {
    const matches = this.matches();
    const rows = matches.length + 1; // the last row: a new theme
    if (key.name === 'escape') {
      this.mode = { kind: 'main' };
      this.message = mode.purpose === 'recode' ? 'Re-code cancelled.' : 'New theme cancelled.';
      return;
    }
    if (key.name === 'up') mode.sel = (mode.sel + rows - 1) % rows;
    else if (key.name === 'down') mode.sel = (mode.sel + 1) % rows;
    else if (key.name === 'backspace') {
      mode.query = mode.query.slice(0, -1);
      mode.sel = 0;
    } else if (key.name === 'ctrl-u') {
      mode.query = '';
      mode.sel = 0;
    } else if (key.name === 'enter') this.chooseRow(mode, matches, mode.sel);
    else if (key.name === 'char') {
      if (/^[1-9]$/.test(key.char)) {
        const i = Number(key.char) - 1;
        if (i < matches.length) this.chooseRow(mode, matches, i);
        else this.message = `There is no theme ${key.char} in the list.`;
      } else if (key.char === '+') this.chooseRow(mode, matches, matches.length);
      else {
        mode.query += key.char;
        mode.sel = 0;
      }
    }
  }

  private chooseRow(mode: Extract<Mode, { kind: 'search' }>, matches: ThemeEntry[], row: number): void {
    const e = matches[row];
    if (mode.purpose === 'recode') {
      if (e) return this.recodeTo(e);
      // "Create a new sub-theme here": its parent is found by the same search; a query that
      // matched no theme is offered as the name.
      this.mode = { kind: 'search', purpose: 'parent', query: '', sel: 0, entries: mode.entries, preset: matches.length ? '' : mode.query.trim() };
      return;
    }
    this.mode = { kind: 'name', parentId: e ? e.id : null, parentPath: e ? e.path : null, text: mode.preset ?? '' };
  }

  private recodeTo(e: ThemeEntry): void {
    this.mode = { kind: 'main' };
    if (!this.openCandidates().length) {
      this.message = 'Every candidate of this passage is decided: Enter for the next passage (u undoes).';
      return;
    }
    // An open candidate's own theme is an accept of it; after an accept the theme is added.
    this.accepted(this.act({ kind: 'recode', theme: e.id }));
  }

  private onName(key: Key, mode: Extract<Mode, { kind: 'name' }>): void {
    if (key.name === 'escape') {
      this.mode = { kind: 'main' };
      this.message = 'New theme cancelled.';
      return;
    }
    if (key.name !== 'enter') return editLine(mode, key);
    const name = mode.text.trim();
    if (!name) {
      this.message = 'Type a name for the new theme (or Esc to cancel).';
      return;
    }
    if (!this.openCandidates().length) {
      this.mode = { kind: 'main' };
      this.message = 'Every candidate of this passage is decided: Enter for the next passage (u undoes).';
      return;
    }
    const o = this.act({ kind: 'add', parent: mode.parentId, name });
    if (o.kind !== 'saved') {
      this.message = this.failure(o) ?? '';
      // A bad name (a clash, say) or a busy study: stay in the prompt so it can be tried again.
      if (o.kind !== 'conflict') return;
      this.mode = { kind: 'main' };
      return;
    }
    this.mode = { kind: 'main' };
    this.accepted(o, `saved: template revision ${o.added?.rev} adds ${o.added?.path}; ${this.review.describe(o.decision)}`);
  }

  // ---- undo

  private undo(): void {
    const o = this.act({ kind: 'undo' });
    if (o.kind === 'nothing-undone') {
      this.message = `nothing undone: ${o.message}`;
      return;
    }
    if (o.kind !== 'undone') return;
    const what = `undone: ${this.review.describe(o.undone)} (undo entry #${o.undo.id})`;
    const tail: Record<typeof o.back, string> = {
      same: '',
      gone: '; its passage is no longer in the study.',
      back: '; back to that passage.',
      taken: '; that passage has been decided or coded by someone else meanwhile.',
    };
    this.message = what + tail[o.back];
  }
}

/** Line editing for the note and name prompts. */
function editLine(mode: { text: string }, key: Key): void {
  if (key.name === 'backspace') mode.text = mode.text.slice(0, -1);
  else if (key.name === 'ctrl-u') mode.text = '';
  else if (key.name === 'char') mode.text += key.char;
}
