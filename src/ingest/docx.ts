/** .docx to text with mammoth; paragraphs come out separated by blank lines. */
import mammoth from 'mammoth';
import { UserError } from '../errors.js';
import { normaliseText } from './decode.js';

const DAMAGED = 'not a readable .docx (damaged or not a Word file)';

export async function docxText(bytes: Buffer, file: string): Promise<string> {
  // Every .docx is a zip, which starts "PK\x03\x04"; checking first gives a clear message at once.
  if (bytes.length < 4 || bytes.readUInt32LE(0) !== 0x04034b50) throw new UserError(DAMAGED, file);
  let value: string;
  try {
    ({ value } = await mammoth.extractRawText({ buffer: bytes }));
  } catch {
    throw new UserError(DAMAGED, file);
  }
  const text = normaliseText(value);
  if (text.trim() === '') throw new UserError('the document has no text', file);
  return text;
}
