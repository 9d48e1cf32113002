import { acceptanceReport, type AcceptanceReport, type DecisionRecord } from '../measure/acceptance.js';
import { CIRCULARITY_NOTE, agreementReport, type AgreementReport, type CodingRecord, type CodedRecord } from '../measure/agreement.js';
import { templateGrowth, type GrowthReport } from '../measure/growth.js';
import { entriesById, walk } from '../template/paths.js';
import type { DB } from '../study/db.js';
import { effectiveDecisions, nothingToCode } from '../study/decisions.js';
import {
  codedParticipants,
  codedPassageIds,
  codedThemeTranscripts,
  codingsBy,
  decidedBy,
  firstCodings,
  latestClaims,
  latestScorings,
  latestScoringRun,
  participantIds as participantPassages,
  themesAddedAt,
} from '../study/measure-rows.js';
import { currentTemplate } from '../study/template.js';

/** The pseudo-coder standing for trellis's above-threshold suggestions in agreement figures. */
export const TOOL_CODER = 'trellis';

export interface StudyStats {
  acceptance: AcceptanceReport;
  /** Acceptance of the suggestions decided one by one, bulk acceptances left out. */
  one_by_one: { decided: number; accepted: number; rate: number | null };
  /** Decisions made in bulk (decide --all-above), counted apart. */
  bulk: { decisions: number; accepted: number };
  /**
   * Participant passages with a coding, of all participant passages; and those a coder marked
   * "reviewed, nothing to code" (not coded by anyone), which are judged too.
   */
  coverage: { coded: number; participant: number; share: number | null; nothing_to_code: number; reviewed: number; reviewed_share: number | null };
  /**
   * Over the whole study: participant passages that are neither coded nor judged nothing to code,
   * whose latest scoring found no theme to claim them, of all participant passages. `run` is the
   * latest suggestion run; `not_scored` passages were never scored (they count as neither).
   */
  unclaimed: { run: number | null; passages: number; unclaimed: number; share: number | null; not_scored: number; scope: 'study' };
  /** "Reviewed, nothing to code" decisions that stand, and the passages they cover. */
  nothing_to_code: { decisions: number; passages: number };
  /** Template growth by transcript, in coding order (replaces the old "saturation" figure). */
  template_growth: GrowthReport;
  /**
   * Re-codes to a sub-theme of the suggested theme: the suggestion named the right area and the
   * coder chose a finer theme. Counted apart, and in a second rate that takes them as right.
   */
  refined: { count: number; rate: number | null };
}

/**
 * Decisions on suggestions that still stand, as the acceptance measures count them. A defer is
 * counted only while nothing was decided after it on the same passage and theme: a suggestion
 * deferred and then accepted is one accepted suggestion, in stats as in the review footer.
 */
export function decisionRecords(db: DB): DecisionRecord[] {
  const standing = effectiveDecisions(db);
  const lastVerdict = new Map<string, number>();
  for (const d of standing) if (d.action !== 'defer' && d.theme_id && d.passage_id) lastVerdict.set(`${d.passage_id}\u0000${d.theme_id}`, d.id);
  return standing
    .filter((d) => d.theme_id && d.confidence !== null)
    .filter((d) => d.action !== 'defer' || (lastVerdict.get(`${d.passage_id}\u0000${d.theme_id}`) ?? -1) < d.id)
    .map((d) => ({
      action: d.action as DecisionRecord['action'],
      themeId: d.theme_id!,
      chosenThemeId: d.chosen_theme,
      confidence: d.confidence!,
      rank: d.rank ?? 1,
      transcript: d.transcript ?? '',
      coder: d.coder,
      at: d.at,
      bulk: d.bulk === 1,
    }));
}

export function studyStats(db: DB, opts: { excludeBulk?: boolean } = {}): StudyStats {
  const cov = codedParticipants(db);
  const run = latestScoringRun(db);
  const judged = nothingToCode(db);
  const nocodeDecisions = effectiveDecisions(db).filter((d) => d.action === 'nocode').length;
  const codedIds = codedPassageIds(db);
  const participantIds = participantPassages(db);
  const open = participantIds.filter((id) => !codedIds.has(id) && !judged.has(id));
  const judgedOnly = participantIds.filter((id) => !codedIds.has(id) && judged.has(id)).length;
  const claimedNow = latestClaims(db);
  let unclaimedN = 0;
  let notScored = 0;
  for (const id of open) {
    const c = claimedNow.get(id);
    if (c === undefined) notScored++;
    else if (!c) unclaimedN++;
  }
  const firsts = firstCodings(db);
  const records = decisionRecords(db).filter((d) => !(opts.excludeBulk && d.bulk));
  const themes = entriesById(currentTemplate(db));
  const under = (id: string | null | undefined, ancestor: string) => {
    for (let p = id ? themes.get(id)?.parentId : null; p; p = themes.get(p)?.parentId) if (p === ancestor) return true;
    return false;
  };
  const refined = records.filter((d) => d.action === 'recode' && under(d.chosenThemeId, d.themeId)).length;
  const acceptance = acceptanceReport(records);
  const { decided, accepted } = acceptance.overall;
  // Bulk acceptances are accepted by construction: counted apart, so that the figure of suggestions
  // judged one by one stays honest.
  const single = acceptanceReport(records.filter((d) => !d.bulk)).overall;
  const bulk = records.filter((d) => d.bulk);
  return {
    acceptance,
    one_by_one: { decided: single.decided, accepted: single.accepted, rate: single.rate },
    bulk: { decisions: bulk.length, accepted: bulk.filter((d) => d.action === 'accept').length },
    refined: { count: refined, rate: decided ? (accepted + refined) / decided : null },
    coverage: {
      ...cov,
      share: cov.participant ? cov.coded / cov.participant : null,
      nothing_to_code: judgedOnly,
      reviewed: cov.coded + judgedOnly,
      reviewed_share: cov.participant ? (cov.coded + judgedOnly) / cov.participant : null,
    },
    unclaimed: {
      run: run?.id ?? null,
      passages: cov.participant,
      unclaimed: unclaimedN,
      share: run && cov.participant ? unclaimedN / cov.participant : null,
      not_scored: notScored,
      scope: 'study',
    },
    nothing_to_code: { decisions: nocodeDecisions, passages: judged.size },
    template_growth: growth(db, firsts),
  };
}

