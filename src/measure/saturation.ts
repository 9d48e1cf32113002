/**
 * Saturation: how many new themes and sub-themes each transcript brought, in the order the
 * transcripts were coded. A template revision is credited to the transcript most recently begun
 * at the time of the revision (the last one whose first coding is at or before it), on the
 * reasoning that revisions are made while its material is being worked through. Revisions made
 * before any transcript was coded (the initial template, a priori themes) are reported apart.
 *
 * Only 'added' changes count as new. A split reports its new themes as 'added' changes too;
 * renames, moves, merges and edits reshape the template without adding to it.
 */

import { PATH_SEP } from '../template/names.js';

export interface RevisionChange {
  kind: string;
  id: string;
  /** The theme's path, levels joined by " > "; present for 'added' changes. */
  path?: string;
}

export interface RevisionRecord {
  rev?: number;
  /** ISO 8601. */
  created_at: string;
  changes: readonly RevisionChange[];
}

export interface TranscriptStart {
  transcript: string;
  /** ISO 8601: when the transcript's first coding was made. */
  firstCodedAt: string;
}

export interface AddedTheme {
  id: string;
  path: string;
  /** True for a top-level theme, false for a sub-theme at any depth. */
  topLevel: boolean;
  rev: number | null;
}

export interface SaturationPoint {
  transcript: string;
  /** 1-based position in coding order. */
  order: number;
  firstCodedAt: string;
  newThemes: number;
  newSubThemes: number;
  added: AddedTheme[];
  /** Totals since coding began, this transcript included. */
  cumulativeThemes: number;
  cumulativeSubThemes: number;
  cumulative: number;
}

export interface SaturationReport {
  /** Themes in revisions made before the first coding: the initial template. */
  beforeCoding: { themes: number; subThemes: number; added: AddedTheme[] };
  curve: SaturationPoint[];
}

function time(iso: string, what: string): number {
  const t = Date.parse(iso);
  if (Number.isNaN(t)) throw new RangeError(`${what} is not an ISO 8601 timestamp: ${JSON.stringify(iso)}`);
  return t;
}

export function saturationCurve(revisions: readonly RevisionRecord[], transcripts: readonly TranscriptStart[]): SaturationReport {
  // Coding order; ties keep the given order (stable sort).
  const order = transcripts
    .map((tr) => ({ tr, t: time(tr.firstCodedAt, `first coding of ${tr.transcript}`) }))
    .sort((a, b) => a.t - b.t);
  const buckets: AddedTheme[][] = order.map(() => []);
  const before: AddedTheme[] = [];

  const revs = revisions
    .map((r) => ({ r, t: time(r.created_at, `revision ${r.rev ?? ''}`.trim()) }))
    .sort((a, b) => a.t - b.t);
  for (const { r, t } of revs) {
    // The last transcript begun at or before this revision.
    let lo = 0;
    let hi = order.length;
    while (lo < hi) {
      const mid = (lo + hi) >> 1;
      if (order[mid]!.t <= t) lo = mid + 1;
      else hi = mid;
    }
    const target = lo === 0 ? before : buckets[lo - 1]!;
    for (const c of r.changes) {
      if (c.kind !== 'added') continue;
      const path = c.path ?? '';
      target.push({ id: c.id, path, topLevel: !path.includes(PATH_SEP), rev: r.rev ?? null });
    }
  }

  let cumThemes = 0;
  let cumSub = 0;
  const curve = order.map(({ tr }, i): SaturationPoint => {
    const added = buckets[i]!;
    const newThemes = added.filter((a) => a.topLevel).length;
    const newSubThemes = added.length - newThemes;
    cumThemes += newThemes;
    cumSub += newSubThemes;
    return {
      transcript: tr.transcript,
      order: i + 1,
      firstCodedAt: tr.firstCodedAt,
      newThemes,
      newSubThemes,
      added,
      cumulativeThemes: cumThemes,
      cumulativeSubThemes: cumSub,
      cumulative: cumThemes + cumSub,
    };
  });
  const top = before.filter((a) => a.topLevel).length;
  return { beforeCoding: { themes: top, subThemes: before.length - top, added: before }, curve };
}
