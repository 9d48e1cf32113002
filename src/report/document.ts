/** The shell shared by the HTML report and the HTML codebook: one file, styles inline, nothing fetched. */

import { esc } from './escape.js';

/**
 * The document's own policy: nothing may load from anywhere (no scripts, fonts, images or
 * frames), only the inline styles run. A second line of defence behind escaping, and a promise
 * to the reader that opening the file contacts nobody.
 */
const POLICY = "default-src 'none'; style-src 'unsafe-inline'; base-uri 'none'; form-action 'none'";

export const BASE_CSS = `
:root {
  --ink: #1b2430; --muted: #56606b; --rule: #c9d1da; --faint: #e6eaef; --tint: #f3f5f8;
  --accent: #0072B2; --warn: #9a3a00;
}
* { box-sizing: border-box; }
html {
  font-family: system-ui, -apple-system, "Segoe UI", Roboto, "Helvetica Neue", "Noto Sans", "DejaVu Sans", Arial, sans-serif;
  color: var(--ink); background: #e9edf1; font-size: 15px; line-height: 1.5;
  -webkit-text-size-adjust: 100%;
}
body { margin: 0; }
main { max-width: 1000px; margin: 0 auto; background: #fff; padding: 44px 48px 64px; }
h1 { font-size: 1.9rem; line-height: 1.2; margin: 0 0 6px; font-weight: 700; letter-spacing: -0.01em; }
h2 { font-size: 1.35rem; margin: 48px 0 12px; padding-bottom: 5px; border-bottom: 2px solid var(--ink); }
h3 { font-size: 1.05rem; margin: 30px 0 8px; }
h4 { font-size: 0.98rem; margin: 20px 0 6px; }
p { margin: 8px 0; max-width: 75ch; }
.meta { color: var(--muted); margin: 0; }
.note { color: var(--muted); font-size: 0.9rem; }
.caution { border-left: 4px solid currentColor; padding: 2px 10px; margin: 10px 0; font-size: 0.95rem; }
.empty { color: var(--muted); font-style: italic; border: 1px dashed var(--rule); border-radius: 4px; padding: 10px 14px; max-width: none; }
.callout { border-left: 4px solid var(--warn); background: #fbf4ee; padding: 10px 14px; margin: 14px 0; max-width: none; }
table { border-collapse: collapse; width: 100%; font-size: 0.9rem; margin: 8px 0; }
caption { text-align: left; color: var(--muted); font-size: 0.85rem; padding: 0 0 6px; }
th, td { text-align: left; vertical-align: top; padding: 6px 8px; border-bottom: 1px solid var(--faint); }
thead th { border-bottom: 2px solid var(--rule); background: var(--tint); font-weight: 600; }
.num { text-align: right; font-variant-numeric: tabular-nums; white-space: nowrap; }
th.num { white-space: normal; }
.nowrap { white-space: nowrap; }
.tag { display: inline-block; font-size: 0.72rem; font-weight: 600; letter-spacing: 0.02em; border: 1px solid var(--ink);
  border-radius: 3px; padding: 0 5px; margin-left: 6px; vertical-align: 1px; white-space: nowrap; }
.id { font-family: ui-monospace, "SFMono-Regular", Menlo, Consolas, "DejaVu Sans Mono", monospace; font-size: 0.8rem; color: var(--muted); }
blockquote { margin: 10px 0; padding: 8px 14px; border-left: 3px solid var(--accent); background: var(--tint); max-width: 80ch; }
blockquote p { margin: 0; }
blockquote footer { color: var(--muted); font-size: 0.82rem; margin-top: 4px; }
footer.doc { margin-top: 56px; padding-top: 10px; border-top: 1px solid var(--rule); color: var(--muted); font-size: 0.85rem; }
@media (max-width: 700px) { main { padding: 24px 18px; } }
@media print {
  html { background: #fff; font-size: 10.5pt; }
  main { max-width: none; padding: 0; }
  h2 { break-after: avoid; page-break-after: avoid; }
  h3, h4 { break-after: avoid; page-break-after: avoid; }
  figure, blockquote, tr, .stat, .cluster { break-inside: avoid; page-break-inside: avoid; }
  * { -webkit-print-color-adjust: exact; print-color-adjust: exact; }
  a { color: inherit; text-decoration: none; }
}
@page { margin: 16mm 15mm; }
`;

export function htmlDocument(title: string, css: string, body: string): string {
  return (
    '<!DOCTYPE html>\n' +
    '<html lang="en">\n<head>\n<meta charset="utf-8">\n' +
    `<meta http-equiv="Content-Security-Policy" content="${POLICY}">\n` +
    '<meta name="viewport" content="width=device-width, initial-scale=1">\n' +
    '<meta name="generator" content="trellis">\n' +
    `<title>${esc(title)}</title>\n<style>${css}</style>\n</head>\n<body>\n<main>\n${body}\n</main>\n</body>\n</html>\n`
  );
}
