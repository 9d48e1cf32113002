/** Line bookkeeping shared by the readers: offsets into the normalised source, 1-based numbers. */

export interface SourceLine {
  /** Offset of the first character of the line in the source. */
  start: number;
  /** Offset just past the last character (the "\n" is not included). */
  end: number;
  /** 1-based line number. */
  no: number;
  text: string;
}

/** Split normalised text (line endings already "\n") into lines, in one pass with indexOf. */
export function splitLines(source: string): SourceLine[] {
  const out: SourceLine[] = [];
  let start = 0;
  let no = 1;
  for (;;) {
    const nl = source.indexOf('\n', start);
    const end = nl === -1 ? source.length : nl;
    out.push({ start, end, no, text: source.slice(start, end) });
    if (nl === -1) break;
    start = nl + 1;
    no++;
  }
  return out;
}

/** True for an empty line or one holding only spaces and tabs. */
export function isBlank(text: string): boolean {
  return !/[^ \t\f\v\u00a0]/.test(text);
}

/** Blocks of consecutive non-blank lines. */
export function toBlocks(lines: SourceLine[]): SourceLine[][] {
  const blocks: SourceLine[][] = [];
  let cur: SourceLine[] | null = null;
  for (const l of lines) {
    if (isBlank(l.text)) cur = null;
    else if (cur) cur.push(l);
    else blocks.push((cur = [l]));
  }
  return blocks;
}
