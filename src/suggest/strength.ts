/**
 * How far a theme's confidence can be trusted, from what it was learned on. The rule is shared
 * by `suggest` (its warnings) and `status` (its per-theme column), so both say the same.
 */

export type Strength = 'checked' | 'few examples' | 'name and seeds only' | 'not suggested';

/** Defaults of the suggester's minExamples and minTranscripts. */
export const MIN_EXAMPLES = 3;
export const MIN_TRANSCRIPTS = 2;

/**
 * @param coded passages coded with the theme or a sub-theme
 * @param transcripts transcripts those passages are in
 * @param codedTranscripts transcripts of the study with any coding (a batch of one transcript
 *   cannot ask for two)
 * @param described whether the theme has a name, definition or seed terms to match on
 */
export function themeStrength(coded: number, transcripts: number, codedTranscripts: number, described: boolean, minExamples = MIN_EXAMPLES, minTranscripts = MIN_TRANSCRIPTS): Strength {
  if (coded === 0) return described ? 'name and seeds only' : 'not suggested';
  if (coded < minExamples || transcripts < Math.min(minTranscripts, Math.max(codedTranscripts, 1))) return 'few examples';
  return 'checked';
}
