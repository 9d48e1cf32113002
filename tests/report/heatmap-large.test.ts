import { describe, expect, it } from 'vitest';
import { MAP_COLUMNS, heatmapChart } from '../../src/report/charts.js';
import { sampleReport } from './sample.js';

// A survey study makes every respondent a transcript: the theme x transcript grid then holds
// hundreds of thousands of cells, more than a spread into Math.max can take, and far more than a
// reader can read; beyond MAP_COLUMNS transcripts each theme's spread is drawn instead.
describe('coverage figure of a large survey', () => {
  const d = sampleReport();
  const n = Math.ceil(300_000 / d.heatmap.themes.length);
  const transcripts = Array.from({ length: n }, (_, j) => `r${String(j + 1).padStart(6, '0')}`);
  // Theme i is coded in every (i + 2)-th answer, once, except the last answer, which holds 9.
  const counts = d.heatmap.themes.map((_, i) => transcripts.map((_, j) => (j % (i + 2) === 0 ? 1 : 0)));
  counts[0]![n - 1] = 9;

  it('draws 300,000 answers as one bar a theme, small and without overflowing the call stack', () => {
    const chart = String(heatmapChart({ ...d, heatmap: { transcripts, themes: d.heatmap.themes, counts } }));
    expect(chart).toContain('Transcripts reached by each theme');
    // One row a theme, not a cell per answer: a few hundred bytes a theme.
    expect(chart.length).toBeLessThan(2_000 * d.heatmap.themes.length);
    // The first theme: every 2nd answer of n, plus the last one (n is odd or even: count them).
    const reached = counts[0]!.filter((c) => c > 0).length;
    const total = counts[0]!.reduce((a, b) => a + b, 0);
    expect(chart).toContain(`(${reached.toLocaleString('en-GB')}), ${total.toLocaleString('en-GB')} passages`);
  });

  it('keeps the cell-per-transcript map up to MAP_COLUMNS transcripts', () => {
    const few = transcripts.slice(0, MAP_COLUMNS);
    const chart = String(heatmapChart({ ...d, heatmap: { transcripts: few, themes: d.heatmap.themes, counts: counts.map((r) => r.slice(0, MAP_COLUMNS)) } }));
    expect(chart).toContain('Passages per theme and transcript');
    expect(chart).not.toContain('Transcripts reached by each theme');
  });
});
