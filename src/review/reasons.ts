// A suggestion's reasons as sentences a researcher can read: one wording for every front end
// (the terminal, the browser page, --json's "text").
import type { Reason as ModelReason } from '../suggest/types.js';

/** A suggestion made by promoting a cluster of unclaimed passages into a theme. */
export interface ClusterReason {
  kind: 'cluster';
  clusterId: number | string;
  label: string;
  similarity: number;
}

export type Reason = ModelReason | ClusterReason;

export interface Snippets {
  get(passageId: string): { transcript: string; text: string } | undefined;
}

const num = (n: number) => n.toFixed(2);

export function snippet(text: string, n = 70): string {
  const flat = text.replace(/\s+/g, ' ').trim();
  return flat.length > n ? flat.slice(0, n - 1).trimEnd() + '…' : flat;
}

export type Cited = ReturnType<Snippets['get']>;

/** What an exemplar reason's sentence ends with: a short snippet of the cited passage. */
export const exemplarTail = (s: Cited): string => (s ? `: "${snippet(s.text)}"` : '');

/** A reason as a sentence a researcher can read. */
export function reasonText(r: Reason, snippets: Snippets): string {
  switch (r.kind) {
    case 'terms':
      return `distinctive terms: ${r.terms.map((t) => `${t.written ?? t.term} ${num(t.weight)}`).join(', ')}${r.fragment ? ` in "${r.fragment}"` : ''}`;
    case 'exemplar':
      return `most like coded passage ${r.passageId} (similarity ${num(r.similarity)})${exemplarTail(snippets.get(r.passageId))}`;
    case 'seeds':
      return `seed terms: ${r.terms.join(', ')}`;
    case 'seed-only':
      return 'profile from the definition and seed terms only (no coded passage yet)';
    case 'parent':
      return `fits ${r.theme}; no sub-theme stands out`;
    case 'context':
      return `the surrounding passages point here too (${num(r.weight)})`;
    case 'question':
      return `the interviewer's question points here (${num(r.weight)})`;
    case 'cluster':
      return `in cluster ${r.clusterId} (${r.label}) promoted to this theme; closeness to the cluster ${num(r.similarity)}, not a calibrated confidence`;
  }
}


/** No cited passages to quote: an exemplar reason then names the passage only. */
export const NO_SNIPPETS: Snippets = { get: () => undefined };
