/**
 * WebVTT (W3C "WebVTT: The Web Video Text Tracks Format"): the header, cue blocks with optional
 * identifiers, NOTE/STYLE/REGION/ATTRIBUTES blocks skipped, cue settings ignored, voice spans give
 * the speaker, other markup removed and character references decoded.
 */
import { UserError } from '../errors.js';
import { assertCodesClosed } from './codes.js';
import { checkCueTimes, cuesToTurns, looksLikeTiming, type Cue, type CueLine, type CueParse, type CueSegment } from './cues.js';
import { splitLines, toBlocks, type SourceLine } from './lines.js';
import { finishTurns } from './turns.js';

const HEADER = /^WEBVTT(?:[ \t].*)?$/;
const TS = String.raw`(?:(\d{2,}):)?([0-5]\d):([0-5]\d)\.(\d{3})`;
const TIMING = new RegExp(String.raw`^[ \t]*${TS}[ \t]*-->[ \t]*${TS}(?:[ \t]+.*)?$`);
const SKIPPED_BLOCK = /^(?:NOTE(?:[ \t].*)?|STYLE[ \t]*|REGION[ \t]*|ATTRIBUTES[ \t]*)$/;

export function parseVtt(source: string, file: string): CueParse {
  const lines = splitLines(source);
  if (!HEADER.test(lines[0]!.text)) {
    throw new UserError('not a WebVTT file: the first line must be "WEBVTT"', file, 1);
  }
  assertCodesClosed(source, file);
  const warnings: string[] = [];
  const cues: Cue[] = [];
  const blocks = toBlocks(lines);
  // The header block runs to the first blank line; a timing line inside it still starts a cue.
  const header = blocks.shift()!;
  const firstTiming = header.findIndex((l) => l.text.includes('-->'));
  if (firstTiming !== -1) blocks.unshift(header.slice(firstTiming));

  for (const block of blocks) {
    const first = block[0]!;
    if (SKIPPED_BLOCK.test(first.text)) continue;
    let t: number;
    if (first.text.includes('-->')) t = 0;
    else if (block.length > 1 && block[1]!.text.includes('-->')) t = 1;
    else if (looksLikeTiming(first.text)) throw brokenTiming(first, file);
    else if (block.length > 1 && looksLikeTiming(block[1]!.text)) throw brokenTiming(block[1]!, file);
    else {
      joinOrphan(cues, block, file, warnings);
      continue;
    }
    // A line with "-->" inside cue text starts the next cue, as in the spec's parser.
    let at = t;
    while (at < block.length) {
      let next = block.findIndex((l, k) => k > at && l.text.includes('-->'));
      if (next === -1) next = block.length;
      cues.push(readCue(block[at]!, block.slice(at + 1, next), file, warnings));
      at = next;
    }
  }
  if (cues.length === 0) throw new UserError('no cues found: a cue needs a timing line such as "00:01.000 --> 00:04.000"', file);
  checkCueTimes(cues, file, warnings);
  const turns = finishTurns(cuesToTurns(cues), warnings, file);
  return { turns, labelled: turns.some((x) => x.speaker !== null), warnings };
}

function readCue(timing: SourceLine, text: SourceLine[], file: string, warnings: string[]): Cue {
  const m = TIMING.exec(timing.text);
  if (!m) throw brokenTiming(timing, file);
  const start = seconds(m[1], m[2]!, m[3]!, m[4]!);
  const end = seconds(m[5], m[6]!, m[7]!, m[8]!);
  return { start, end, segments: cueSegments(text, unclosedVoice(file, warnings)), line: timing.no };
}

/** A "<v" with no ">" on its line: the speaker is lost, so the user is told where. */
function unclosedVoice(file: string, warnings: string[]): (line: SourceLine, tag: string) => void {
  return (line, tag) =>
    warnings.push(`${file}:${line.no}: voice tag "${tag.slice(0, 40)}" is not closed with ">": kept as text, no speaker taken from it`);
}

function brokenTiming(line: SourceLine, file: string): UserError {
  return new UserError(
    `broken cue timing "${line.text.trim().slice(0, 80)}": expected "hh:mm:ss.ttt --> hh:mm:ss.ttt" or "mm:ss.ttt --> mm:ss.ttt"`,
    file,
    line.no,
  );
}

