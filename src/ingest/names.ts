/** Transcript names: unique within a study, safe in passage ids and file names. */
import { basename, extname } from 'node:path';

/** Base name of a file without its extension: "data/P03 interview.docx" -> "P03 interview". */
export function baseName(fileName: string): string {
  const b = basename(fileName);
  const ext = extname(b);
  return ext ? b.slice(0, -ext.length) : b;
}

/**
 * Keeps [A-Za-z0-9._-]: accents are dropped ("Zoë" -> "Zoe"), every other run of characters
 * becomes "_", and leading/trailing "_" are trimmed.
 */
export function sanitiseName(name: string): string {
  const plain = name.normalize('NFKD').replace(/\p{M}+/gu, '');
  const safe = plain.replace(/[^A-Za-z0-9._-]+/g, '_').replace(/^_+|_+$/g, '');
  return safe === '' ? 'transcript' : safe;
}

/** The transcript name for a file, or for one respondent of a survey file. */
export function transcriptName(fileName: string, respondentId?: string): string {
  const base = sanitiseName(baseName(fileName));
  return respondentId === undefined ? base : `${base}-${sanitiseName(respondentId)}`;
}
