/**
 * Speaker labels and timestamps at the start of a line:
 *   "[00:03:41] Name: text", "Name [03:41]: text", "Name: [03:41] text", "**Name:** text",
 *   "00:03:41 P3: text", and a header line holding only "Name 00:03:41".
 * Only the first few hundred characters of a line are examined, so a huge line costs nothing.
 */

export interface LabelMatch {
  /** The label as written (without markup), or null when the line only starts with a timestamp. */
  speaker: string | null;
  /** Seconds, when a timestamp goes with the label. */
  start: number | null;
  /** Index in the line where the turn's own words begin. */
  contentStart: number;
  /** A bracketed timestamp no clock can show ("[99:99:99]"), as written: skipped, so the turn has no time. */
  badStamp?: string;
}

const HEAD = 240;
const MAX_LABEL = 40;
const MAX_WORDS = 4;

/** Title abbreviations that may carry a full stop inside a label ("Dr. Quell"). */
const TITLES = new Set(['dr.', 'mr.', 'mrs.', 'ms.', 'mx.', 'prof.', 'rev.', 'sr.', 'st.']);
/** Lower-case particles allowed inside a name ("Ana de Souza"). */
const PARTICLES = new Set(['de', 'da', 'das', 'do', 'dos', 'du', 'van', 'von', 'der', 'den', 'la', 'le', 'di', 'del', 'bin', 'ibn', 'al', 'el', 'ten', 'ter']);
/** Capitalised words that introduce notes or header fields, not speakers. */
const NOT_SPEAKERS = new Set([
  'note', 'notes', 'nb', 'ps', 'example', 'examples', 'e.g', 'eg', 'i.e', 'ie', 'date', 'time', 'location', 'place', 'venue', 'site',
  'duration', 'length', 'transcript', 'transcribed by', 'interview date', 'project', 'title', 'subject', 're', 'ref', 'reference',
  'tel', 'phone', 'email', 'e-mail', 'http', 'https', 'www', 'warning', 'caution', 'tip', 'update', 'edit', 'source', 'summary',
]);

/**
 * Reads a label and/or timestamp at the start of `line`.
 * Returns null when the line starts with neither (or with a bare timestamp and no label,
 * which is more likely a time of day in the text).
 */
export function parseLabel(line: string): LabelMatch | null {
  const s = line.length > HEAD ? line.slice(0, HEAD) : line;
  let i = skipSpaces(s, 0);
  let start: number | null = null;
  let bareLead = false;
  let bad: string | undefined;

  const lead = readTimestamp(s, i, true);
  if (lead) {
    start = lead.seconds;
    bareLead = lead.bare;
    bad = lead.bad;
    i = skipSeparator(s, lead.end);
  }

  const lab = readLabel(s, i);
  if (lab) {
    let j = skipSpaces(s, lab.end);
    bad ??= lab.bad;
    if (start === null) start = lab.start;
    if (start === null && bad === undefined) {
      const after = readTimestamp(s, j, false);
      if (after) {
        start = after.seconds;
        bad = after.bad;
        j = skipSeparator(s, after.end);
      }
    }
    return withBad({ speaker: lab.name, start, contentStart: j }, bad);
  }

  const header = line.length <= 80 ? readHeaderLine(s, i) : null;
  if (header) return withBad({ speaker: header.name, start: start ?? header.seconds, contentStart: line.length }, bad ?? header.bad);

  if ((start !== null || bad !== undefined) && !bareLead) return withBad({ speaker: null, start, contentStart: i }, bad);
  return null;
}

function withBad(m: LabelMatch, bad: string | undefined): LabelMatch {
  if (bad !== undefined) m.badStamp = bad;
  return m;
}

/** Parses "hh:mm:ss", "mm:ss" (optionally with ".ttt" or ",ttt") to seconds; null if malformed. */
export function parseClock(text: string): number | null {
  const m = /^(\d{1,3}):([0-5]\d)(?::([0-5]\d))?(?:[.,](\d{1,3}))?$/.exec(text);
  if (!m) return null;
  const frac = m[4] ? Number(`0.${m[4]}`) : 0;
  const [a, b, c] = [Number(m[1]), Number(m[2]), m[3] === undefined ? null : Number(m[3])];
  const seconds = c === null ? a * 60 + b : a * 3600 + b * 60 + c;
  return seconds + frac;
}

