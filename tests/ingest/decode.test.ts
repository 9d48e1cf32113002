import { describe, expect, test } from 'vitest';
import { decodeText, normaliseText } from '../../src/ingest/decode.js';
import { refusal } from '../helpers/refusal.js';

const SAMPLE = 'Interviewer: Where did you train?\n\nP1: In Lyon, at the école — then Zürich.\n';

function utf16(text: string, order: 'le' | 'be', bom = true): Buffer {
  const le = Buffer.from((bom ? '\ufeff' : '') + text, 'utf16le');
  if (order === 'be') le.swap16();
  return le;
}

describe('decodeText', () => {
  test('UTF-8 without and with BOM give the same text, BOM stripped', () => {
    const plain = decodeText(Buffer.from(SAMPLE, 'utf8'), 'a.txt');
    const bom = decodeText(Buffer.concat([Buffer.from([0xef, 0xbb, 0xbf]), Buffer.from(SAMPLE, 'utf8')]), 'a.txt');
    expect(plain.text).toBe(SAMPLE);
    expect(bom.text).toBe(SAMPLE);
    expect(plain.encoding).toBe('utf-8');
    expect(plain.warnings).toEqual([]);
  });

  test('UTF-16 LE and BE with BOM are accepted and equal the UTF-8 reading', () => {
    const le = decodeText(utf16(SAMPLE, 'le'), 'le.txt');
    const be = decodeText(utf16(SAMPLE, 'be'), 'be.txt');
    expect(le.encoding).toBe('utf-16le');
    expect(be.encoding).toBe('utf-16be');
    expect(le.text).toBe(SAMPLE);
    expect(be.text).toBe(SAMPLE);
    expect(le.warnings).toEqual([]);
  });

  test('UTF-16 LE without a BOM is recognised (with a warning) rather than called binary', () => {
    const r = decodeText(utf16(SAMPLE, 'le', false), 'nobom.txt');
    expect(r.text).toBe(SAMPLE);
    expect(r.warnings[0]).toContain('nobom.txt');
  });

  test('UTF-16 with an odd number of bytes warns, naming the file, instead of dropping a byte silently', () => {
    // UTF-16 stores text in 2-byte code units (Unicode Standard, ch. 3, D91): a trailing odd byte is no character.
    for (const order of ['le', 'be'] as const) {
      const bytes = Buffer.concat([utf16(SAMPLE, order), Buffer.from([0x41])]);
      const r = decodeText(bytes, 'odd.txt');
      expect(r.text).toBe(SAMPLE);
      expect(r.warnings).toEqual(['odd.txt: UTF-16 text with an odd number of bytes (cut short or damaged?); the last byte was dropped']);
    }
    expect(decodeText(utf16(SAMPLE, 'le'), 'even.txt').warnings).toEqual([]);
  });

  test('Windows-1252 bytes are read with a warning naming the file', () => {
    // "Café – “quoted” €5" in Windows-1252: é=E9, en dash=96, curly quotes=93/94, euro=80.
    const bytes = Buffer.from([0x43, 0x61, 0x66, 0xe9, 0x20, 0x96, 0x20, 0x93, 0x71, 0x94, 0x20, 0x80, 0x35]);
    const r = decodeText(bytes, 'notes/p4.txt');
    expect(r.encoding).toBe('windows-1252');
    expect(r.text).toBe('Café – “q” €5');
    expect(r.warnings).toHaveLength(1);
    expect(r.warnings[0]).toContain('notes/p4.txt');
    expect(r.warnings[0]).toContain('not valid UTF-8; read as Windows-1252');
  });

  test('binary content is refused: NUL bytes, or mostly control characters', () => {
    const png = Buffer.from([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a, 0x00, 0x00, 0x00, 0x0d, 0x49, 0x48, 0x44, 0x52]);
    const e1 = refusal(() => decodeText(png, 'image.txt'));
    expect(e1.message).toBe('looks like a binary file, not text');
    expect(e1.file).toBe('image.txt');
    const controls = Buffer.from(Array.from({ length: 200 }, (_, i) => (i % 3 === 0 ? 0x41 : (i % 30) + 1)));
    expect(refusal(() => decodeText(controls, 'c.txt')).message).toBe('looks like a binary file, not text');
  });

  test('empty and whitespace-only files are refused', () => {
    expect(refusal(() => decodeText(Buffer.alloc(0), 'e.txt')).message).toBe('the file is empty');
    expect(refusal(() => decodeText(Buffer.from(' \n\t\r\n  \n'), 'w.txt')).message).toBe('the file is empty');
    expect(refusal(() => decodeText(Buffer.from([0xef, 0xbb, 0xbf, 0x0a]), 'bom.txt')).message).toBe('the file is empty');
    expect(refusal(() => decodeText(utf16('  \n', 'le'), 'w16.txt')).message).toBe('the file is empty');
  });

  test('line endings become \\n and text is NFC', () => {
    const decomposed = 'Cafe\u0301\r\nline two\rline three\n';
    const r = decodeText(Buffer.from(decomposed, 'utf8'), 'n.txt');
    expect(r.text).toBe('Café\nline two\nline three\n');
    expect(r.text.length).toBe(25);
    expect(normaliseText('\ufeffa\r\nb')).toBe('a\nb');
  });
});
