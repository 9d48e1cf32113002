import { UserError } from '../errors.js';
import { resolveOptions, STATE_VERSION, ThemeSuggester, type SuggesterState } from '../suggest/suggester.js';
import { decodeState, encodeState } from '../suggest/state-codec.js';
import type { ModelPassage, PassageSuggestions, SuggesterOptions, ThemeReport } from '../suggest/types.js';
import type { DB } from '../study/db.js';
import { passageTokens } from '../study/passages.js';
import { matchedFragment } from '../text/fragment.js';
import { nothingToCode, rejections } from '../study/decisions.js';
import { currentRevision } from '../study/template.js';
import { loadState, saveState, touchState } from '../study/model-store.js';
import { addToSuggestionRun, storeSuggestionRun, type StoredCandidate } from '../study/suggestion-rows.js';
import { inputsKey, modelInputs, type ModelInputs } from './model-inputs.js';

export type { StoredCandidate } from '../study/suggestion-rows.js';

export interface SuggestRun {
  runId: number;
  rev: number;
  fingerprint: string;
  passages: (Omit<PassageSuggestions, 'candidates'> & { candidates: StoredCandidate[] })[];
  reports: ThemeReport[];
  /** id → path of every current theme */
  paths: Map<string, string>;
  /**
   * With `firstUntil`, when transcripts are left: scores them, stores them into this same run
   * and returns their passages (once; slow, like a whole run).
   */
  rest?: () => SuggestRun['passages'];
}

export interface SuggestOptions extends SuggesterOptions {
  transcripts?: string[];
  /** Return the K best candidates whatever the threshold; default: the chosen ones, else the best. */
  top?: number;
  /** Also suggest for passages that are already coded. */
  includeCoded?: boolean;
  /** Told how far the run is: the step, and the share of it done (0 to 1). */
  progress?: (step: 'fit' | 'score' | 'store', done: number) => void;
  /**
   * Score and store transcript by transcript, in study order, until this says the passages
   * stored so far are enough; the others are left to `SuggestRun.rest()`. Only when a stored
   * state serves (a new fit scores every passage anyway); the run ends the same either way.
   */
  firstUntil?: (passages: SuggestRun['passages']) => boolean;
  /** The most passages a part of a run scored from a stored state holds (default PART_PASSAGES). */
  partPassages?: number;
}

/**
 * The suggestion model on the study's current codings: the state stored by an earlier fit on
 * exactly these inputs when the study keeps one (scored from it, which gives the same
 * suggestions), otherwise a new fit. `keep()` stores the new state (or marks the stored one used):
 * a command calls it inside its own write, after it has succeeded.
 *
 * With `only`, a stored state scores just the passages it picks (whole transcripts, in study
 * order), and `scorer` scores any others later from the same state; a new fit scores them all.
 */
export function fitModel(db: DB, opts: SuggesterOptions = {}, progress?: (done: number) => void, only?: (inputs: ModelInputs) => ModelPassage[]) {
  const rev = currentRevision(db);
  if (!rev) throw new UserError('the study has no template yet: run "trellis template set FILE" first');
  const inputs = modelInputs(db);
  const negatives = rejections(db);
  const options = resolveOptions(opts);
  const key = inputsKey(inputs, negatives, options, STATE_VERSION);
  let model: ThemeSuggester | null = null;
  let scorer: ((passages: ModelPassage[]) => ThemeSuggester) | null = null;
  const stored = loadState(db, key);
  if (stored) {
    try {
      const state = decodeState<SuggesterState>(stored.bytes);
      const fp = stored.fingerprint; // (the closure keeps the state, not the bytes it came from)
      const from = (passages: ModelPassage[]) => ThemeSuggester.fromState(state, inputs.themes, passages, fp, { again: only !== undefined });
      model = from(only ? only(inputs) : inputs.passages);
      if (only) scorer = from;
    } catch {
      model = null; // a state this build cannot read: fit again
    }
  }
  const reused = model !== null;
  if (model) progress?.(1);
  else model = new ThemeSuggester(opts).fit(inputs.passages, inputs.codings, inputs.themes, { negatives, progress });
  const fitted = model;
  const keep = () => {
    if (reused) touchState(db, key);
    else saveState(db, key, encodeState(fitted.state), fitted.fingerprint);
  };
  return { model, inputs, rev, negatives, key, reused, keep, scorer };
}

