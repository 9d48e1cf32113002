/** A decision in words, as the log and the review screens show it (pure). */
import type { DecisionRow } from '../study/decisions.js';
import { pathOf } from '../template/paths.js';
import type { Template } from '../template/types.js';

export function describeDecision(d: DecisionRow, t: Template): string {
  const path = (id: string | null) => {
    if (!id) return '';
    try {
      return pathOf(t, id);
    } catch {
      return `${id} (no longer in the template)`;
    }
  };
  switch (d.action) {
    case 'accept':
      return `decision #${d.id}: accepted ${path(d.chosen_theme)} for ${d.passage_id}`;
    case 'recode':
      return `decision #${d.id}: re-coded ${d.passage_id}: ${path(d.chosen_theme)} instead of ${path(d.theme_id)}`;
    case 'reject':
      return `decision #${d.id}: rejected ${path(d.theme_id)} for ${d.passage_id}`;
    case 'defer':
      return `decision #${d.id}: deferred ${path(d.theme_id)} for ${d.passage_id}`;
    case 'undo':
      return `decision #${d.id}: undid decision #${d.undoes}`;
    case 'nocode':
      return `decision #${d.id}: reviewed ${d.passage_id}, nothing to code`;
    default: {
      const row = d as Omit<DecisionRow, 'action'> & { action: string; cluster_id?: number | string | null };
      if (row.action === 'promote') return `decision #${row.id}: promoted cluster ${row.cluster_id} into ${path(row.chosen_theme)}`;
      if (row.action === 'dismiss') return `decision #${row.id}: dismissed cluster ${row.cluster_id}`;
      return `decision #${row.id}: ${row.action}`;
    }
  }
}

/** "accepted X for P (decision #12)": the decision first, its number after, for a one-line message. */
export function describeBriefly(d: DecisionRow, t: Template): string {
  const text = describeDecision(d, t);
  const m = /^decision #(\d+): (.*)$/.exec(text);
  return m ? `${m[2]} (decision #${m[1]})` : text;
}
