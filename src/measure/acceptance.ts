/**
 * How often suggestions were taken: acceptance rates by theme, confidence, transcript, coder and
 * time, the calibration table, and which theme coders chose instead when they re-coded.
 *
 * Rate = accepted / decided, where decided = accept + reject + recode. A re-code counts against
 * the suggestion (its theme was not the one chosen). Defers are counted but left out of every
 * rate: a deferred suggestion has not been judged yet, and counting it either way would move the
 * rate with the coder's pace rather than with the suggestions' quality.
 */

import { DEFAULT_BINS, calibrationTable, expectedCalibrationError, type CalibrationBin } from './calibration.js';

export type DecisionAction = 'accept' | 'reject' | 'recode' | 'defer';

export interface DecisionRecord {
  action: DecisionAction;
  /** The suggested theme. */
  themeId: string;
  /** For a re-code: the theme the coder chose instead. */
  chosenThemeId?: string | null;
  confidence: number;
  /** 1 = the suggestion ranked best for its passage. */
  rank: number;
  transcript: string;
  coder: string;
  /** ISO 8601 timestamp. */
  at: string;
  /** Made by a bulk action (e.g. accept everything above a threshold) rather than one by one. */
  bulk?: boolean;
}

export interface AcceptanceCounts {
  decided: number;
  accepted: number;
  rejected: number;
  recoded: number;
  deferred: number;
  /** accepted / decided; null when nothing was decided. */
  rate: number | null;
}

export interface GroupAcceptance extends AcceptanceCounts {
  key: string;
}

export interface DayAcceptance extends AcceptanceCounts {
  /** UTC calendar date, YYYY-MM-DD. */
  day: string;
}

export interface CumulativePoint {
  /** 1-based position among decided decisions in time order. */
  index: number;
  at: string;
  accepted: number;
  rate: number;
}

export interface RecodeCell {
  themeId: string;
  /** null when a re-code did not name the chosen theme. */
  chosenThemeId: string | null;
  count: number;
}

export interface AcceptanceOptions {
  /** Leave out decisions made in bulk (default false: they count like the others). */
  excludeBulk?: boolean;
  bins?: number;
}

export interface AcceptanceReport {
  overall: AcceptanceCounts;
  /** Decisions left out because they were made in bulk (0 unless excludeBulk). */
  bulkExcluded: number;
  /** Decisions made in bulk among those counted. */
  bulkCounted: number;
  perTheme: GroupAcceptance[];
  perTranscript: GroupAcceptance[];
  perCoder: GroupAcceptance[];
  perRank: GroupAcceptance[];
  perDay: DayAcceptance[];
  cumulative: CumulativePoint[];
  /** Accepted share by confidence band over decided suggestions: the calibration table. */
  calibration: CalibrationBin[];
  /** Expected calibration error of confidence against acceptance; null when nothing was decided. */
  expectedCalibrationError: number | null;
  /** Suggested theme x chosen theme, most frequent first. */
  recodes: RecodeCell[];
}

function emptyCounts(): AcceptanceCounts {
  return { decided: 0, accepted: 0, rejected: 0, recoded: 0, deferred: 0, rate: null };
}

function add(counts: AcceptanceCounts, d: DecisionRecord): void {
  if (d.action === 'defer') counts.deferred++;
  else {
    counts.decided++;
    if (d.action === 'accept') counts.accepted++;
    else if (d.action === 'reject') counts.rejected++;
    else counts.recoded++;
  }
  counts.rate = counts.decided > 0 ? counts.accepted / counts.decided : null;
}

function grouped(decisions: readonly DecisionRecord[], keyOf: (d: DecisionRecord) => string): GroupAcceptance[] {
  const groups = new Map<string, GroupAcceptance>();
  for (const d of decisions) {
    const key = keyOf(d);
    let g = groups.get(key);
    if (!g) groups.set(key, (g = { key, ...emptyCounts() }));
    add(g, d);
  }
  return [...groups.values()].sort((a, b) => (a.key < b.key ? -1 : a.key > b.key ? 1 : 0));
}

function time(d: DecisionRecord): number {
  const t = Date.parse(d.at);
  if (Number.isNaN(t)) throw new RangeError(`decision time is not an ISO 8601 timestamp: ${JSON.stringify(d.at)}`);
  return t;
}

/**
 * Each record is one decision. The decision log is append-only, so a caller that lets a coder
 * change their mind passes only each suggestion's latest decision.
 */
export function acceptanceReport(decisions: readonly DecisionRecord[], options: AcceptanceOptions = {}): AcceptanceReport {
  const bins = options.bins ?? DEFAULT_BINS;
  const used = options.excludeBulk ? decisions.filter((d) => !d.bulk) : [...decisions];
  // Time order, ties kept in input order (Array.prototype.sort is stable).
  const ordered = used.map((d) => ({ d, t: time(d) })).sort((a, b) => a.t - b.t);

  const overall = emptyCounts();
  for (const d of used) add(overall, d);

  const days = new Map<string, DayAcceptance>();
  const cumulative: CumulativePoint[] = [];
  let accepted = 0;
  for (const { d, t } of ordered) {
    const day = new Date(t).toISOString().slice(0, 10);
    let g = days.get(day);
    if (!g) days.set(day, (g = { day, ...emptyCounts() }));
    add(g, d);
    if (d.action === 'defer') continue;
    if (d.action === 'accept') accepted++;
    const index = cumulative.length + 1;
    cumulative.push({ index, at: d.at, accepted, rate: accepted / index });
  }

  const decided = used.filter((d) => d.action !== 'defer');
  const confidences = decided.map((d) => d.confidence);
  const outcomes = decided.map((d) => d.action === 'accept');

  const recodeCells = new Map<string, RecodeCell>();
  for (const d of used) {
    if (d.action !== 'recode') continue;
    const chosen = d.chosenThemeId ?? null;
    const key = JSON.stringify([d.themeId, chosen]);
    const cell = recodeCells.get(key);
    if (cell) cell.count++;
    else recodeCells.set(key, { themeId: d.themeId, chosenThemeId: chosen, count: 1 });
  }
  const recodes = [...recodeCells.values()].sort(
    (a, b) => b.count - a.count || a.themeId.localeCompare(b.themeId) || (a.chosenThemeId ?? '').localeCompare(b.chosenThemeId ?? ''),
  );

  return {
    overall,
    bulkExcluded: decisions.length - used.length,
    bulkCounted: used.filter((d) => d.bulk).length,
    perTheme: grouped(used, (d) => d.themeId),
    perTranscript: grouped(used, (d) => d.transcript),
    perCoder: grouped(used, (d) => d.coder),
    perRank: grouped(used, (d) => String(d.rank)).sort((a, b) => Number(a.key) - Number(b.key)),
    perDay: [...days.values()],
    cumulative,
    calibration: calibrationTable(confidences, outcomes, bins),
    expectedCalibrationError: expectedCalibrationError(confidences, outcomes, bins),
    recodes,
  };
}
