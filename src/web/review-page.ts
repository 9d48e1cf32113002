/** The review screen: one passage large in the middle, its candidates as buttons beneath, keys shown. */
import { NO_SNIPPETS, reasonText } from '../review/reasons.js';

const num = (n: number) => n.toFixed(2);
import { esc } from './layout.js';
import type { CandidateModel, TurnModel } from '../review/session.js';
import type { ReviewView } from './session.js';

/** Confidence in words as well as a number, so it reads without knowing the scale. */
export function confidenceWords(c: number): string {
  if (c >= 0.8) return 'very likely';
  if (c >= 0.6) return 'likely';
  if (c >= 0.4) return 'possible';
  if (c >= 0.2) return 'unlikely';
  return 'very unlikely';
}


/** The passage with the terms each open candidate matched marked and numbered (not by colour). */
export function markedText(text: string, candidates: CandidateModel[]): string {
  const spans: { start: number; end: number; n: number }[] = [];
  for (const c of candidates) {
    if (c.state === 'rejected') continue;
    for (const m of c.matches) if (!spans.some((s) => m.start < s.end && m.end > s.start)) spans.push({ ...m, n: c.number });
  }
  spans.sort((a, b) => a.start - b.start);
  let out = '';
  let at = 0;
  for (const s of spans) {
    out += esc(text.slice(at, s.start)) + `<mark>${esc(text.slice(s.start, s.end))}<sup class="tag" aria-label="matched for candidate ${s.n}">${s.n}</sup></mark>`;
    at = s.end;
  }
  return out + esc(text.slice(at));
}

const kbd = (k: string) => `<kbd>${esc(k)}</kbd>`;

function candidateRow(c: CandidateModel): string {
  const n = c.number;
  const pct = Math.round(c.confidence * 100);
  const state = c.state === 'open' ? '' : `<p class="state">${c.state === 'accepted' ? '✓ Accepted: the passage is coded to this theme.' : '✗ Rejected.'}</p>`;
  const buttons =
    c.state === 'open'
      ? `<button type="submit" name="act" value="accept:${c.suggestionId}" data-key="${n}" class="accept">Accept ${kbd(String(n))}</button>
<button type="submit" name="act" value="reject:${c.suggestionId}" data-key="x ${n}" class="reject">Reject ${kbd(`x ${n}`)}</button>`
      : '';
  return `<li class="candidate ${c.state}" data-suggestion="${c.suggestionId}">
<div class="cand-head"><span class="cand-n" aria-hidden="true">${n}</span>
<h3 class="theme">${esc(c.path)}</h3>
<p class="conf"><strong>${num(c.confidence)}</strong> · ${confidenceWords(c.confidence)} (${pct} in 100)${c.above ? ', above its threshold' : ', below its threshold'}</p></div>
<ul class="reasons" aria-label="Why ${esc(c.path)}">${c.reasons.map((r) => `<li>${esc(reasonText(r, NO_SNIPPETS))}</li>`).join('')}</ul>
${state}
<div class="cand-actions">${buttons}</div>
</li>`;
}

function turn(label: string, t: TurnModel | null): string {
  if (!t) return '';
  return `<div class="turn"><p class="speaker">${esc(label)}${t.speaker ? `: ${esc(t.speaker)}` : ''}</p><p>${esc(t.text)}</p></div>`;
}