function seconds(h: string | undefined, m: string, s: string, ms: string): number {
  return (h ? Number(h) * 3600 : 0) + Number(m) * 60 + Number(s) + Number(ms) / 1000;
}

/** Text after a blank line inside a cue: kept, joined to the cue before, and the user is told. */
function joinOrphan(cues: Cue[], block: SourceLine[], file: string, warnings: string[]): void {
  const prev = cues[cues.length - 1];
  const no = block[0]!.no;
  if (!prev) {
    warnings.push(`${file}:${no}: text before the first cue was skipped`);
    return;
  }
  const lines = cueSegments(block, unclosedVoice(file, warnings)).flatMap((s) => s.lines);
  const last = prev.segments[prev.segments.length - 1];
  if (last) last.lines.push(...lines);
  else prev.segments.push({ voice: null, lines });
  warnings.push(`${file}:${no}: text after a blank line was joined to the cue before it`);
}

const ENTITIES: Record<string, string> = {
  amp: '&', lt: '<', gt: '>', nbsp: '\u00a0', lrm: '\u200e', rlm: '\u200f', quot: '"', apos: "'",
  mdash: '—', ndash: '–', hellip: '…', lsquo: '‘', rsquo: '’', ldquo: '“', rdquo: '”', trade: '™', copy: '©', reg: '®',
};

/** Decodes named references from a small table and all numeric ones; unknown names stay as written. */
export function decodeEntities(s: string): string {
  if (!s.includes('&')) return s;
  return s.replace(/&(#[xX][0-9a-fA-F]{1,6}|#\d{1,7}|[a-zA-Z]{2,8});/g, (whole, ref: string) => {
    if (ref[0] === '#') {
      const code = ref[1] === 'x' || ref[1] === 'X' ? parseInt(ref.slice(2), 16) : parseInt(ref.slice(1), 10);
      return code > 0 && code <= 0x10ffff ? String.fromCodePoint(code) : whole;
    }
    return ENTITIES[ref] ?? whole;
  });
}

/**
 * Cue text to segments by voice. `<v Name>` and `<v.class Name>` name the voice; `<c>`, `<i>`,
 * `<b>`, `<u>`, `<lang>`, `<ruby>` and cue timestamps are removed; ruby text (`<rt>`) is dropped
 * since it annotates the base text rather than adding words.
 */
export function cueSegments(lines: SourceLine[], onUnclosedVoice?: (line: SourceLine, tag: string) => void): CueSegment[] {
  const segs: CueSegment[] = [{ voice: null, lines: [] }];
  let inRuby = false;
  for (const line of lines) {
    let out = '';
    const flush = () => {
      if (out.trim() !== '') segs[segs.length - 1]!.lines.push({ text: out, from: line.start, to: line.end } satisfies CueLine);
      out = '';
    };
    const s = line.text;
    let i = 0;
    while (i < s.length) {
      const lt = s.indexOf('<', i);
      const textEnd = lt === -1 ? s.length : lt;
      if (!inRuby) out += decodeEntities(s.slice(i, textEnd));
      if (lt === -1) break;
      const gt = s.indexOf('>', lt);
      if (gt === -1) {
        if (!inRuby) out += s.slice(lt); // a stray "<": keep it as text
        if (/^<v(?:[\s.]|$)/i.test(s.slice(lt))) onUnclosedVoice?.(line, s.slice(lt).trimEnd());
        break;
      }
      const tag = s.slice(lt + 1, gt);
      const name = /^\/?[^\s.]*/.exec(tag)![0].toLowerCase();
      if (name === 'v') {
        const voice = decodeEntities(tag.replace(/^v(?:\.[^\s]*)?/, '').trim());
        const cur = segs[segs.length - 1]!;
        if (cur.lines.length === 0 && out.trim() === '') cur.voice = voice || null;
        else if (voice && voice !== cur.voice) {
          flush();
          segs.push({ voice, lines: [] });
        }
      } else if (name === 'rt') inRuby = true;
      else if (name === '/rt' || name === '/ruby') inRuby = false;
      i = gt + 1;
    }
    flush();
  }
  return segs.filter((seg) => seg.lines.length > 0);
}