/**
 * The current template's themes with the time each was added (its creating revision), and the
 * transcripts each theme has been coded in (codings later withdrawn included: it was coded there).
 */
function growth(db: DB, firsts: { transcript: string; firstCodedAt: string }[]): GrowthReport {
  const added = themesAddedAt(db);
  const themes = [...walk(currentTemplate(db))].map((e) => ({ id: e.node.id, path: e.path, topLevel: e.depth === 0, addedAt: added.get(e.node.id) ?? new Date(0).toISOString() }));
  const coded = codedThemeTranscripts(db);
  return templateGrowth({ themes, transcripts: firsts, coded });
}

export interface AgreementOptions {
  coders: string[];
  transcripts?: string[];
}

export interface StudyAgreement extends AgreementReport {
  /**
   * For each human coder: their codings on the units, and how many of them were made by accepting
   * a suggestion (one by one or in bulk). Such codings agree with the suggestions by construction.
   */
  accepted_codings: { coder: string; codings: number; accepted: number }[];
  /** The circularity note, when the suggestions are among the coders or a coder accepted suggestions. */
  circularity: string | null;
}

/**
 * Inter-coder agreement. Units are participant passages that the coders actually reviewed: a
 * coder reviewed a passage when they coded it, decided on a suggestion for it (a defer is not a
 * decision), or marked it "reviewed, nothing to code". An empty sheet row is not a review, and
 * interviewer turns are never units. The name `trellis` stands for the tool: its above-threshold
 * suggestions from the latest run that scored each passage.
 */
export function agreement(db: DB, opts: AgreementOptions): StudyAgreement {
  const inTranscripts = <R extends { transcript: string }>(rows: R[]): R[] =>
    opts.transcripts?.length ? rows.filter((r) => opts.transcripts!.includes(r.transcript)) : rows;
  const humans = opts.coders.filter((c) => c !== TOOL_CODER);
  const decided = inTranscripts(decidedBy(db, humans));
  const codings = inTranscripts(codingsBy(db, humans));
  const coded: CodedRecord[] = decided.map((s) => ({ coder: s.coder, passageId: s.passage_id }));
  const records: CodingRecord[] = codings.map((c) => ({ coder: c.coder, passageId: c.passage_id, themeId: c.theme_id! }));
  for (const c of codings) coded.push({ coder: c.coder, passageId: c.passage_id });
  if (opts.coders.includes(TOOL_CODER)) {
    // The latest scoring run of each passage, and its chosen (above-threshold) themes.
    const latest = inTranscripts(latestScorings(db));
    for (const l of latest) {
      coded.push({ coder: TOOL_CODER, passageId: l.passage_id });
      for (const themeId of l.chosen()) records.push({ coder: TOOL_CODER, passageId: l.passage_id, themeId });
    }
  }
  const passages = [...new Set(coded.map((c) => c.passageId))].sort();
  const themes = [...walk(currentTemplate(db))].map((e) => e.node.id);
  const report = agreementReport({ passages, coders: opts.coders, themes, codings: records, coded });
  // Codings on passages that are units (reviewed by two or more of the coders).
  const reviewers = new Map<string, Set<string>>();
  for (const c of coded) (reviewers.get(c.passageId) ?? reviewers.set(c.passageId, new Set()).get(c.passageId)!).add(c.coder);
  const onUnits = codings.filter((c) => (reviewers.get(c.passage_id)?.size ?? 0) >= 2);
  const accepted_codings = humans.map((coder) => {
    const mine = onUnits.filter((c) => c.coder === coder);
    return { coder, codings: mine.length, accepted: mine.filter((c) => c.origin === 'accepted' || c.origin === 'bulk').length };
  });
  const circular = opts.coders.includes(TOOL_CODER) || accepted_codings.some((a) => a.accepted > 0);
  return { ...report, accepted_codings, circularity: circular ? CIRCULARITY_NOTE : null };
}
