/** Printing helpers shared by the commands: human text by default, JSON for scripts. */

/** JSON on stdout, indented for reading (bulk output streams compact JSON: printJsonStream). */
export function printJson(value: unknown): void {
  process.stdout.write(JSON.stringify(value, null, 2) + '\n');
}

export function say(line = ''): void {
  process.stdout.write(line + '\n');
}

/** Notices go to stderr so that --json output on stdout stays machine-readable. */
export function warn(line: string): void {
  process.stderr.write(`warning: ${line}\n`);
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
