/** The cautions that travel with data leaving the study: reports, codebooks, exports. */

/** One line for every file that carries quotes or codings out of the study. */
export const DATA_CAUTION =
  'Caution: quotes and codings from transcripts are personal data; check de-identification and consent before sharing this file.';

/**
 * The report's and the codebook's cautions, one paragraph each. Codings accepted in bulk
 * (decide --all-above) were not confirmed passage by passage, and the report says so.
 */
export function reportCautions(bulkCodings: number): string[] {
  const decided =
    bulkCodings > 0
      ? `Suggestions are aids: ${bulkCodings} of the codings shown here were accepted in bulk (decide --all-above), without a researcher reading each passage; every other coding was made or confirmed by a researcher one passage at a time. Interpretation remains the researchers'.`
      : "Suggestions are aids: every coding shown here was made or confirmed by a researcher, and interpretation remains theirs.";
  return [
    "The study stays on the researcher's disk: trellis opens no network connection (trellis serve listens on this computer only, at 127.0.0.1), and this report needs none.",
    decided,
    "Ethics approval, consent, de-identification and data-protection duties remain with the research team, under their institution's rules. This file quotes transcripts: quotes are personal data, so check de-identification and consent before sharing it.",
  ];
}
