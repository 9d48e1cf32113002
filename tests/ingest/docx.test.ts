import { describe, expect, test } from 'vitest';
import { readTranscriptBytes } from '../../src/ingest/read.js';
import { UserError } from '../../src/errors.js';
import { makeDocx, storeZip } from '../helpers/docx.js';

const PARAGRAPHS = [
  'Interview 12 (invented)',
  'Interviewer: What changed when the clinic moved?',
  '**P12:** The bus takes forty minutes now {theme: Access > Transport}.',
  'My sister drives me when she can.',
  'Interviewer: And the appointments themselves?',
  'P12: Shorter. Much shorter & more rushed <honestly>.',
];

async function fails(bytes: Buffer, name = 'broken.docx'): Promise<UserError> {
  const err = await readTranscriptBytes(bytes, name).catch((e) => e);
  expect(err).toBeInstanceOf(UserError);
  return err as UserError;
}

describe('.docx', () => {
  test('paragraphs are read with label detection, bold labels included', async () => {
    const [t] = await readTranscriptBytes(makeDocx(PARAGRAPHS), 'p12.docx');
    expect(t!.format).toBe('docx');
    expect(t!.name).toBe('p12');
    expect(t!.labelled).toBe(true);
    expect(t!.turns.map((x) => [x.speaker, x.text])).toEqual([
      [null, 'Interview 12 (invented)'],
      ['Interviewer', 'What changed when the clinic moved?'],
      ['P12', 'The bus takes forty minutes now.\n\nMy sister drives me when she can.'],
      ['Interviewer', 'And the appointments themselves?'],
      ['P12', 'Shorter. Much shorter & more rushed <honestly>.'],
    ]);
    expect(t!.turns[2]!.codes).toEqual([{ paths: ['Access > Transport'], at: 'The bus takes forty minutes now'.length }]);
    // The source is mammoth's text: paragraphs separated by blank lines.
    expect(t!.source.startsWith('Interview 12 (invented)\n\nInterviewer: What changed')).toBe(true);
  });

  test('the same words in .docx and .txt give the same turns', async () => {
    const plain = PARAGRAPHS.map((p) => p.replace(/\*\*/g, '')).join('\n\n');
    const [d] = await readTranscriptBytes(makeDocx(PARAGRAPHS), 'x.docx');
    const [t] = await readTranscriptBytes(Buffer.from(plain), 'x.txt');
    expect(d!.turns.map((x) => [x.speaker, x.text, x.codes])).toEqual(t!.turns.map((x) => [x.speaker, x.text, x.codes]));
  });

  test('a file that is not a zip is refused', async () => {
    const e = await fails(Buffer.from('Interviewer: this is plain text saved as .docx\n'), 'renamed.docx');
    expect(e.message).toBe('not a readable .docx (damaged or not a Word file)');
    expect(e.file).toBe('renamed.docx');
  });

  test('a truncated .docx is refused', async () => {
    const whole = makeDocx(PARAGRAPHS);
    const e = await fails(whole.subarray(0, Math.floor(whole.length / 2)));
    expect(e.message).toBe('not a readable .docx (damaged or not a Word file)');
  });

  test('a zip that is not a Word document is refused', async () => {
    const e = await fails(storeZip([{ name: 'notes.txt', data: Buffer.from('hello') }]), 'other.docx');
    expect(e.message).toBe('not a readable .docx (damaged or not a Word file)');
  });

  test('a document with no text is refused', async () => {
    const e = await fails(makeDocx(['', '   ']), 'blank.docx');
    expect(e.message).toBe('the document has no text');
  });
});
