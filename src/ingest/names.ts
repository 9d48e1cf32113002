/** Transcript names: unique within a study, safe in passage ids and file names. */
import { basename, extname } from 'node:path';

/** Base name of a file without its extension: "data/P03 interview.docx" -> "P03 interview". */
export function baseName(fileName: string): string {
  const b = basename(fileName);
  const ext = extname(b);
  return ext ? b.slice(0, -ext.length) : b;
}

/**
 * Latin names keep [A-Za-z0-9._-] only, as they always have (passage ids derive from names, so
 * they must not change): accents are dropped ("Zoë" -> "Zoe") and other Latin letters and
 * punctuation become "_". Letters and digits of every other script are kept with their marks
 * ("中文", "Ελληνικά", "интервью"), so names in those scripts stay distinct instead of all becoming
 * "transcript". Every other run of characters becomes "_"; leading/trailing "_" are trimmed.
 */
export function sanitiseName(name: string): string {
  // Compatibility forms folded ("Ｐ０３" -> "P03"); marks after Latin and script-neutral characters
  // dropped; then recomposed, so the marks of other scripts rejoin their letters ("й", "が").
  const plain = name
    .normalize('NFKD')
    .replace(/([\p{Script=Latin}\p{Script=Common}])\p{M}+/gu, '$1')
    .replace(/^\p{M}+/u, '')
    .normalize('NFC');
  let safe = '';
  let last = 0;
  for (const m of plain.matchAll(KEEP)) {
    if (m.index > last) safe += '_';
    safe += m[0];
    last = m.index + m[0].length;
  }
  if (last < plain.length) safe += '_';
  safe = safe.replace(/^_+|_+$/g, '');
  return safe === '' ? 'transcript' : safe;
}

/** What a name keeps: ASCII letters, digits and "._-", and letters or digits (with their marks) of non-Latin scripts. */
const KEEP = /[A-Za-z0-9._-]+|(?:(?![\p{Script=Latin}\p{Script=Common}])[\p{L}\p{N}]\p{M}*)+/gu;

/** The transcript name for a file, or for one respondent of a survey file. */
export function transcriptName(fileName: string, respondentId?: string): string {
  const base = sanitiseName(baseName(fileName));
  return respondentId === undefined ? base : `${base}-${sanitiseName(respondentId)}`;
}
