import { describe, expect, it } from 'vitest';
import { heatmapChart } from '../../src/report/charts.js';
import { sampleReport } from './sample.js';

// A survey study makes every respondent a transcript: the theme x transcript grid then holds
// hundreds of thousands of cells, more than a spread into Math.max can take.
describe('heat map of a large survey', () => {
  it('draws a grid of 300,000 cells without overflowing the call stack', () => {
    const d = sampleReport();
    const n = Math.ceil(300_000 / d.heatmap.themes.length);
    const transcripts = Array.from({ length: n }, (_, j) => `r${String(j + 1).padStart(6, '0')}`);
    const counts = d.heatmap.themes.map((_, i) => transcripts.map((_, j) => ((i + 1) * (j + 5)) % 7));
    counts[0]![n - 1] = 9; // the largest count sits in the last cell
    const chart = heatmapChart({ ...d, heatmap: { transcripts, themes: d.heatmap.themes, counts } });
    expect(chart).not.toBeNull();
    expect(String(chart)).toContain('<svg');
  });
});