/**
 * `suggest`: fits the profiles, ranks candidate themes for the uncoded participant passages,
 * and stores the run (template revision, model fingerprint) and every candidate it returns.
 */
export function suggest(db: DB, options: SuggestOptions = {}): SuggestRun {
  // (The progress callback is not a model option: options are stored with the run.)
  const { progress, firstUntil, partPassages = PART_PASSAGES, ...opts } = options;
  // The passages to suggest for, read once from the model's inputs.
  let targets: string[] | null = null;
  const targetsOf = (inputs: ModelInputs): string[] => {
    if (targets) return targets;
    // A passage judged "nothing to code" is done, like a coded one.
    const judged = opts.includeCoded ? new Set<string>() : nothingToCode(db);
    let t = opts.includeCoded ? inputs.passages.filter((p) => p.role === 'participant').map((p) => p.id) : inputs.uncoded.filter((id) => !judged.has(id));
    if (opts.transcripts?.length) {
      const want = new Set(opts.transcripts);
      const byId = new Map(inputs.passages.map((p) => [p.id, p]));
      t = t.filter((id) => want.has(byId.get(id)!.transcript));
    }
    return (targets = t);
  };
  // In parts: the transcripts that hold a target, in study order, each scored whole.
  let parts: TranscriptPart[] = [];
  const firstPart = (inputs: ModelInputs) => {
    parts = transcriptParts(inputs.passages, targetsOf(inputs));
    return parts.length ? parts[0]!.passages : [];
  };
  const { model, inputs, rev, negatives, key, keep, scorer } = fitModel(db, opts, progress && ((d) => progress('fit', d)), firstPart);
  // A theme a coder rejected for a passage is not suggested for it again.
  const rejected = new Set(negatives.map((n) => `${n.passageId}\u0000${n.themeId}`));
  const reports = model.themeReports();
  const paths = new Map(inputs.themes.map((t) => [t.id, t.path]));
  const result = (runId: number, passages: SuggestRun['passages']): SuggestRun => ({ runId, rev: rev.rev, fingerprint: model.fingerprint, passages, reports, paths });
  const meta = { rev: rev.rev, fingerprint: model.fingerprint, options: model.options, key };

  if (!scorer) {
    const kept = rankAndExplain(db, model, targetsOf(inputs), rejected, opts.top, progress);
    // Every prediction is made: the scores' memory is given back before the run is stored.
    model.dropScores();
    return db.transaction(() => {
      const runId = storeSuggestionRun(db, meta, kept, progress && ((d) => progress('store', d)));
      keep();
      return result(runId, kept as SuggestRun['passages']);
    })();
  }

  // From a stored state, in parts of whole transcripts: one transcript, then twice as many each
  // time, up to PART_PASSAGES passages, each stored as it is scored (the suggestion ids follow
  // the order a whole run gives them). A large batch's every passage x theme is then never held
  // at once (about 220 MB at 20,000 answers), and a reviewer's first screen comes
  // after the first part, when firstUntil has enough. Without firstUntil every part goes into
  // one write: the run is stored whole or not at all.
  const total = parts.reduce((a, p) => a + p.targets.length, 0);
  let runId = 0;
  let done = 0;
  let scored = 0;
  let size = 1;
  let next: ThemeSuggester | null = model;
  const step = (report?: SuggestOptions['progress']): SuggestRun['passages'] => {
    let end = done + 1;
    let n = parts[done]!.passages.length;
    while (end < parts.length && end - done < size && n + parts[end]!.passages.length <= partPassages) n += parts[end++]!.passages.length;
    const part = parts.slice(done, end);
    const m = next ?? scorer(part.flatMap((p) => p.passages));
    next = null;
    const kept = rankAndExplain(db, m, part.flatMap((p) => p.targets), rejected, opts.top) as SuggestRun['passages'];
    if (done === 0) {
      runId = storeSuggestionRun(db, meta, kept);
      keep();
    } else addToSuggestionRun(db, runId, kept);
    done = end;
    size *= 2;
    scored += kept.length;
    report?.('score', total ? scored / total : 1);
    return kept;
  };
  if (!parts.length) {
    return db.transaction(() => {
      const id = storeSuggestionRun(db, meta, []);
      keep();
      return result(id, []);
    })();
  }
  if (!firstUntil) {
    return db.transaction(() => {
      const all: SuggestRun['passages'] = [];
      while (done < parts.length) for (const p of step(progress)) all.push(p);
      progress?.('store', 1);
      return result(runId, all);
    })();
  }
  const first: SuggestRun['passages'] = [];
  while (done < parts.length) {
    for (const p of db.transaction(() => step())()) first.push(p);
    if (firstUntil(first)) break;
  }
  const run = result(runId, first);
  if (done < parts.length) {
    let called = false;
    run.rest = () => {
      if (called) return [];
      called = true;
      return db.transaction(() => {
        const rest: SuggestRun['passages'] = [];
        while (done < parts.length) for (const p of step(progress)) rest.push(p);
        progress?.('store', 1);
        return rest;
      })();
    };
  }
  return run;
}

