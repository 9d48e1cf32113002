/** Printing helpers shared by the commands: human text by default, JSON for scripts. */

/**
 * Terminal control characters (escape sequences that clear the screen, plant hyperlinks or move
 * the cursor), other C0/C1 controls and bidirectional overrides. Text from transcripts and files
 * is shown, never obeyed: each becomes U+FFFD, one code unit for one, so offsets into the text
 * (term marks) stay right. Tab and newline stay.
 */
const CONTROL = /[\u0000-\u0008\u000b-\u001f\u007f-\u009f\u202a-\u202e\u2066-\u2069]/g;

export function plain(text: string): string {
  return text.replace(CONTROL, '\ufffd');
}

/** `plain` through every string of a value (arrays, plain objects, maps), for screen models. */
export function plainDeep<T>(value: T): T {
  if (typeof value === 'string') return plain(value) as T;
  if (Array.isArray(value)) return value.map(plainDeep) as T;
  if (value instanceof Map) return new Map([...value].map(([k, v]) => [plainDeep(k), plainDeep(v)])) as T;
  if (value && typeof value === 'object' && Object.getPrototypeOf(value) === Object.prototype) {
    return Object.fromEntries(Object.entries(value).map(([k, v]) => [k, plainDeep(v)])) as T;
  }
  return value;
}

/** JSON on stdout, indented for reading (bulk output streams compact JSON: printJsonStream). */
export function printJson(value: unknown): void {
  process.stdout.write(JSON.stringify(value, null, 2) + '\n');
}

/** A line of human-readable output; anything from the study is shown as text, never obeyed. */
export function say(line = ''): void {
  process.stdout.write(plain(line) + '\n');
}

/** Notices go to stderr so that --json output on stdout stays machine-readable. */
export function warn(line: string): void {
  process.stderr.write(`warning: ${plain(line)}\n`);
}

/** A plain-text table: columns padded, numbers right-aligned. Readable without colour. */
export function table(header: string[], rows: (string | number)[][]): string {
  const cells = [header, ...rows.map((r) => r.map(String))];
  const widths = header.map((_, c) => Math.max(...cells.map((r) => (r[c] ?? '').length)));
  const numeric = header.map((_, c) => rows.length > 0 && rows.every((r) => typeof r[c] === 'number'));
  const fmt = (r: string[]) =>
    r.map((v, c) => (numeric[c] ? v.padStart(widths[c]!) : v.padEnd(widths[c]!))).join('  ').trimEnd();
  return [fmt(header), widths.map((w) => '-'.repeat(w)).join('  '), ...cells.slice(1).map(fmt)].join('\n');
}

export function plural(n: number, word: string, many = word + 's'): string {
  return `${n} ${n === 1 ? word : many}`;
}

/**
 * Compact JSON of `head` with one more array member `key`, written item by item in chunks:
 * bulk output (tens of megabytes) never exists as one string. `encode` returns an item's JSON text.
 */
export function printJsonStream<T>(head: Record<string, unknown>, key: string, items: Iterable<T>, encode: (item: T) => string): void {
  const open = JSON.stringify(head);
  // Each chunk is encoded straight into a buffer of its own (the stream may still hold the last).
  const CHUNK = 1 << 20;
  let buf = Buffer.allocUnsafe(2 * CHUNK);
  let at = buf.write(`${open.length > 2 ? open.slice(0, -1) + ',' : '{'}${JSON.stringify(key)}:[`);
  let first = true;
  for (const item of items) {
    const text = (first ? '' : ',') + encode(item);
    first = false;
    if (at + 3 * text.length > buf.length) {
      if (at) process.stdout.write(buf.subarray(0, at));
      buf = Buffer.allocUnsafe(Math.max(2 * CHUNK, 3 * text.length));
      at = 0;
    }
    at += buf.write(text, at);
  }
  at += buf.write(']}\n', at);
  process.stdout.write(buf.subarray(0, at));
}
