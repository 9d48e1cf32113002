import { UserError } from '../errors.js';
import { resolveOptions, STATE_VERSION, ThemeSuggester } from '../suggest/suggester.js';
import type { PassageSuggestions, SuggesterOptions, ThemeReport } from '../suggest/types.js';
import type { DB } from '../study/db.js';
import { passageTokens } from '../study/passages.js';
import { matchedFragment } from '../text/fragment.js';
import { nothingToCode, rejections } from '../study/decisions.js';
import { currentRevision } from '../study/template.js';
import { loadState, saveState, touchState } from '../study/model-store.js';
import { storeSuggestionRun, type StoredCandidate } from '../study/suggestion-rows.js';
import { inputsKey, modelInputs } from './model-inputs.js';

export type { StoredCandidate } from '../study/suggestion-rows.js';

export interface SuggestRun {
  runId: number;
  rev: number;
  fingerprint: string;
  passages: (Omit<PassageSuggestions, 'candidates'> & { candidates: StoredCandidate[] })[];
  reports: ThemeReport[];
  /** id → path of every current theme */
  paths: Map<string, string>;
}

export interface SuggestOptions extends SuggesterOptions {
  transcripts?: string[];
  /** Return the K best candidates whatever the threshold; default: the chosen ones, else the best. */
  top?: number;
  /** Also suggest for passages that are already coded. */
  includeCoded?: boolean;
  /** Told how far the run is: the step, and the share of it done (0 to 1). */
  progress?: (step: 'fit' | 'score' | 'store', done: number) => void;
}

/**
 * The suggestion model on the study's current codings: the state stored by an earlier fit on
 * exactly these inputs when the study keeps one (scored from it, which gives the same
 * suggestions), otherwise a new fit. `keep()` stores the new state (or marks the stored one used):
 * a command calls it inside its own write, after it has succeeded.
 */
export function fitModel(db: DB, opts: SuggesterOptions = {}, progress?: (done: number) => void) {
  const rev = currentRevision(db);
  if (!rev) throw new UserError('the study has no template yet: run "trellis template set FILE" first');
  const inputs = modelInputs(db);
  const negatives = rejections(db);
  const options = resolveOptions(opts);
  const key = inputsKey(inputs, negatives, options, STATE_VERSION);
  let model: ThemeSuggester | null = null;
  const stored = loadState(db, key);
  if (stored) {
    try {
      model = ThemeSuggester.fromState(stored.state, inputs.themes, inputs.passages, stored.fingerprint);
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
    else saveState(db, key, fitted.state, fitted.fingerprint);
  };
  return { model, inputs, rev, negatives, key, reused, keep };
}

/**
 * `suggest`: fits the profiles, ranks candidate themes for the uncoded participant passages,
 * and stores the run (template revision, model fingerprint) and every candidate it returns.
 */
export function suggest(db: DB, options: SuggestOptions = {}): SuggestRun {
  // (The progress callback is not a model option: options are stored with the run.)
  const { progress, ...opts } = options;
  const { model, inputs, rev, negatives, key, keep } = fitModel(db, opts, progress && ((d) => progress('fit', d)));
  // A theme a coder rejected for a passage is not suggested for it again.
  const rejected = new Set(negatives.map((n) => `${n.passageId}\u0000${n.themeId}`));
  const byId = new Map(inputs.passages.map((p) => [p.id, p]));
  // A passage judged "nothing to code" is done, like a coded one.
  const judged = opts.includeCoded ? new Set<string>() : nothingToCode(db);
  let targets = opts.includeCoded ? inputs.passages.filter((p) => p.role === 'participant').map((p) => p.id) : inputs.uncoded.filter((id) => !judged.has(id));
  if (opts.transcripts?.length) {
    const want = new Set(opts.transcripts);
    targets = targets.filter((id) => want.has(byId.get(id)!.transcript));
  }
  const top = opts.top;
  // Reasons for the best three candidates (and every chosen one): enough to judge at a glance.
  const predicted = model.predict(targets, { reasons: 3, progress: progress && ((d) => progress('score', d)) });
  const kept = predicted.map((p) => {
    const open = rejected.size ? p.candidates.filter((c) => !rejected.has(`${p.passageId}\u0000${c.themeId}`)) : p.candidates;
    // Best first: the themes the hierarchy rule chose (the most specific ones above threshold),
    // then the rest by confidence; a parent's confidence always includes its sub-themes'.
    const chosen = open.filter((c) => c.chosen);
    const ranked = chosen.length ? [...chosen, ...open.filter((c) => !c.chosen)] : open;
    p.unclaimed = chosen.length === 0;
    p.candidates = top ? ranked.slice(0, top) : chosen.length ? chosen : ranked.slice(0, 1);
    return p;
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

  return db.transaction(() => {
    const runId = storeSuggestionRun(db, { rev: rev.rev, fingerprint: model.fingerprint, options: model.options, key }, kept, progress && ((d) => progress('store', d)));
    keep();
    const passages = kept as SuggestRun['passages'];
    const paths = new Map(inputs.themes.map((t) => [t.id, t.path]));
    return { runId, rev: rev.rev, fingerprint: model.fingerprint, passages, reports: model.themeReports(), paths };
  })();
}
