/** SubRip (.srt): numbered blocks, a "00:00:20,000 --> 00:00:24,400" timing line, then text. */
import { UserError } from '../errors.js';
import { assertCodesClosed } from './codes.js';
import { checkCueTimes, cuesToTurns, looksLikeTiming, type Cue, type CueLine, type CueParse } from './cues.js';
import { splitLines, toBlocks, type SourceLine } from './lines.js';
import { finishTurns } from './turns.js';

const TS = String.raw`(\d{1,3}):([0-5]\d):([0-5]\d)[,.](\d{1,3})`;
/** Some writers add "X1:.. Y2:.." display coordinates after the timing; they are ignored. */
const TIMING = new RegExp(String.raw`^[ \t]*${TS}[ \t]*-->[ \t]*${TS}(?:[ \t]+.*)?$`);
const INDEX = /^[ \t]*\d+[ \t]*$/;

export function parseSrt(source: string, file: string): CueParse {
  assertCodesClosed(source, file);
  const warnings: string[] = [];
  const cues: Cue[] = [];
  for (const block of toBlocks(splitLines(source))) {
    const hasIndex = INDEX.test(block[0]!.text);
    const t = hasIndex ? 1 : 0;
    const timing = block[t];
    if (timing && timing.text.includes('-->')) {
      // A timing line inside the text is the next cue, its blank line missing: read as text it would
      // turn the timing into words.
      let at = t;
      while (at < block.length) {
        let next = block.findIndex((l, k) => k > at && TIMING.test(l.text));
        if (next === -1) next = block.length;
        let textEnd = next;
        if (next < block.length) {
          if (next - 1 > at && INDEX.test(block[next - 1]!.text)) textEnd = next - 1;
          warnings.push(`${file}:${block[textEnd]!.no}: no blank line before this cue; read as a new cue`);
        }
        cues.push(readCue(block[at]!, block.slice(at + 1, textEnd), file));
        at = next;
      }
    } else if (hasIndex) {
      const where = timing ?? block[0]!;
      throw new UserError(
        `cue ${block[0]!.text.trim()} has no timing line: expected "00:00:20,000 --> 00:00:24,400" on the line after the number`,
        file,
        where.no,
      );
    } else if (block.length > 1 && block[1]!.text.includes('-->')) {
      // A timing line after something that is not a cue number: reading on would store the timing as text.
      throw new UserError(
        `cue number "${block[0]!.text.trim().slice(0, 40)}" is not a number: a SubRip cue starts with its number (1, 2, 3, ...) alone on the line before its timing`,
        file,
        block[0]!.no,
      );
    } else if (looksLikeTiming(block[0]!.text)) {
      throw brokenTiming(block[0]!, file);
    } else if (cues.length === 0) {
      throw new UserError('not a SubRip file: a block must start with a number and a timing line such as "00:00:20,000 --> 00:00:24,400"', file, block[0]!.no);
    } else {
      // Text after a blank line inside a cue: keep it with the cue before.
      cues[cues.length - 1]!.segments[0]!.lines.push(...cleanLines(block));
      warnings.push(`${file}:${block[0]!.no}: text after a blank line was joined to the cue before it`);
    }
  }
  if (cues.length === 0) throw new UserError('no cues found: the file holds no subtitles', file);
  checkCueTimes(cues, file, warnings);
  const turns = finishTurns(cuesToTurns(cues), warnings, file);
  return { turns, labelled: turns.some((x) => x.speaker !== null), warnings };
}

function readCue(timing: SourceLine, text: SourceLine[], file: string): Cue {
  const m = TIMING.exec(timing.text);
  if (!m) throw brokenTiming(timing, file);
  const start = seconds(m[1]!, m[2]!, m[3]!, m[4]!);
  const end = seconds(m[5]!, m[6]!, m[7]!, m[8]!);
  return { start, end, segments: [{ voice: null, lines: cleanLines(text) }], line: timing.no };
}

function brokenTiming(line: SourceLine, file: string): UserError {
  return new UserError(`broken cue timing "${line.text.trim().slice(0, 80)}": expected "hh:mm:ss,ttt --> hh:mm:ss,ttt"`, file, line.no);
}

function seconds(h: string, m: string, s: string, ms: string): number {
  return Number(h) * 3600 + Number(m) * 60 + Number(s) + Number(ms.padEnd(3, '0')) / 1000;
}

/** Removes HTML-like tags (<i>, <font ...>) and "{\an8}"-style positioning codes. */
function cleanLines(lines: SourceLine[]): CueLine[] {
  const out: CueLine[] = [];
  for (const l of lines) {
    let t = l.text;
    if (t.includes('<')) t = t.replace(/<\/?[a-zA-Z][^<>]*>/g, '');
    if (t.includes('{\\')) t = t.replace(/\{\\[^{}]*\}/g, '');
    if (t.trim() !== '') out.push({ text: t, from: l.start, to: l.end });
  }
  return out;
}
