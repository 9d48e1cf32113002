import { groupByTheme, rollUp } from '../template/rollup.js';
import { basename } from 'node:path';
import { integrativeCoverage } from '../measure/integrative.js';
import type { ReportCluster, ReportData, ReportMemo, ReportTheme } from '../report/types.js';
import { listMemos } from '../study/memos.js';
import { latestClusters } from '../study/clusters.js';
import { clock } from '../sheet/sheet.js';
import { describeChange } from '../template/describe.js';
import { walk } from '../template/paths.js';
import { cosine, sum, normalised } from '../math/sparse.js';
import { TfidfVectorizer } from '../text/tfidf.js';
import { currentCodings } from '../study/codings.js';
import type { DB } from '../study/db.js';
import type { Study } from '../study/study.js';
import { agreement, studyStats } from './measures.js';
import { modelInputs } from './model-inputs.js';
import { listPassages, type StoredPassage } from '../study/passages.js';
import { listQuoteChoices } from '../study/quotes.js';
import { themeMatrix } from '../study/export.js';
import { studyPseudonymiser } from './aliases.js';
import { pseudonymiseReport } from '../report/pseudonyms.js';
import { chooseQuotes, type ChosenQuote, type QuoteTheme } from '../report/quotes.js';
import { studyStatus, themeCounts } from './status.js';
import { currentTemplate, revisionHistory } from '../study/template.js';

export interface ReportOptions {
  title?: string;
  /** Quotes per theme (the report takes 3, the codebook 2). */
  quotes?: number;
  /** The cautions, given how many codings were accepted in bulk. */
  cautions: (bulkCodings: number) => string[];
  /** Name speakers and transcripts by their aliases (src/report/pseudonyms.ts). */
  pseudonymise?: boolean;
}

/** Gathers everything the report and the codebook show, from the study, in one pass. */
export function reportData(study: Study, opts: ReportOptions): ReportData {
  const data = gather(study, opts);
  return opts.pseudonymise ? pseudonymiseReport(data, studyPseudonymiser(study.db)) : data;
}

function gather(study: Study, opts: ReportOptions): ReportData {
  const { db } = study;
  const template = currentTemplate(db);
  const entries = [...walk(template)];
  const status = studyStatus(db);
  const counts = new Map(themeCounts(db, template).map((c) => [c.id, c]));
  const passages = new Map(listPassages(db).map((p) => [p.id, p]));
  const codings = currentCodings(db);

  const memos: ReportMemo[] = listMemos(db).map((m) => ({ id: m.memo_id, at: m.at, author: m.author, kind: m.target_kind, target: m.target, label: m.target_label, text: m.text }));
  const quotes = chosenQuotes(db, opts.quotes ?? 3);
  const themes: ReportTheme[] = entries.map((e) => ({
    id: e.node.id,
    number: e.number,
    name: e.node.name,
    path: e.path,
    depth: e.depth,
    apriori: e.node.apriori,
    integrative: e.integrative,
    memos: memos.filter((m) => m.kind === 'theme' && m.target === e.node.id),
    definition: e.node.definition,
    include: e.node.include,
    exclude: e.node.exclude,
    seeds: e.node.seeds,
    direct: counts.get(e.node.id)?.direct ?? 0,
    total: counts.get(e.node.id)?.total ?? 0,
    quotes: (quotes.get(e.node.id) ?? []).map((q) => {
      const p = passages.get(q.passageId)!;
      return { passageId: q.passageId, transcript: p.transcript, speaker: p.speaker, time: clock(p.start), text: p.text, pinned: q.pinned };
    }),
  }));

  // The same matrix as "trellis export matrix": passages per theme (rolled up) and transcript.
  const matrix = themeMatrix(db);
  const stats = studyStats(db);
  const paths = new Map(entries.map((e) => [e.node.id, e.path]));
  const a = stats.acceptance;
  const humanCoders = status.perCoder.map((c) => c.coder);
  const agree = humanCoders.length >= 2 ? agreement(db, { coders: humanCoders }) : null;

  return {
    title: opts.title ?? basename(study.dir),
    generatedAt: new Date().toISOString(),
    counts: {
      transcripts: status.transcripts,
      codedTranscripts: status.coded_transcripts,
      passages: status.passages.total,
      participant: status.passages.participant,
      coded: status.coded,
      nothingToCode: stats.coverage.nothing_to_code,
      themes: status.themes,
      revision: status.revision,
    },
    themes,
    revisions: revisionHistory(db).map((r) => ({
      rev: r.rev,
      at: r.created_at,
      author: r.author,
      action: r.action,
      reason: r.reason,
      // A starting template is a long list of additions: one line says it.
      changes:
        r.changes.length > 8 && r.changes.every((c) => c.kind === 'added')
          ? [`added ${r.changes.length} themes`]
          : r.changes.map(describeChange).map((s) => s.replace(/\s+/g, ' ')),
    })),
    heatmap: { transcripts: matrix.transcripts, themes: matrix.rows.map((r) => r.theme), counts: matrix.rows.map((r) => r.counts) },
    acceptance: {
      overall: { label: 'all suggestions', decided: a.overall.decided, accepted: a.overall.accepted, rate: a.overall.rate },
      perTheme: a.perTheme.map((g) => ({ label: paths.get(g.key) ?? `${g.key} (retired)`, decided: g.decided, accepted: g.accepted, rate: g.rate })),
      overTime: a.cumulative.map((c) => ({ index: c.index, at: c.at, rate: c.rate })),
      calibration: a.calibration.map((b) => ({ band: b.band, lower: b.lower, upper: b.upper, count: b.count, meanConfidence: b.meanConfidence, acceptance: b.rate })),
      oneByOne: { label: 'decided one by one', ...stats.one_by_one },
      bulkAccepted: stats.bulk.accepted,
    },
    growth: stats.template_growth.curve.map((p) => ({ transcript: p.transcript, order: p.order, newThemes: p.new_themes, newSubThemes: p.new_sub_themes, cumulative: p.cumulative })),
    notYetCoded: stats.template_growth.not_yet_coded.length,
    unclaimed: { share: stats.unclaimed.share, passages: stats.unclaimed.passages, unclaimed: stats.unclaimed.unclaimed, clusters: currentClusters(db, passages) },
    agreement:
      agree && agree.pairablePassages
        ? {
            coders: agree.coders,
            units: agree.pairablePassages,
            rows: [
              ...agree.themes
                .filter((t) => t.present > 0)
                .map((t) => ({
                  theme: paths.get(t.themeId) ?? t.themeId,
                  units: t.units,
                  percentAgreement: t.percentAgreement,
                  kappa: t.kappa.value,
                  alpha: t.alpha.value,
                  kappaBand: t.kappa.band,
                  alphaGuidance: t.alpha.guidance,
                  fleiss: t.fleiss.value,
                  fleissUnits: t.fleiss.units,
                  fleissBand: t.fleiss.band,
                })),
              {
                theme: 'all themes, pooled',
                units: agree.pooled.units,
                percentAgreement: agree.pooled.percentAgreement,
                kappa: agree.pooled.kappa.value,
                alpha: agree.pooled.alpha.value,
                kappaBand: agree.pooled.kappa.band,
                alphaGuidance: agree.pooled.alpha.guidance,
                fleiss: agree.pooled.fleiss.value,
                fleissUnits: agree.pooled.fleiss.units,
                fleissBand: agree.pooled.fleiss.band,
              },
            ],
            pairwise: agree.pairwise.map((p) => ({
              coders: p.coders,
              passages: p.passages,
              percentAgreement: p.percent_agreement,
              kappa: p.kappa.value,
              kappaBand: p.kappa.band,
              alpha: p.alpha.value,
              meanKappa: p.mean_kappa,
              themesInMeanKappa: p.themes_in_mean_kappa,
            })),
            disagreements: agree.disagreements.length,
            bandsSource: agree.bandsSource,
            guidanceSource: agree.guidance_source,
            circularity: agree.circularity,
            caution: agree.caution,
          }
        : null,
    cautions: opts.cautions(codings.filter((c) => c.origin === 'bulk').length),
    quoteChoices: (() => {
      const all = listQuoteChoices(db);
      return { pinned: all.filter((c) => c.choice === 'pin').length, dropped: all.filter((c) => c.choice === 'drop').length };
    })(),
    memos,
    integrative: integrativeCoverage(template, codings.map((c) => ({ passageId: c.passage_id, themeId: c.theme_id }))).map((x) => ({
      themeId: x.theme_id,
      name: x.name,
      passages: x.passages,
      touches: x.touches,
      across: x.across.map((a) => ({ name: a.name, passages: a.passages })),
    })),
  };
}

