/** Marking matched terms in a passage's text: [brackets] always, bold too on a colour terminal. */

export function useColour(): boolean {
  return Boolean(process.stdout.isTTY) && !process.env.NO_COLOR && process.env.TERM !== 'dumb';
}

export function markTerms(text: string, lemmas: string[], spans: Int32Array, terms: Set<string>, colour = useColour()): string {
  let out = '';
  let pos = 0;
  for (let i = 0; i < lemmas.length; i++) {
    if (!terms.has(lemmas[i]!)) continue;
    const s = spans[2 * i]!;
    const e = spans[2 * i + 1]!;
    if (s < pos) continue;
    out += text.slice(pos, s) + (colour ? `\x1b[1m[${text.slice(s, e)}]\x1b[22m` : `[${text.slice(s, e)}]`);
    pos = e;
  }
  return out + text.slice(pos);
}

/** Wraps text to a width, with an indent on every line. */
export function wrap(text: string, width: number, indent: string): string {
  const words = text.replace(/\s+/g, ' ').trim().split(' ');
  const lines: string[] = [];
  let line = '';
  for (const w of words) {
    // eslint-disable-next-line no-control-regex
    const visible = (line + ' ' + w).replace(/\x1b\[[0-9;]*m/g, '');
    if (line && visible.length > width) {
      lines.push(indent + line);
      line = w;
    } else line = line ? line + ' ' + w : w;
  }
  if (line) lines.push(indent + line);
  return lines.join('\n');
}
