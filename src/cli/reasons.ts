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

function snippet(text: string, n = 70): string {
  const flat = text.replace(/\s+/g, ' ').trim();
  return flat.length > n ? flat.slice(0, n - 1).trimEnd() + '…' : flat;
}

type Cited = ReturnType<Snippets['get']>;

/** What an exemplar reason's sentence ends with: a short snippet of the cited passage. */
export const exemplarTail = (s: Cited): string => (s ? `: "${snippet(s.text)}"` : '');

/** The cited passage's transcript and a longer snippet, for --json. */
export const exemplarCited = (s: Cited): { transcript?: string; snippet?: string } => (s ? { transcript: s.transcript, snippet: snippet(s.text, 120) } : {});

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

/** The reason with its readable text, and the exemplar's transcript and snippet, for --json. */
export function reasonJson(r: Reason, snippets: Snippets): Record<string, unknown> {
  if (r.kind === 'cluster') return { kind: r.kind, cluster_id: r.clusterId, label: r.label, similarity: r.similarity, text: reasonText(r, snippets) };
  if (r.kind !== 'exemplar') return { ...r, text: reasonText(r, snippets) };
  return {
    kind: r.kind,
    passage_id: r.passageId,
    similarity: r.similarity,
    ...exemplarCited(snippets.get(r.passageId)),
    text: reasonText(r, snippets),
  };
}

/** The terms to mark in the passage: distinctive terms and matched seeds. */
export function markedTerms(reasons: Reason[]): string[] {
  return reasons.flatMap((r) => (r.kind === 'terms' ? r.terms.map((t) => t.term) : r.kind === 'seeds' ? r.terms : []));
}
