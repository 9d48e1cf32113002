import { snippet, reasonText, type Cited, type Reason, type Snippets } from '../review/reasons.js';

export { exemplarTail, reasonText, type ClusterReason, type Reason, type Snippets } from '../review/reasons.js';

/** The cited passage's transcript and a longer snippet, for --json. */
export const exemplarCited = (s: Cited): { transcript?: string; snippet?: string } => (s ? { transcript: s.transcript, snippet: snippet(s.text, 120) } : {});

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