/** True when `name` reads like a speaker label rather than the start of a sentence. */
export function isLabelName(name: string): boolean {
  if (name.length === 0 || name.length > MAX_LABEL || name !== name.trim()) return false;
  if (NOT_SPEAKERS.has(name.toLowerCase())) return false;
  const words = name.split(/\s+/);
  if (words.length > MAX_WORDS) return false;
  for (let k = 0; k < words.length; k++) {
    const w = words[k]!;
    const first = k === 0;
    const last = k === words.length - 1;
    if (TITLES.has(w.toLowerCase()) && !last) continue;
    if (/^\p{Lu}\.$/u.test(w) && !last) continue; // an initial: "J. Smith"
    if (/^[\p{Lu}\p{Lt}][\p{L}\p{M}\p{N}'’-]*$/u.test(w)) continue;
    if (!first && /^\d{1,3}$/.test(w)) continue; // "Interviewer 2"
    if (!first && !last && PARTICLES.has(w)) continue;
    if (!first && /^#\d{1,3}$/.test(w)) continue; // "Speaker #2"
    return false;
  }
  return true;
}

interface Stamp {
  /** null for an impossible clock ("[99:99:99]"), which `bad` then holds as written. */
  seconds: number | null;
  end: number;
  bare: boolean;
  bad?: string;
}

/** Shaped like a clock, whatever the numbers: "99:99:99", "12:75", "1:02:60.5" (not a ratio such as "1:2"). */
const CLOCK_SHAPED = /^\d{1,3}:\d{2}(?::\d{2})?(?:[.,]\d{1,3})?$/;

/** "[..]" or "(..)" around a clock, or a bare clock when `allowBare`. */
function readTimestamp(s: string, i: number, allowBare: boolean): Stamp | null {
  const open = s[i];
  if (open === '[' || open === '(') {
    const close = s.indexOf(open === '[' ? ']' : ')', i + 1);
    if (close === -1 || close - i > 16) return null;
    const inside = s.slice(i + 1, close).trim();
    const seconds = parseClock(inside);
    if (seconds !== null) return { seconds, end: close + 1, bare: false };
    // A bracketed clock with impossible numbers is still a timestamp: reading it as words would
    // merge the line into the turn before, so it is skipped and reported instead.
    return CLOCK_SHAPED.test(inside) ? { seconds: null, end: close + 1, bare: false, bad: s.slice(i, close + 1) } : null;
  }
  if (!allowBare) return null;
  const m = /^\d{1,2}:\d{2}(?::\d{2})?(?:[.,]\d{1,3})?/.exec(s.slice(i, i + 16));
  if (!m) return null;
  const end = i + m[0].length;
  if (end < s.length && !/[\s\-–—]/.test(s[end]!)) return null;
  const seconds = parseClock(m[0]);
  return seconds === null ? null : { seconds, end, bare: true };
}

interface Label {
  name: string;
  start: number | null;
  end: number;
  bad?: string;
}

/** "Name:", "Name [ts]:", "**Name:**", "**Name**:" followed by whitespace or the end of the line. */
function readLabel(s: string, i: number): Label | null {
  let p = i;
  const bold = s.startsWith('**', p);
  if (bold) p += 2;
  let j = p;
  while (j < s.length && j - p <= MAX_LABEL) {
    const c = s[j]!;
    if (c === ':' || c === '*' || c === '[' || c === '(' || c === '\t') break;
    j++;
  }
  if (j - p > MAX_LABEL || j >= s.length) return null;
  const name = s.slice(p, j).trim();
  let k = j;
  let start: number | null = null;
  let bad: string | undefined;
  if (s[k] === '[' || s[k] === '(') {
    const t = readTimestamp(s, k, false);
    if (!t) return null;
    start = t.seconds;
    bad = t.bad;
    k = skipSpaces(s, t.end);
  }
  if (bold) {
    if (s.startsWith(':**', k) || s.startsWith('**:', k)) k += 3;
    else return null;
  } else {
    if (s[k] !== ':') return null;
    k++;
  }
  if (k < s.length && !/\s/.test(s[k]!)) return null; // "http://", "10:30"
  if (!isLabelName(name)) return null;
  return bad === undefined ? { name, start, end: k } : { name, start, end: k, bad };
}

/** A line holding only a label and a timestamp, the words following on the next lines. */
function readHeaderLine(s: string, i: number): { name: string; seconds: number | null; bad?: string } | null {
  const m = /^(\S(?:[^\t:]{0,38}\S)?)[ \t]+(\[[^\]]{1,14}\]|\([^)]{1,14}\)|\d{1,2}:\d{2}(?::\d{2})?(?:[.,]\d{1,3})?)[ \t]*$/.exec(s.slice(i));
  if (!m) return null;
  const name = m[1]!;
  const stamp = m[2]!;
  const bracketed = /^[[(]/.test(stamp);
  const inside = bracketed ? stamp.slice(1, -1).trim() : stamp;
  const seconds = parseClock(inside);
  if (!isLabelName(name)) return null;
  if (seconds === null) return bracketed && CLOCK_SHAPED.test(inside) ? { name, seconds: null, bad: stamp } : null;
  return { name, seconds };
}

function skipSpaces(s: string, i: number): number {
  while (i < s.length && (s[i] === ' ' || s[i] === '\t')) i++;
  return i;
}

/** Spaces, and one dash between a timestamp and what follows ("[00:03] - Name:"). */
function skipSeparator(s: string, i: number): number {
  i = skipSpaces(s, i);
  if (s[i] === '-' || s[i] === '–' || s[i] === '—') i = skipSpaces(s, i + 1);
  return i;
}
