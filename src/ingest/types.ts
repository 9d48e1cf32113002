/** What every reader returns: one shape whatever the file format. */

export type SourceFormat = 'txt' | 'md' | 'docx' | 'vtt' | 'srt' | 'csv';

/** An inline code written in a transcript: `{theme: A > B; C}`. Offset is within the turn's text. */
export interface InlineCode {
  /** Theme paths as written (levels separated by " > "). */
  paths: string[];
  /** Character offset in the turn's text where the tag stood (it is removed from the text). */
  at: number;
}

export interface Turn {
  /** Speaker label as written, or null where the source has none (plain paragraphs). */
  speaker: string | null;
  text: string;
  /** Seconds from the start of the recording, when the source gives them. */
  start: number | null;
  end: number | null;
  /** Character offset and length of this turn's text within Transcript.source. */
  offset: number;
  length: number;
  /** Inline codes found in this turn. */
  codes: InlineCode[];
  /** The question asked in a survey answer set (CSV), when there is one. */
  question?: string;
}

export interface Transcript {
  /** Unique name within a study; passage ids are derived from it. */
  name: string;
  format: SourceFormat;
  /** The normalised source text (line endings \n, no BOM) that turn offsets point into. */
  source: string;
  turns: Turn[];
  /** True when speaker labels were detected; false for plain paragraph text. */
  labelled: boolean;
  /** Things the user should know but that did not stop the import (each names the file). */
  warnings: string[];
}