/**
 * Each theme's quotes (src/report/quotes.ts states the rules): candidates are the passages coded
 * to the theme or a sub-theme, ranked by closeness (cosine) to the TF-IDF centroid of the theme's
 * own codings, or of its sub-themes' when it has none; the researcher's pins and drops apply.
 */
export function chosenQuotes(db: DB, n: number): Map<string, ChosenQuote[]> {
  const template = currentTemplate(db);
  const entries = [...walk(template)];
  const codings = currentCodings(db);
  const direct = groupByTheme(codings.map((c) => ({ themeId: c.theme_id, member: c.passage_id })));
  const rolled = rollUp(template, direct);
  if (!entries.some((e) => rolled.get(e.node.id)?.size)) return new Map();
  const { passages } = modelInputs(db);
  const vec = new TfidfVectorizer();
  const vectors = vec.fitTransform(passages.map((p) => p.terms));
  const byId = new Map(passages.map((p, i) => [p.id, vectors[i]!]));
  const info = new Map(listPassages(db).map((p) => [p.id, p]));
  const themes: QuoteTheme[] = entries.map((e) => {
    const own = direct.get(e.node.id) ?? new Set<string>();
    const all = [...(rolled.get(e.node.id) ?? [])].filter((p) => byId.has(p)).sort();
    const basis = own.size ? all.filter((p) => own.has(p)) : all;
    const centre = basis.length ? normalised(sum(basis.map((p) => byId.get(p)!))) : null;
    return {
      id: e.node.id,
      depth: e.depth,
      candidates: all.map((p) => {
        const at = info.get(p);
        return { passageId: p, participant: `${at?.transcript ?? ''}\u0000${at?.speaker ?? ''}`, score: centre ? cosine(byId.get(p)!, centre) : 0, direct: own.has(p) };
      }),
    };
  });
  return chooseQuotes(themes, listQuoteChoices(db), n);
}

/** The clusters of the latest discovery run, if there has been one, named by their top terms. */
function currentClusters(db: DB, passages: Map<string, StoredPassage>): ReportCluster[] {
  return latestClusters(db).map((c) => ({
    id: c.cluster_id,
    label: c.label,
    size: c.size,
    cohesion: c.cohesion,
    status: c.status,
    terms: c.detail.terms.map((t) => t.term),
    transcripts: c.detail.transcripts.length,
    // Each example credited like every other quote: transcript, speaker and time.
    examples: c.detail.central.map((x) => {
      const p = passages.get(x.passage_id);
      return { passageId: x.passage_id, transcript: p?.transcript ?? x.transcript, speaker: p?.speaker ?? null, time: clock(p?.start ?? null), text: x.text };
    }),
  }));
}
