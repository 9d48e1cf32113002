/** The JSON of `trellis profile` (docs/schema/profile.schema.json), keys in snake_case. */
import type { ThemeReport } from '../suggest/types.js';

export type ProfileReport = Omit<ThemeReport, 'topTerms'> & { topTerms: (ThemeReport['topTerms'][number] & { written?: string })[] };

export function profileJson(fingerprint: string, reports: ProfileReport[]) {
  return {
    fingerprint,
    themes: reports.map((r) => ({
      theme_id: r.themeId,
      path: r.path,
      exemplars: r.exemplars,
      transcripts: r.transcripts,
      top_terms: r.topTerms,
      threshold: r.threshold,
      expected_precision: r.expectedPrecision,
      expected_recall: r.expectedRecall,
      seed_only: r.seedOnly,
      too_few: r.tooFew,
      warnings: r.warnings,
    })),
  };
}