/** The most passages a part of a run scored from a stored state holds (a transcript longer than this is one part). */
const PART_PASSAGES = 2000;

/** A transcript's passages (all of them: context reads a passage's neighbours) and the ones to suggest for. */
interface TranscriptPart {
  passages: ModelPassage[];
  targets: string[];
}

/** The transcripts holding a target, in study order. */
function transcriptParts(passages: ModelPassage[], targets: string[]): TranscriptPart[] {
  const want = new Set(targets);
  const out: TranscriptPart[] = [];
  let cur: TranscriptPart | null = null;
  let last: string | null = null;
  for (const p of passages) {
    if (p.transcript !== last) {
      last = p.transcript;
      cur = { passages: [], targets: [] };
      out.push(cur);
    }
    cur!.passages.push(p);
    if (want.has(p.id)) cur!.targets.push(p.id);
  }
  return out.filter((t) => t.targets.length > 0);
}

/** The ranked candidates of these passages, with reasons and the stretch of text they come from. */
function rankAndExplain(db: DB, model: ThemeSuggester, targets: string[], rejected: Set<string>, top: number | undefined, progress?: SuggestOptions['progress']) {
  // Reasons for the best three candidates (and every chosen one): enough to judge at a glance.
  // Each passage is cut to the candidates the run keeps as it is scored, so a large batch never
  // holds every theme's candidate for every passage at once.
  const kept = model.predict(targets, {
    reasons: 3,
    progress: progress && ((d) => progress('score', d)),
    shape: (p) => {
      const open = rejected.size ? p.candidates.filter((c) => !rejected.has(`${p.passageId}\u0000${c.themeId}`)) : p.candidates;
      // Best first: the themes the hierarchy rule chose (the most specific ones above threshold),
      // then the rest by confidence; a parent's confidence always includes its sub-themes'.
      const chosen = open.filter((c) => c.chosen);
      const ranked = chosen.length ? [...chosen, ...open.filter((c) => !c.chosen)] : open;
      p.unclaimed = chosen.length === 0;
      p.candidates = top ? ranked.slice(0, top) : chosen.length ? chosen : ranked.slice(0, 1);
      return p;
    },
  });

  // Distinctive terms as each passage writes them, and the stretch of it they come from.
  const tokens = passageTokens(db, kept.filter((p) => p.candidates.some((c) => c.reasons.some((r) => r.kind === 'terms'))).map((p) => p.passageId));
  for (const p of kept) {
    const tk = tokens.get(p.passageId);
    if (!tk) continue;
    for (const c of p.candidates) {
      for (const r of c.reasons) {
        if (r.kind !== 'terms') continue;
        const f = matchedFragment(tk.text, tk.lemmas, tk.spans, r.terms.map((t) => t.term));
        for (const t of r.terms) if (f.written[t.term]) t.written = f.written[t.term];
        if (f.fragment) r.fragment = f.fragment;
      }
    }
  }
  return kept;
}
