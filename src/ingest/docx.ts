/** .docx to text with mammoth; paragraphs come out separated by blank lines. */
import { createRequire } from 'node:module';
import type Mammoth from 'mammoth';
import { UserError } from '../errors.js';
import { normaliseText } from './decode.js';
import { tooLarge } from './limits.js';

const DAMAGED = 'not a readable .docx (damaged or not a Word file)';

/**
 * What the zip's entries add up to once expanded, from its central directory (the sizes each
 * entry declares, PKWARE APPNOTE 4.3.12), or null when the directory cannot be found. A small
 * .docx can expand to gigabytes; this is read before anything is expanded.
 */
export function expandedSize(bytes: Buffer): number | null {
  const min = 22;
  for (let end = bytes.length - min; end >= Math.max(0, bytes.length - min - 0xffff); end--) {
    if (bytes.readUInt32LE(end) !== 0x06054b50) continue;
    const entries = bytes.readUInt16LE(end + 10);
    let at = bytes.readUInt32LE(end + 16);
    let total = 0;
    for (let i = 0; i < entries; i++) {
      if (at + 46 > bytes.length || bytes.readUInt32LE(at) !== 0x02014b50) return null;
      const size = bytes.readUInt32LE(at + 24);
      total += size === 0xffffffff ? Infinity : size; // zip64: more than 4 GB
      at += 46 + bytes.readUInt16LE(at + 28) + bytes.readUInt16LE(at + 30) + bytes.readUInt16LE(at + 32);
    }
    return total;
  }
  return null;
}

export async function docxText(bytes: Buffer, file: string, maxBytes = Infinity): Promise<string> {
  // Every .docx is a zip, which starts "PK\x03\x04"; checking first gives a clear message at once.
  if (bytes.length < 4 || bytes.readUInt32LE(0) !== 0x04034b50) throw new UserError(DAMAGED, file);
  const expanded = expandedSize(bytes);
  if (expanded === null) throw new UserError(DAMAGED, file);
  if (expanded > maxBytes) throw tooLarge(expanded, maxBytes, file, 'the document, expanded,');
  let value: string;
  try {
    ({ value } = await (createRequire(import.meta.url)('mammoth') as typeof Mammoth).extractRawText({ buffer: bytes }));
  } catch {
    throw new UserError(DAMAGED, file);
  }
  const text = normaliseText(value);
  if (text.trim() === '') throw new UserError('the document has no text', file);
  return text;
}