export function reviewPage(v: ReviewView): string {
  const p = v.screen.passage;
  const g = v.screen.progress;
  const status = `<p class="progress" role="status">${p ? `Passage ${p.position ?? '(brought back)'} of ${g.total} in this session · ${g.left} left` : 'Queue done'} · accepted ${g.accepted} of ${g.decided} decided</p>`;
  const message = v.message ? `<p class="message" role="alert">${esc(v.message)}</p>` : '';
  const note = v.screen.note ? `<p class="pending">Note waiting for your next decision: ${esc(v.screen.note)}</p>` : '';
  const themes = `<datalist id="themes">${v.themes.map((t) => `<option value="${esc(t.path)}"></option>`).join('')}</datalist>`;
  const undo = `<form method="post" action="/review" class="inline"><button type="submit" name="act" value="undo" data-key="u">Undo my latest decision ${kbd('u')}</button></form>`;
  if (!p) {
    return `${status}${message}<section class="done"><p>No passage is waiting for a decision. Start a fresh queue after importing or coding more, or to see passages you passed over.</p>
<form method="post" action="/review" class="inline"><button type="submit" name="act" value="restart">Start a fresh queue</button></form>${undo}</section>`;
  }
  const question = p.question ? `<p class="question"><span class="label">Interviewer's question</span> ${esc(p.question)}</p>` : '';
  const when = p.start !== null ? ` · at ${Math.floor(p.start / 60)}:${String(Math.floor(p.start % 60)).padStart(2, '0')}` : '';
  return `${status}${message}${note}
<article class="passage" aria-labelledby="passage-head">
<p id="passage-head" class="where">${esc(p.transcript)} · passage ${p.ordinal} of ${p.passagesInTranscript}${when} · <span class="pid">${esc(p.id)}</span></p>
${question}
${turn('Before', p.before)}
<div class="this-turn"><p class="speaker">${esc(p.speaker ?? 'Participant')}</p><p class="text">${markedText(p.text, p.candidates)}</p></div>
${turn('After', p.after)}
</article>
<form method="post" action="/review" id="decide">
<section aria-labelledby="cands-head"><h2 id="cands-head">Candidate themes</h2>
<p class="hint">Suggestions are aids; you decide. Accepting keeps you on this passage so you can add a second theme.</p>
<ol class="candidates">${p.candidates.map((c) => candidateRow(c)).join('')}</ol>
</section>
<section class="moves" aria-label="The passage">
<button type="submit" name="act" value="nothing" data-key="0">Nothing to code ${kbd('0')}</button>
<button type="submit" name="act" value="defer" data-key="d">Defer ${kbd('d')}</button>
<button type="submit" name="act" value="previous" data-key="k">Previous ${kbd('k')}</button>
<button type="submit" name="act" value="next" data-key="j" class="next">Next passage ${kbd('j')}</button>
<button type="submit" name="act" value="undo" data-key="u">Undo ${kbd('u')}</button>
</section>
</form>
<section class="other" aria-label="Another theme, notes and memos">
<form method="post" action="/review" class="row"><label for="recode">Code to another theme ${kbd('r')}</label>
<input id="recode" name="path" list="themes" autocomplete="off" data-focus-key="r" placeholder="type to search the template">
<button type="submit" name="act" value="recode">Code</button></form>
<form method="post" action="/review" class="row"><label for="subname">New theme ${kbd('s')}</label>
<input id="subname" name="name" autocomplete="off" data-focus-key="s" placeholder="its name">
<label for="subparent">under</label><input id="subparent" name="parent" list="themes" autocomplete="off" placeholder="(top level)">
<button type="submit" name="act" value="new-theme">Add and code</button></form>
<form method="post" action="/review" class="row"><label for="note">Note for the log ${kbd('n')}</label>
<input id="note" name="text" autocomplete="off" data-focus-key="n" placeholder="kept with your next decision">
<button type="submit" name="act" value="note">Keep note</button></form>
<form method="post" action="/review" class="row"><label for="memo">Memo on this passage ${kbd('m')}</label>
<textarea id="memo" name="text" rows="2" data-focus-key="m"></textarea>
<button type="submit" name="act" value="memo">Save memo</button></form>
${themes}
</section>
<details class="keys"><summary>All keys ${kbd('?')}</summary>
<dl><dt>${kbd('1')}–${kbd('9')}</dt><dd>accept that candidate</dd><dt>${kbd('x')} then a number</dt><dd>reject that candidate</dd>
<dt>${kbd('r')}</dt><dd>code to another theme (type, then Enter)</dd><dt>${kbd('s')}</dt><dd>new theme on the spot</dd>
<dt>${kbd('0')}</dt><dd>nothing to code</dd><dt>${kbd('d')}</dt><dd>defer</dd><dt>${kbd('n')} / ${kbd('m')}</dt><dd>note / memo</dd>
<dt>${kbd('u')}</dt><dd>undo</dd><dt>${kbd('j')} / ${kbd('k')}</dt><dd>next / previous passage</dd><dt>${kbd('Esc')}</dt><dd>leave a text box</dd></dl></details>`;
}
