/** Escaping and number formatting shared by every renderer. */

const HTML_ESCAPES: Record<string, string> = { '&': '&amp;', '<': '&lt;', '>': '&gt;', '"': '&quot;', "'": '&#39;' };

/**
 * Text for HTML and inline SVG, safe in element content and in quoted attributes alike: passages
 * are the participants' own words and may hold anything, markup included.
 */
export function esc(text: string | number | null | undefined): string {
  if (text === null || text === undefined) return '';
  return String(text).replace(/[&<>"']/g, (c) => HTML_ESCAPES[c]!);
}

/** A share 0..1 as a whole percentage ("68%"); a dash when undefined. */
export function pct(share: number | null | undefined, digits = 0): string {
  if (share === null || share === undefined || Number.isNaN(share)) return '–';
  return `${(share * 100).toFixed(digits)}%`;
}

/** A coefficient to two decimals, with a true minus sign; a dash when undefined. */
export function fixed(value: number | null | undefined, digits = 2): string {
  if (value === null || value === undefined || Number.isNaN(value)) return '–';
  const s = value.toFixed(digits);
  return s.startsWith('-') && Number(s) !== 0 ? `−${s.slice(1)}` : s.replace(/^-/, '');
}

/** "1 passage" / "3 passages". */
export function plural(n: number, one: string, many = `${one}s`): string {
  return `${int(n)} ${n === 1 ? one : many}`;
}

/**
 * An ISO 8601 timestamp as "2025-03-14 10:22 UTC", without the reader's locale or time zone, so
 * that the same study always renders the same report. Anything else is shown as given.
 */
export function when(iso: string): string {
  const m = /^(\d{4}-\d{2}-\d{2})[T ](\d{2}:\d{2})(?::\d{2}(?:\.\d+)?)?(Z|[+-]\d{2}:?\d{2})?$/.exec(iso.trim());
  if (!m) return iso;
  const zone = m[3] === undefined ? '' : m[3] === 'Z' || /^[+-]00:?00$/.test(m[3]) ? ' UTC' : ` ${m[3]}`;
  return `${m[1]} ${m[2]}${zone}`;
}

/** The date part of an ISO 8601 timestamp. */
export function day(iso: string): string {
  const m = /^(\d{4}-\d{2}-\d{2})/.exec(iso.trim());
  return m ? m[1]! : iso;
}

/** One line of text: runs of white space (newlines included) become one space. */
export function oneLine(text: string): string {
  return text.replace(/\s+/g, ' ').trim();
}

/** A whole number with thousands separators ("1,204"), the same on every machine. */
export function int(value: number): string {
  const s = String(Math.round(value));
  return s.replace(/\B(?=(\d{3})+(?!\d))/g, ',');
}
