/** Renderers: ReportData in, text out. No files, no database, no console. */
export { renderReport } from './html.js';
export { renderCodebook, CODEBOOK_COLUMNS, type CodebookFormat, type CodebookOptions } from './codebook.js';
export type * from './types.js';
