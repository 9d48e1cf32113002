/**
 * The JSON of `trellis stats` and `trellis agree` (docs/schema/stats.schema.json,
 * docs/schema/agree.schema.json): the measures as the core returns them, keys in snake_case.
 */
import type { AcceptanceCounts, AcceptanceReport, GroupAcceptance } from '../measure/acceptance.js';
import type { AgreementFigures } from '../measure/agreement.js';
import type { StudyAgreement, StudyStats } from '../jobs/measures.js';

const counts = (c: AcceptanceCounts) => ({ decided: c.decided, accepted: c.accepted, rejected: c.rejected, recoded: c.recoded, deferred: c.deferred, rate: c.rate });
const group = (g: GroupAcceptance) => ({ key: g.key, ...counts(g) });

function acceptanceJson(a: AcceptanceReport) {
  return {
    overall: counts(a.overall),
    bulk_excluded: a.bulkExcluded,
    bulk_counted: a.bulkCounted,
    per_theme: a.perTheme.map(group),
    per_transcript: a.perTranscript.map(group),
    per_coder: a.perCoder.map(group),
    per_rank: a.perRank.map(group),
    per_day: a.perDay.map((d) => ({ day: d.day, ...counts(d) })),
    cumulative: a.cumulative,
    calibration: a.calibration.map((b) => ({ band: b.band, lower: b.lower, upper: b.upper, count: b.count, positives: b.positives, rate: b.rate, mean_confidence: b.meanConfidence })),
    expected_calibration_error: a.expectedCalibrationError,
    recodes: a.recodes.map((r) => ({ theme_id: r.themeId, chosen_theme_id: r.chosenThemeId, count: r.count })),
  };
}

export function statsJson(s: StudyStats) {
  const g = s.template_growth;
  return {
    acceptance: acceptanceJson(s.acceptance),
    one_by_one: s.one_by_one,
    bulk: s.bulk,
    refined: s.refined,
    coverage: s.coverage,
    unclaimed: s.unclaimed,
    nothing_to_code: s.nothing_to_code,
    template_growth: {
      curve: g.curve.map((p) => ({
        transcript: p.transcript,
        order: p.order,
        first_coded_at: p.first_coded_at,
        new_themes: p.new_themes,
        new_sub_themes: p.new_sub_themes,
        entered: p.entered.map((e) => ({ id: e.id, path: e.path, top_level: e.topLevel, how: e.how })),
        cumulative: p.cumulative,
      })),
      not_yet_coded: g.not_yet_coded.map((t) => ({ id: t.id, path: t.path, top_level: t.topLevel })),
      note: g.note,
    },
  };
}

const figures = (f: AgreementFigures) => ({ units: f.units, percent_agreement: f.percentAgreement, kappa: f.kappa, alpha: f.alpha, fleiss: f.fleiss });

export function agreementJson(r: StudyAgreement) {
  const m = r.meanOfThemes;
  return {
    coders: r.coders,
    passages: r.passages,
    pairable_passages: r.pairablePassages,
    themes: r.themes.map((t) => ({ theme_id: t.themeId, present: t.present, ...figures(t) })),
    pooled: figures(r.pooled),
    mean_of_themes: {
      percent_agreement: m.percentAgreement,
      kappa: m.kappa,
      alpha: m.alpha,
      themes_in_percent_agreement: m.themesInPercentAgreement,
      themes_in_kappa: m.themesInKappa,
      themes_in_alpha: m.themesInAlpha,
      fleiss: m.fleiss,
      themes_in_fleiss: m.themes_in_fleiss,
    },
    pairwise: r.pairwise,
    ignored_codings: r.ignoredCodings,
    disagreements: r.disagreements,
    bands_source: r.bandsSource,
    guidance_source: r.guidance_source,
    caution: r.caution,
    accepted_codings: r.accepted_codings,
    circularity: r.circularity,
  };
}
