/** Entry point: a transcript file (or its bytes) to Transcript[] in the one shape all readers share. */
import { createHash } from 'node:crypto';
import { readFile, stat } from 'node:fs/promises';
import { extname } from 'node:path';
import { UserError } from '../errors.js';
import { parseCsv } from './csv.js';
import { decodeText } from './decode.js';
import { docxText } from './docx.js';
import { DEFAULT_MAX_MB, tooLarge } from './limits.js';
import { transcriptName } from './names.js';
import { parseSrt } from './srt.js';
import { parseText } from './text.js';
import type { SourceFormat, Transcript } from './types.js';
import { parseVtt } from './vtt.js';

export interface ReadOptions {
  /** Largest file (and expanded .docx) accepted, in megabytes; DEFAULT_MAX_MB when absent. */
  maxMb?: number;
  /** CSV column names (override the guess) */
  idColumn?: string;
  textColumn?: string;
  questionColumn?: string;
}

const FORMATS: Record<string, SourceFormat> = {
  '.txt': 'txt', '.text': 'txt', '.md': 'md', '.markdown': 'md', '.docx': 'docx', '.vtt': 'vtt', '.srt': 'srt', '.csv': 'csv',
};

const ADVICE: Record<string, string> = {
  '.doc': 'save it as .docx (Word: File > Save As)',
  '.rtf': 'save it as .docx or plain text',
  '.odt': 'save it as .docx',
  '.pdf': 'export the text to .txt or .docx first',
  '.pages': 'export it as .docx',
};

export const SUPPORTED_EXTENSIONS = Object.keys(FORMATS);

/** The format a file name implies; a UserError for anything else. */
export function formatOf(fileName: string): SourceFormat {
  const ext = extname(fileName).toLowerCase();
  const f = FORMATS[ext];
  if (f) return f;
  const advice = ADVICE[ext];
  throw new UserError(
    `cannot read ${ext ? `"${ext}"` : 'files without an extension'}: ${advice ?? `use one of ${SUPPORTED_EXTENSIONS.join(' ')}`}`,
    fileName,
  );
}

export async function readTranscriptFile(path: string, opts?: ReadOptions): Promise<{ transcripts: Transcript[]; hash: string }> {
  formatOf(path);
  let bytes: Buffer;
  try {
    const size = (await stat(path)).size;
    const max = maxBytes(opts);
    if (size > max) throw tooLarge(size, max, path);
    bytes = await readFile(path);
  } catch (e) {
    if (e instanceof UserError) throw e;
    const code = (e as NodeJS.ErrnoException).code;
    const why = code === 'ENOENT' ? 'no such file' : code === 'EISDIR' ? 'is a folder, not a file' : code === 'EACCES' ? 'permission denied' : 'cannot be read';
    throw new UserError(why, path);
  }
  const hash = createHash('sha256').update(bytes).digest('hex');
  return { transcripts: await readTranscriptBytes(bytes, path, opts), hash };
}

function maxBytes(opts: ReadOptions = {}): number {
  return (opts.maxMb ?? DEFAULT_MAX_MB) * 1024 * 1024;
}

export async function readTranscriptBytes(bytes: Buffer, fileName: string, opts: ReadOptions = {}): Promise<Transcript[]> {
  const format = formatOf(fileName);
  if (format === 'docx') {
    const source = await docxText(bytes, fileName, maxBytes(opts));
    return [textTranscript(source, 'docx', fileName, [])];
  }
  const { text, warnings } = decodeText(bytes, fileName);
  switch (format) {
    case 'csv':
      return parseCsv(text, fileName, opts, warnings);
    case 'vtt':
    case 'srt': {
      const p = format === 'vtt' ? parseVtt(text, fileName) : parseSrt(text, fileName);
      return [{ name: transcriptName(fileName), format, source: text, turns: p.turns, labelled: p.labelled, warnings: [...warnings, ...p.warnings] }];
    }
    default:
      return [textTranscript(text, format, fileName, warnings)];
  }
}

function textTranscript(source: string, format: 'txt' | 'md' | 'docx', fileName: string, warnings: string[]): Transcript {
  const p = parseText(source, format, fileName);
  if (p.turns.length === 0) throw new UserError('no text found (only headings or inline codes?)', fileName);
  return { name: transcriptName(fileName), format, source, turns: p.turns, labelled: p.labelled, warnings: [...warnings, ...p.warnings] };
}
