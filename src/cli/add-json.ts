/** The JSON of `trellis add` (docs/schema/add.schema.json): the import report, keys in snake_case. */
import type { ImportReport } from '../jobs/import.js';

export function addJson(report: ImportReport, speakersLikeNames: string[]) {
  return {
    added: report.added,
    unchanged: report.unchanged,
    inline_codings: report.inlineCodings,
    kept_codings: report.keptCodings,
    moved_codings: report.movedCodings,
    unplaced: report.unplaced,
    dropped_codings: report.droppedCodings,
    words: report.words,
    warnings: report.warnings,
    speakers_like_names: speakersLikeNames,
  };
}
