/** Bytes to text: detect the encoding, refuse binary or empty files, normalise. */
import { UserError } from '../errors.js';

export type Encoding = 'utf-8' | 'utf-16le' | 'utf-16be' | 'windows-1252';

export interface Decoded {
  /** Normalised text: no BOM, line endings "\n", Unicode NFC. */
  text: string;
  encoding: Encoding;
  /** Each warning names the file. */
  warnings: string[];
}

const utf8 = new TextDecoder('utf-8', { fatal: true });
const utf16le = new TextDecoder('utf-16le', { fatal: true });
/**
 * Windows-1252 differs from Latin-1 only in 0x80-0x9F. Node's TextDecoder('windows-1252') decodes
 * those bytes as Latin-1 control characters, so the 32 code points are mapped here.
 */
const CP1252_HIGH = [
  0x20ac, 0x81, 0x201a, 0x192, 0x201e, 0x2026, 0x2020, 0x2021, 0x2c6, 0x2030, 0x160, 0x2039, 0x152, 0x8d, 0x17d, 0x8f,
  0x90, 0x2018, 0x2019, 0x201c, 0x201d, 0x2022, 0x2013, 0x2014, 0x2dc, 0x2122, 0x161, 0x203a, 0x153, 0x9d, 0x17e, 0x178,
];

export function decodeWindows1252(bytes: Uint8Array): string {
  const latin1 = Buffer.from(bytes.buffer, bytes.byteOffset, bytes.byteLength).toString('latin1');
  return latin1.replace(/[\u0080-\u009f]/g, (c) => String.fromCharCode(CP1252_HIGH[c.charCodeAt(0) - 0x80]!));
}

/** How much of a file the binary check looks at: enough to judge, cheap on large files. */
const SAMPLE = 1 << 20;

export function decodeText(bytes: Uint8Array, file: string): Decoded {
  if (bytes.length === 0) throw new UserError('the file is empty', file);
  const warnings: string[] = [];
  let encoding: Encoding;
  let text: string;

  const bom16 = bytes.length >= 2 ? (bytes[0] === 0xff && bytes[1] === 0xfe ? 'le' : bytes[0] === 0xfe && bytes[1] === 0xff ? 'be' : null) : null;
  const guess16 = bom16 ?? guessBomlessUtf16(bytes);
  if (guess16) {
    encoding = guess16 === 'le' ? 'utf-16le' : 'utf-16be';
    text = decodeUtf16(bytes.subarray(bom16 ? 2 : 0), guess16, file, warnings);
    if (!bom16) warnings.push(`${file}: no byte order mark; read as ${encoding.toUpperCase()}`);
  } else {
    if (hasNul(bytes)) throw new UserError('looks like a binary file, not text', file);
    try {
      text = utf8.decode(bytes);
      encoding = 'utf-8';
    } catch {
      text = decodeWindows1252(bytes);
      encoding = 'windows-1252';
      warnings.push(`${file}: not valid UTF-8; read as Windows-1252 — check accented characters`);
    }
  }

  if (text.charCodeAt(0) === 0xfeff) text = text.slice(1);
  if (looksBinary(text)) throw new UserError('looks like a binary file, not text', file);
  if (text.trim() === '') throw new UserError('the file is empty', file);
  return { text: normaliseText(text), encoding, warnings };
}

/** Line endings to "\n", no BOM, NFC: the form every reader's offsets point into. */
export function normaliseText(text: string): string {
  let t = text.charCodeAt(0) === 0xfeff ? text.slice(1) : text;
  if (t.includes('\r')) t = t.replace(/\r\n?/g, '\n');
  return t.normalize('NFC');
}

function decodeUtf16(bytes: Uint8Array, order: 'le' | 'be', file: string, warnings: string[]): string {
  let b = bytes;
  // UTF-16 text is whole 2-byte units; an odd count means the file was cut short or damaged.
  if (b.length % 2 === 1) {
    b = b.subarray(0, b.length - 1);
    warnings.push(`${file}: UTF-16 text with an odd number of bytes (cut short or damaged?); the last byte was dropped`);
  }
  if (order === 'be') {
    const swapped = Buffer.from(b);
    swapped.swap16();
    b = swapped;
  }
  try {
    return utf16le.decode(b);
  } catch {
    throw new UserError(`not valid UTF-16 text (damaged file?)`, file);
  }
}

function hasNul(bytes: Uint8Array): boolean {
  return bytes.indexOf(0) !== -1;
}

/**
 * UTF-16 saved without a byte order mark: ASCII-range text then has a zero in every other byte.
 * Recognising it avoids calling a plain text file "binary".
 */
function guessBomlessUtf16(bytes: Uint8Array): 'le' | 'be' | null {
  const n = Math.min(bytes.length, 4096) & ~1;
  if (n < 4) return null;
  let evenZero = 0;
  let oddZero = 0;
  for (let i = 0; i < n; i += 2) {
    if (bytes[i] === 0) evenZero++;
    if (bytes[i + 1] === 0) oddZero++;
  }
  const pairs = n / 2;
  if (oddZero >= pairs * 0.6 && evenZero <= pairs * 0.05) return 'le';
  if (evenZero >= pairs * 0.6 && oddZero <= pairs * 0.05) return 'be';
  return null;
}

/** A high share of control characters (other than tab, newline, CR, form feed) means binary. */
function looksBinary(text: string): boolean {
  const n = Math.min(text.length, SAMPLE);
  let control = 0;
  for (let i = 0; i < n; i++) {
    const c = text.charCodeAt(i);
    if (c === 0) return true;
    if ((c < 0x20 && c !== 0x09 && c !== 0x0a && c !== 0x0d && c !== 0x0c) || c === 0x7f) control++;
  }
  return n > 0 && control / n > 0.1;
}
