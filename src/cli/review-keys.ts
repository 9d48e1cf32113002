/**
 * Turning raw terminal input into keys. Written by hand rather than with readline's keypress
 * events, which hold a lone Esc back for half a second to see whether a sequence follows; a
 * terminal in raw mode delivers an arrow key's bytes together, so a lone Esc can be final here.
 */

export type Key =
  | { name: 'char'; char: string }
  | { name: 'enter' | 'escape' | 'backspace' | 'up' | 'down' | 'left' | 'right' | 'tab' | 'ctrl-c' | 'ctrl-d' | 'ctrl-u' | 'other' };

/** Splits one chunk of raw input into keys (several keys may arrive in one chunk). */
export function decodeKeys(chunk: string): Key[] {
  const keys: Key[] = [];
  let i = 0;
  while (i < chunk.length) {
    const c = chunk[i]!;
    if (c === '\x1b') {
      const next = chunk[i + 1];
      if (next === '[' || next === 'O') {
        // CSI / SS3: parameters, then one final byte in @..~
        let j = i + 2;
        while (j < chunk.length && !/[@-~]/.test(chunk[j]!)) j++;
        const final = chunk[j] ?? '';
        const arrows: Record<string, Key['name']> = { A: 'up', B: 'down', C: 'right', D: 'left' };
        keys.push({ name: (arrows[final] ?? 'other') as Exclude<Key['name'], 'char'> } as Key);
        i = j + 1;
        continue;
      }
      keys.push({ name: 'escape' });
      i++;
      continue;
    }
    i++;
    if (c === '\r' || c === '\n') {
      if (c === '\r' && chunk[i] === '\n') i++; // CR LF is one Enter
      keys.push({ name: 'enter' });
    }
    else if (c === '\x7f' || c === '\b') keys.push({ name: 'backspace' });
    else if (c === '\t') keys.push({ name: 'tab' });
    else if (c === '\x03') keys.push({ name: 'ctrl-c' });
    else if (c === '\x04') keys.push({ name: 'ctrl-d' });
    else if (c === '\x15') keys.push({ name: 'ctrl-u' });
    else if (c < ' ') keys.push({ name: 'other' });
    else {
      // A character outside the Basic Multilingual Plane arrives as two UTF-16 halves.
      const code = c.codePointAt(0)!;
      const ch = code > 0xffff ? String.fromCodePoint(code) : c;
      if (ch.length === 2) i++;
      keys.push({ name: 'char', char: ch });
    }
  }
  return keys;
}
