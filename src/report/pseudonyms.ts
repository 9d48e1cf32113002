/**
 * Pseudonyms: speakers and transcripts named by their aliases in what leaves the study, so that a
 * quote is credited to "P07" rather than to a first name or a file name that points to a person.
 * Pure: the alias table and the names in the study in, a naming function out.
 */

import type { ReportData, ReportQuote } from './types.js';

export interface Alias {
  kind: 'speaker' | 'transcript';
  name: string;
  alias: string;
}

/**
 * Labels that name a role or a code, not a person: Interviewer, Participant, Respondent,
 * Moderator, Facilitator, Researcher, Speaker, Interviewee, Int, IV, Q, A, R, I (each optionally
 * numbered), and codes such as P01, R2, S12, FG1-P3. Anything else that starts with a capital
 * letter looks like a personal name.
 */
const ROLE = /^(?:interviewer|interviewee|participant|respondent|moderator|facilitator|researcher|speaker|unknown|int|iv|q|a|r|i)(?:[ \t]*#?\d{1,3})?$/i;
const CODE = /^[A-Z]{1,3}[- ]?\d{1,4}(?:[- ][A-Z]{0,3}\d{1,4})?$/;

export function isRoleLabel(label: string): boolean {
  const s = label.trim().replace(/[:.]+$/, '').trim();
  return ROLE.test(s) || CODE.test(s);
}

/** A speaker label that looks like a personal name: a capitalised word that is not a role label or code. */
export function looksLikeName(label: string | null): boolean {
  if (!label) return false;
  const s = label.trim();
  return !isRoleLabel(s) && /^\p{Lu}\p{Ll}/u.test(s);
}

export interface Pseudonymiser {
  speaker(label: string | null): string | null;
  transcript(name: string): string;
  /** A passage id "<transcript>#<n>" with the transcript's pseudonym. */
  passage(id: string): string;
  /** Text with every personal speaker label replaced, as a whole word, by its pseudonym. */
  text(text: string): string;
  /** What a reader is told about the naming. */
  note: string;
}

const pad = (n: number) => String(n).padStart(2, '0');
const escapeRe = (s: string) => s.replace(/[.*+?^${}()|[\]\\]/g, '\\$&');

/**
 * Aliases where the researcher gave them. A transcript without one is shown as T01, T02, ... by its place
 * in import order (the next free code when that one is an alias); a speaker whose label looks like a personal name and has no alias as S01, S02, ...
 * in order of first appearance (role labels and codes stay). Generated codes skip any alias in use.
 */
export function pseudonymiser(aliases: readonly Alias[], transcripts: readonly string[], speakers: readonly string[]): Pseudonymiser {
  const tAlias = new Map(aliases.filter((a) => a.kind === 'transcript').map((a) => [a.name, a.alias]));
  const sAlias = new Map(aliases.filter((a) => a.kind === 'speaker').map((a) => [a.name, a.alias]));
  const taken = new Set(aliases.map((a) => a.alias));
  const fresh = (prefix: string, counter: { n: number }) => {
    let code: string;
    do code = `${prefix}${pad(++counter.n)}`;
    while (taken.has(code));
    taken.add(code);
    return code;
  };
  const tc = { n: 0 };
  const sc = { n: 0 };
  let tMade = 0;
  let sMade = 0;
  const tName = new Map<string, string>();
  transcripts.forEach((t, i) => {
    const a = tAlias.get(t);
    if (a !== undefined) tName.set(t, a);
    else {
      // The transcript's place in import order, so the third transcript is T03 when free.
      tc.n = Math.max(tc.n, i);
      tName.set(t, fresh('T', tc));
      tMade++;
    }
  });
  const sName = new Map<string, string>();
  for (const s of speakers) {
    const a = sAlias.get(s);
    if (a !== undefined) sName.set(s, a);
    else if (looksLikeName(s)) {
      sName.set(s, fresh('S', sc));
      sMade++;
    }
  }
  // Longest names first, so "Anna Marie" is replaced before "Anna".
  const replaced = [...sName.entries()].filter(([real]) => real.trim().length > 1).sort((a, b) => b[0].length - a[0].length);
  const pattern = replaced.length ? new RegExp(`(?<![\\p{L}\\p{N}])(?:${replaced.map(([r]) => escapeRe(r.trim())).join('|')})(?![\\p{L}\\p{N}])`, 'gu') : null;
  const byTrimmed = new Map(replaced.map(([r, a]) => [r.trim(), a]));
  const made = [tMade ? `${tMade} transcript${tMade === 1 ? '' : 's'} without an alias as T01, T02, ...` : '', sMade ? `${sMade} speaker${sMade === 1 ? '' : 's'} without an alias as S01, S02, ...` : '']
    .filter(Boolean)
    .join(' and ');
  return {
    speaker: (label) => (label === null ? null : (sName.get(label) ?? label)),
    transcript: (name) => tName.get(name) ?? name,
    passage: (id) => {
      const cut = id.lastIndexOf('#');
      return cut < 0 ? id : `${tName.get(id.slice(0, cut)) ?? id.slice(0, cut)}${id.slice(cut)}`;
    },
    text: (text) => (pattern ? text.replace(pattern, (m) => byTrimmed.get(m) ?? m) : text),
    note:
      'Pseudonymised: speakers and transcripts are named by their aliases (trellis alias list)' +
      (made ? `; ${made}, codes made for this document` : '') +
      '. Speaker names inside quoted text are replaced where they match a speaker label; other names, places and details that could identify someone are not: read every quote before sharing.',
  };
}

function quote(q: ReportQuote, p: Pseudonymiser): ReportQuote {
  return { ...q, passageId: p.passage(q.passageId), transcript: p.transcript(q.transcript), speaker: p.speaker(q.speaker), text: p.text(q.text) };
}

/** The report's data with every transcript name, speaker label and passage id pseudonymised. */
export function pseudonymiseReport(d: ReportData, p: Pseudonymiser): ReportData {
  return {
    ...d,
    themes: d.themes.map((t) => ({ ...t, quotes: t.quotes.map((q) => quote(q, p)), memos: t.memos?.map((m) => ({ ...m, text: p.text(m.text) })) })),
    heatmap: { ...d.heatmap, transcripts: d.heatmap.transcripts.map(p.transcript) },
    growth: d.growth.map((g) => ({ ...g, transcript: p.transcript(g.transcript) })),
    unclaimed: { ...d.unclaimed, clusters: d.unclaimed.clusters.map((c) => ({ ...c, examples: c.examples.map((q) => quote(q, p)) })) },
    memos: d.memos?.map((m) => ({
      ...m,
      target: m.kind === 'transcript' && m.target ? p.transcript(m.target) : m.kind === 'passage' && m.target ? p.passage(m.target) : m.target,
      label: m.kind === 'transcript' ? p.transcript(m.label) : m.kind === 'passage' ? p.passage(m.label) : m.label,
      text: p.text(m.text),
    })),
    pseudonyms: p.note,
  };
}
