/**
 * The report's charts, each a function of ReportData returning one SVG element (or null when
 * there is nothing to draw, so the caller can say so in words). Every mark carries its value as
 * visible text or a tooltip, and the chart's description lists the values for screen readers.
 */

import { day, int, pct } from './escape.js';
import { BLUES_7, INK, MUTED, OKABE_ITO, RULE, ZERO_FILL, inkOn } from './palette.js';
import { axisBottom, axisLeft, chart, fit, hatch, heatCell, line, linear, marker, n, niceMax, polyline, rect, text, textWidth, ticks } from './svg.js';
import type { AcceptanceRow, CalibrationRow, ReportData, ReportTheme } from './types.js';

/** Drawing width of the wide charts, in CSS pixels; they scale down to fit narrower pages. */
export const WIDTH = 900;

/** Rates on fewer decisions than this are drawn hatched and flagged as unstable. */
export const FEW_DECISIONS = 5;

const percentTick = (v: number) => `${Math.round(v * 100)}%`;

export interface ThemeLabel {
  label: string;
  /** 0 for a top-level theme. */
  level: number;
  title: string;
}

/** "1.2 Staffing levels", indented by level, for a theme path (or the text as given). */
export function themeLabeller(themes: readonly ReportTheme[]): (path: string) => ThemeLabel {
  const byPath = new Map(themes.map((t) => [t.path, t]));
  return (path) => {
    const t = byPath.get(path);
    if (!t) return { label: path, level: 0, title: path };
    return { label: `${t.number} ${t.name}`, level: t.number.split('.').length - 1, title: `${t.number} ${t.path}` };
  };
}

/** Ramp class (0..6) of a non-zero count, for counts up to max: equal-width classes. */
export function rampClass(value: number, max: number): number {
  if (value <= 0 || max <= 0) return -1;
  return Math.min(BLUES_7.length - 1, Math.floor(((value - 1) / max) * BLUES_7.length));
}

// ---------------------------------------------------------------------------------------------
// Themes' spread over many transcripts (a survey): one bar a theme

/** For each theme, the share of transcripts with at least one passage of it, and its passages. */
export function spreadChart(data: ReportData): string | null {
  const { transcripts, themes, counts } = data.heatmap;
  if (!transcripts.length || !themes.length) return null;
  const label = themeLabeller(data.themes);
  const rows = themes.map((path, i) => {
    let reached = 0;
    let total = 0;
    for (const c of counts[i] ?? []) (reached += c > 0 ? 1 : 0), (total += c);
    return { ...label(path), reached, total };
  });
  const size = 12;
  const indent = 14;
  const labelW = Math.min(300, Math.max(120, ...rows.map((r) => r.level * indent + textWidth(r.label, size) + 12)));
  const numW = 190;
  const barW = Math.max(200, WIDTH - labelW - numW - 8);
  const rowH = 22;
  const top = 26;
  const height = top + rows.length * rowH + 40;
  // Bars run to the largest share (rounded up), so that themes of a few per cent still show.
  const most = Math.max(...rows.map((r) => r.reached)) / transcripts.length;
  const scaleTo = most > 0 ? Math.min(1, niceMax(most * 100) / 100) : 1;
  const x = linear([0, scaleTo], [labelW, labelW + barW]);
  const share = (r: { reached: number }) => r.reached / transcripts.length;
  const shown = (v: number) => (v > 0 && v < 0.0005 ? '<0.1%' : pct(v, v > 0 && v < 0.1 ? 1 : 0));
  const parts: string[] = [text(labelW, top - 10, `Share of the ${int(transcripts.length)} transcripts with the theme (a full bar: ${pct(scaleTo)})`, { size: 12, fill: MUTED })];
  rows.forEach((r, i) => {
    const y = top + i * rowH;
    if (r.level === 0 && i > 0) parts.push(line(4, y, WIDTH - 4, y, { stroke: RULE, strokeWidth: 1 }));
    parts.push(text(4 + r.level * indent, y + rowH / 2, fit(r.label, labelW - 10 - r.level * indent, size), { size, baseline: 'middle', weight: r.level === 0 ? 'bold' : 'normal', title: r.title }));
    parts.push(rect(labelW, y + 4, barW, rowH - 8, { fill: ZERO_FILL }));
    if (r.reached) parts.push(rect(labelW, y + 4, Math.max(1, x(share(r)) - labelW), rowH - 8, { fill: BLUES_7[4]! }));
    parts.push(text(labelW + barW + 8, y + rowH / 2, `${shown(share(r))} (${int(r.reached)}), ${int(r.total)} ${r.total === 1 ? 'passage' : 'passages'}`, { size: 12, baseline: 'middle' }));
  });
  parts.push(text(4, height - 12, 'Each bar: the transcripts with at least one passage coded to the theme or any of its sub-themes.', { size: 12, fill: MUTED }));
  const desc =
    `Share of the ${transcripts.length} transcripts with at least one passage per theme (including sub-themes). ` +
    rows.map((r) => `${r.label}: ${r.reached} ${r.reached === 1 ? 'transcript' : 'transcripts'}, ${r.total} ${r.total === 1 ? 'passage' : 'passages'}.`).join(' ');
  return chart({ id: 'chart-heatmap', width: WIDTH, height, title: 'Transcripts reached by each theme', desc, body: parts.join('') });
}

// Theme x transcript heat map

/**
 * Beyond this many transcripts a map with a column per transcript cannot be read (a survey of
 * 20,000 answers would be millions of cells and hundreds of MB of SVG): each theme's spread over
 * the transcripts is drawn instead (spreadChart).
 */
export const MAP_COLUMNS = 60;

export function heatmapChart(data: ReportData): string | null {
  const { transcripts, themes, counts } = data.heatmap;
  if (!transcripts.length || !themes.length) return null;
  if (transcripts.length > MAP_COLUMNS) return spreadChart(data);
  const label = themeLabeller(data.themes);
  const rows = themes.map((path, i) => ({ ...label(path), counts: counts[i] ?? [] }));
  // A loop, not a spread: themes x transcripts cells overflow the call stack in a large survey.
  let max = 0;
  for (const r of rows) for (const c of r.counts) if (c > max) max = c;

  const size = 12;
  const indent = 14;
  const labelW = Math.min(300, Math.max(120, ...rows.map((r) => r.level * indent + textWidth(r.label, size) + 12)));
  const totalW = 52;
  const cellW = Math.max(26, Math.min(52, Math.floor((WIDTH - labelW - totalW - 8) / transcripts.length)));
  const cellH = 24;
  const colMax = 200;
  const colLabels = transcripts.map((t) => fit(t, colMax, 12));
  const rotate = colLabels.some((t) => textWidth(t, 12) > cellW - 6);
  const headH = rotate ? Math.ceil(Math.max(...colLabels.map((t) => textWidth(t, 12))) * Math.sin(Math.PI / 4)) + 18 : 26;
  const gridX = labelW;
  const gridY = headH;
  // Rotated column names rise to the right of their column: the last ones need room too.
  const reach = rotate ? Math.max(...colLabels.map((t, j) => gridX + j * cellW + cellW / 2 - 2 + textWidth(t, 12) * Math.SQRT1_2 + 6)) : 0;
  const width = Math.ceil(Math.max(WIDTH, gridX + cellW * transcripts.length + totalW + 8, reach));
  const legendY = gridY + rows.length * cellH + 20;
  const height = legendY + 46;

  const parts: string[] = [];
  colLabels.forEach((t, j) => {
    const cx = gridX + j * cellW + cellW / 2;
    if (rotate) {
      parts.push(text(cx - 2, gridY - 8, t, { size: 12, fill: MUTED, transform: `rotate(-45 ${n(cx - 2)} ${n(gridY - 8)})`, title: transcripts[j] }));
    } else {
      parts.push(text(cx, gridY - 9, t, { size: 12, anchor: 'middle', fill: MUTED, title: transcripts[j] }));
    }
  });
  parts.push(text(gridX + transcripts.length * cellW + totalW / 2 + 4, gridY - 9, 'all', { size: 12, anchor: 'middle', fill: MUTED, weight: 'bold' }));

  rows.forEach((r, i) => {
    const y = gridY + i * cellH;
    if (r.level === 0 && i > 0) parts.push(line(4, y, gridX + transcripts.length * cellW + totalW + 4, y, { stroke: RULE, strokeWidth: 1 }));
    const avail = labelW - 10 - r.level * indent;
    parts.push(
      text(4 + r.level * indent, y + cellH / 2, fit(r.label, avail, size), {
        size,
        baseline: 'middle',
        weight: r.level === 0 ? 'bold' : 'normal',
        title: r.title,
      }),
    );
    transcripts.forEach((t, j) => {
      const v = r.counts[j] ?? 0;
      const k = rampClass(v, max);
      const fill = k < 0 ? ZERO_FILL : BLUES_7[k]!;
      const ink = k < 0 ? '#9aa4ae' : inkOn(k);
      parts.push(heatCell(gridX + j * cellW, y, cellW, cellH, v, fill, ink, `${r.title} in ${t}: ${v} ${v === 1 ? 'passage' : 'passages'}`));
    });
    const total = r.counts.reduce((a, b) => a + b, 0);
    parts.push(text(gridX + transcripts.length * cellW + totalW / 2 + 4, y + cellH / 2, String(total), { anchor: 'middle', baseline: 'middle', size: 12, weight: 'bold' }));
  });

  // Legend: the ramp's classes with the counts each stands for.
  const classes: { k: number; lo: number; hi: number }[] = [];
  for (let v = 1; v <= max && v <= 100_000; v++) {
    const k = rampClass(v, max);
    const last = classes[classes.length - 1];
    if (last && last.k === k) last.hi = v;
    else classes.push({ k, lo: v, hi: v });
  }
  let lx = 4;
  parts.push(text(lx, legendY + 8, 'Passages:', { size: 12, fill: MUTED, baseline: 'middle' }));
  lx += textWidth('Passages:', 12) + 8;
  const legend = [{ fill: ZERO_FILL, label: '0' }, ...classes.map((c) => ({ fill: BLUES_7[c.k]!, label: c.lo === c.hi ? String(c.lo) : `${c.lo}–${c.hi}` }))];
  for (const l of legend) {
    parts.push(rect(lx, legendY, 24, 16, { fill: l.fill, stroke: RULE, strokeWidth: 1 }));
    parts.push(text(lx + 30, legendY + 8, l.label, { size: 12, baseline: 'middle' }));
    lx += 30 + textWidth(l.label, 12) + 14;
  }
  parts.push(text(4, legendY + 34, 'Each cell: passages of the transcript coded to the theme or any of its sub-themes. Darker = more.', { size: 12, fill: MUTED }));

  const desc =
    `Passages coded per theme (rows, including sub-themes) and transcript (columns); the largest cell holds ${max}. ` +
    rows
      .map((r) => {
        const cells = transcripts.map((t, j) => [t, r.counts[j] ?? 0] as const).filter(([, v]) => v > 0);
        return `${r.label}: ${cells.length ? cells.map(([t, v]) => `${t} ${v}`).join(', ') : 'none'}.`;
      })
      .join(' ');
  return chart({ id: 'chart-heatmap', width, height, title: 'Passages per theme and transcript', desc, body: parts.join('') });
}

// ---------------------------------------------------------------------------------------------
// Acceptance per theme

export function acceptanceChart(data: ReportData): string | null {
  const { perTheme, overall } = data.acceptance;
  const rowsIn = perTheme.filter((r) => r.decided > 0);
  if (!rowsIn.length || overall.decided === 0) return null;
  const order = new Map(data.themes.map((t, i) => [t.path, i]));
  const rows = [...rowsIn].sort((a, b) => (order.get(a.label) ?? 1e9) - (order.get(b.label) ?? 1e9));
  const label = themeLabeller(data.themes);
  const size = 12;
  const indent = 12;
  const labels = rows.map((r) => label(r.label));
  const labelW = Math.min(320, Math.max(140, ...labels.map((l) => l.level * indent + textWidth(l.label, size) + 14)));
  const valueW = 150;
  const top = 30;
  const rowH = 24;
  const x = linear([0, 1], [labelW, WIDTH - valueW]);
  const height = top + rows.length * rowH + 44;
  const bottom = top + rows.length * rowH;

  const parts: string[] = [];
  parts.push(axisBottom(x, bottom, { ticks: [0, 0.25, 0.5, 0.75, 1], format: percentTick, gridTo: top - 6, label: 'accepted, of decided suggestions' }));
  // The overall rate as a reference line behind the bars, labelled at the top.
  const ox = x(overall.rate ?? 0);
  parts.push(line(ox, top - 4, ox, bottom, { stroke: OKABE_ITO.vermillion, strokeWidth: 1.5, dash: '5 3' }));
  const overallText = `all themes: ${pct(overall.rate)}`;
  const anchorEnd = ox + textWidth(overallText, 12) + 4 > WIDTH;
  parts.push(text(anchorEnd ? ox - 4 : ox + 4, top - 12, overallText, { size: 12, fill: OKABE_ITO.vermillion, anchor: anchorEnd ? 'end' : 'start', weight: 'bold' }));
  rows.forEach((r, i) => {
    const l = labels[i]!;
    const y = top + i * rowH;
    const few = r.decided < FEW_DECISIONS;
    parts.push(text(4 + l.level * indent, y + rowH / 2, fit(l.label, labelW - 12 - l.level * indent, size), { size, baseline: 'middle', weight: l.level === 0 ? 'bold' : 'normal', title: l.title }));
    const rate = r.rate ?? 0;
    const tip = `${l.title}: ${r.accepted} of ${r.decided} accepted (${pct(r.rate)})${few ? ', few decisions' : ''}`;
    parts.push(rect(x(0), y + 4, x(rate) - x(0), rowH - 8, { fill: few ? 'url(#chart-acceptance-few)' : OKABE_ITO.blue, stroke: few ? OKABE_ITO.blue : undefined, strokeWidth: few ? 1 : undefined, title: tip }));
    parts.push(text(x(rate) + 6, y + rowH / 2, `${pct(r.rate)} · ${int(r.accepted)} of ${int(r.decided)}${few ? ' (few)' : ''}`, { size: 12, baseline: 'middle', halo: true }));
  });

  const desc =
    `Share of decided suggestions accepted, per theme; all themes together ${pct(overall.rate)} (${overall.accepted} of ${overall.decided}). ` +
    rows.map((r, i) => `${labels[i]!.label}: ${pct(r.rate)}, ${r.accepted} of ${r.decided}.`).join(' ');
  return chart({
    id: 'chart-acceptance',
    width: WIDTH,
    height,
    title: 'Acceptance of suggestions per theme',
    desc,
    defs: hatch('chart-acceptance-few', OKABE_ITO.blue, '#ffffff'),
    body: parts.join(''),
  });
}

// ---------------------------------------------------------------------------------------------
// Calibration: confidence band against observed acceptance

export function calibrationChart(data: ReportData): string | null {
  const rows = data.acceptance.calibration.filter((r): r is CalibrationRow & { acceptance: number } => r.count > 0 && r.acceptance !== null);
  if (!rows.length) return null;
  const side = 360;
  const left = 76;
  const top = 16;
  const width = left + side + 24;
  const legendY = top + side + 64;
  const height = legendY + 12;
  const x = linear([0, 1], [left, left + side]);
  const y = linear([0, 1], [top + side, top]);
  const maxCount = Math.max(...rows.map((r) => r.count));
  const blue = OKABE_ITO.blue;

  const parts: string[] = [];
  const tk = [0, 0.2, 0.4, 0.6, 0.8, 1];
  parts.push(axisLeft(y, left, { ticks: tk, format: percentTick, gridTo: left + side, label: 'observed acceptance' }));
  parts.push(axisBottom(x, top + side, { ticks: tk, format: (v) => v.toFixed(1), gridTo: top, label: 'confidence of the suggestion' }));
  // The diagonal: where a confidence of p would be accepted p of the time.
  parts.push(line(x(0), y(0), x(1), y(1), { stroke: MUTED, strokeWidth: 1.5, dash: '6 4' }));

  const pts = rows.map((r) => {
    const conf = r.meanConfidence ?? (r.lower + r.upper) / 2;
    return { r, conf, cx: x(conf), cy: y(r.acceptance), radius: 3.5 + 4 * Math.sqrt(r.count / maxCount) };
  });
  parts.push(polyline(pts.map((p) => [p.cx, p.cy]), { stroke: blue, strokeWidth: 2 }));
  for (const { r, cy } of pts) {
    // The band's range as whiskers at its observed acceptance.
    parts.push(line(x(r.lower), cy, x(r.upper), cy, { stroke: blue, strokeWidth: 1.5, opacity: 0.6 }));
    parts.push(line(x(r.lower), cy - 4, x(r.lower), cy + 4, { stroke: blue, strokeWidth: 1.5, opacity: 0.6 }));
    parts.push(line(x(r.upper), cy - 4, x(r.upper), cy + 4, { stroke: blue, strokeWidth: 1.5, opacity: 0.6 }));
  }
  // Obstacles for the labels: every point and every whisker.
  type Box = { x0: number; y0: number; x1: number; y1: number };
  const taken: Box[] = pts.flatMap(({ r, cx, cy, radius }) => [
    { x0: cx - radius, y0: cy - radius, x1: cx + radius, y1: cy + radius },
    { x0: x(r.lower), y0: cy - 4, x1: x(r.upper), y1: cy + 4 },
  ]);
  const clear = (b: Box) =>
    b.x0 >= left + 2 && b.x1 <= left + side - 2 && b.y0 >= top + 1 && b.y1 <= top + side - 2 && !taken.some((t) => b.x0 < t.x1 && b.x1 > t.x0 && b.y0 < t.y1 && b.y1 > t.y0);
  for (const { r, cx, cy, radius } of pts) {
    parts.push(
      marker('circle', cx, cy, radius, {
        fill: blue,
        title: `confidence ${r.band}: ${pct(r.acceptance)} accepted of ${r.count}${r.meanConfidence !== null ? `, mean confidence ${r.meanConfidence.toFixed(2)}` : ''}`,
      }),
    );
  }
  for (const { r, conf, cx, cy, radius } of pts) {
    // Points lie near the diagonal, one band apart along it, so a label set off square to the
    // diagonal (up-left above it, down-right below it) usually clears its neighbours; where it
    // would not, the first clear place among the others is taken.
    const label = `${pct(r.acceptance)} · n=${r.count}`;
    const w = textWidth(label, 12);
    const h = 11;
    const g = radius + 3;
    const upLeft: Box = { x0: cx - g - w, y0: cy - g - h, x1: cx - g, y1: cy - g };
    const downRight: Box = { x0: cx + g, y0: cy + g, x1: cx + g + w, y1: cy + g + h };
    const upRight: Box = { x0: cx + g, y0: cy - g - h, x1: cx + g + w, y1: cy - g };
    const downLeft: Box = { x0: cx - g - w, y0: cy + g, x1: cx - g, y1: cy + g + h };
    const above: Box = { x0: cx - w / 2, y0: cy - g - h - 4, x1: cx + w / 2, y1: cy - g - 4 };
    const below: Box = { x0: cx - w / 2, y0: cy + g + 4, x1: cx + w / 2, y1: cy + g + h + 4 };
    const order = r.acceptance >= conf ? [upLeft, downRight, upRight, downLeft, above, below] : [downRight, upLeft, downLeft, upRight, below, above];
    const box = order.find(clear) ?? order[0]!;
    taken.push(box);
    parts.push(text(box.x0, box.y1 - 1, label, { size: 12, weight: 'bold', halo: true }));
  }
  // Legend.
  parts.push(line(left, legendY, left + 28, legendY, { stroke: MUTED, strokeWidth: 1.5, dash: '6 4' }));
  parts.push(text(left + 34, legendY, 'perfect calibration', { size: 12, baseline: 'middle' }));
  const lx2 = left + 34 + textWidth('perfect calibration', 12) + 18;
  parts.push(marker('circle', lx2 + 6, legendY, 5, { fill: blue }));
  parts.push(line(lx2 - 4, legendY, lx2 + 16, legendY, { stroke: blue, strokeWidth: 1.5, opacity: 0.6 }));
  parts.push(text(lx2 + 22, legendY, 'band (area: decisions)', { size: 12, baseline: 'middle' }));

  const desc =
    'Observed acceptance against confidence, one point per confidence band; points on the diagonal are well calibrated, below it over-confident. ' +
    rows.map((r) => `Band ${r.band}: ${pct(r.acceptance)} accepted of ${r.count}${r.meanConfidence !== null ? `, mean confidence ${r.meanConfidence.toFixed(2)}` : ''}.`).join(' ');
  return chart({ id: 'chart-calibration', width, height, title: 'Calibration: confidence against observed acceptance', desc, body: parts.join('') });
}

// ---------------------------------------------------------------------------------------------
// Acceptance over time (cumulative rate after each decision)

export function overTimeChart(data: ReportData): string | null {
  const pts = data.acceptance.overTime;
  if (!pts.length) return null;
  const left = 76;
  const right = 80;
  const top = 20;
  const plotH = 210;
  const height = top + plotH + 64;
  const maxIndex = Math.max(...pts.map((p) => p.index));
  const x = linear([pts.length === 1 ? 0 : Math.min(...pts.map((p) => p.index)), Math.max(1, maxIndex)], [left, WIDTH - right]);
  const y = linear([0, 1], [top + plotH, top]);
  const parts: string[] = [];
  parts.push(axisLeft(y, left, { ticks: [0, 0.25, 0.5, 0.75, 1], format: percentTick, gridTo: WIDTH - right, label: 'accepted so far' }));
  const xt = ticks(x.domain[0], x.domain[1], 8).filter((t) => Number.isInteger(t));
  parts.push(axisBottom(x, top + plotH, { ticks: xt, gridTo: top, label: 'decisions made, in time order' }));
  const overall = data.acceptance.overall.rate;
  parts.push(polyline(pts.map((p) => [x(p.index), y(p.rate)]), { stroke: OKABE_ITO.blue, strokeWidth: 2 }));
  // Markers on every point while they stay apart; beyond that, on an even sample.
  const every = Math.max(1, Math.ceil(pts.length / 120));
  pts.forEach((p, i) => {
    if (i % every !== 0 && i !== pts.length - 1) return;
    parts.push(marker('circle', x(p.index), y(p.rate), pts.length > 60 ? 2.2 : 3.2, { fill: OKABE_ITO.blue, strokeWidth: 0.6, title: `after ${int(p.index)} decisions (${day(p.at)}): ${pct(p.rate)} accepted` }));
  });
  const last = pts[pts.length - 1]!;
  parts.push(text(x(last.index) + 8, y(last.rate), pct(last.rate), { size: 12, weight: 'bold', baseline: 'middle' }));
  parts.push(text(x(last.index) + 8, y(last.rate) + 15, `after ${int(last.index)}`, { size: 12, fill: MUTED, baseline: 'middle' }));
  const first = pts[0]!;
  parts.push(text(left, height - 6, `first decision ${day(first.at)}`, { size: 12, fill: MUTED }));
  parts.push(text(WIDTH - right, height - 6, `latest ${day(last.at)}`, { size: 12, fill: MUTED, anchor: 'end' }));

  const checkpoints = [...new Set([0.1, 0.25, 0.5, 0.75].map((q) => Math.floor(q * (pts.length - 1))))].map((i) => pts[i]!);
  const desc =
    `Cumulative acceptance rate after each of ${int(pts.length)} decisions, from ${day(first.at)} to ${day(last.at)}. ` +
    checkpoints.map((p) => `After ${int(p.index)}: ${pct(p.rate)}.`).join(' ') +
    ` After all ${int(last.index)}: ${pct(last.rate)}${overall !== null && Math.abs(overall - last.rate) > 1e-9 ? ` (overall ${pct(overall)})` : ''}.`;
  return chart({ id: 'chart-overtime', width: WIDTH, height, title: 'Acceptance over time', desc, body: parts.join('') });
}

// ---------------------------------------------------------------------------------------------
// Template growth: themes first coded or added in each transcript, in coding order

export function growthChart(data: ReportData): string | null {
  const pts = [...data.growth].sort((a, b) => a.order - b.order);
  if (!pts.length) return null;
  const right = 24;
  const topA = 28;
  const hA = 170;
  const gap = 48;
  const topB = topA + hA + gap;
  const hB = 90;
  const labels = pts.map((p) => fit(p.transcript, 170, 12));
  const rotate = labels.some((l) => textWidth(l, 12) > (WIDTH - 44 - right) / pts.length - 6);
  // A rotated first label reaches down-left past its column: leave it room.
  const left = rotate ? Math.max(44, Math.ceil(textWidth(labels[0]!, 12) * Math.SQRT1_2) - 8) : 44;
  const band = (WIDTH - left - right) / pts.length;
  const labelH = rotate ? Math.ceil(Math.max(...labels.map((l) => textWidth(l, 12))) * Math.sin(Math.PI / 4)) + 16 : 22;
  const legendY = topB + hB + labelH + 28;
  const cx = (i: number) => left + band * i + band / 2;

  // Running totals of each kind, for the two lines; the data's own cumulative is their sum.
  let themes = 0;
  let subs = 0;
  const run = pts.map((p) => ({ p, themes: (themes += p.newThemes), subs: (subs += p.newSubThemes) }));
  const maxCum = Math.max(1, ...pts.map((p) => p.cumulative), ...run.map((r) => Math.max(r.themes, r.subs)));
  const yA = linear([0, niceMax(maxCum, 4)], [topA + hA, topA]);
  const maxNew = Math.max(1, ...pts.map((p) => Math.max(p.newThemes, p.newSubThemes)));
  const yB = linear([0, niceMax(maxNew, 3)], [topB + hB, topB]);

  const parts: string[] = [];
  const gridR = WIDTH - right;
  parts.push(text(left, topA - 14, 'Themes in the template so far', { size: 12, weight: 'bold' }));
  parts.push(axisLeft(yA, left, { ticks: ticks(0, yA.domain[1], 4).filter(Number.isInteger), gridTo: gridR }));
  parts.push(line(left, topA + hA, gridR, topA + hA, { stroke: RULE }));
  const series = [
    { key: 'all', label: 'themes and sub-themes', values: pts.map((p) => p.cumulative), shape: 'diamond' as const, color: INK, dash: undefined },
    { key: 'subs', label: 'sub-themes', values: run.map((r) => r.subs), shape: 'square' as const, color: OKABE_ITO.vermillion, dash: '6 3' },
    { key: 'themes', label: 'top-level themes', values: run.map((r) => r.themes), shape: 'circle' as const, color: OKABE_ITO.blue, dash: '2 3' },
  ];
  for (const s of series) {
    parts.push(polyline(s.values.map((v, i) => [cx(i), yA(v)]), { stroke: s.color, strokeWidth: 2, dash: s.dash }));
    s.values.forEach((v, i) => parts.push(marker(s.shape, cx(i), yA(v), 4, { fill: s.color, title: `${pts[i]!.transcript}: ${v} ${s.label} so far` })));
  }
  // Only the total is labelled at every point; the other two at their last point, to stay legible.
  // With many transcripts the columns narrow: visible labels thin out to every k-th column
  // (and the last), while every mark keeps its tooltip and the description lists every value.
  const labelEvery = (minWidth: number) => Math.max(1, Math.ceil(minWidth / band));
  const last = pts.length - 1;
  // Every k-th column and the last; a k-th column too close to the last gives way to it.
  const shown = (i: number, every: number) => i === last || (i % every === 0 && last - i >= every);
  const totalEvery = labelEvery(28);
  series[0]!.values.forEach((v, i) => {
    if (shown(i, totalEvery)) parts.push(text(cx(i), yA(v) - 10, String(v), { size: 12, anchor: 'middle', weight: 'bold' }));
  });
  for (const s of series.slice(1)) {
    const v = s.values[s.values.length - 1]!;
    parts.push(text(cx(pts.length - 1) + 8, yA(v), String(v), { size: 12, baseline: 'middle', fill: s.color, weight: 'bold' }));
  }

  parts.push(text(left, topB - 12, 'New in this transcript', { size: 12, weight: 'bold' }));
  parts.push(axisLeft(yB, left, { ticks: ticks(0, yB.domain[1], 3).filter(Number.isInteger), gridTo: gridR }));
  const bw = Math.min(22, Math.max(1.5, (band - Math.max(2, Math.min(10, band * 0.3))) / 2));
  const barLabels = 2 * bw >= 18;
  pts.forEach((p, i) => {
    const bars = [
      { v: p.newThemes, x: cx(i) - bw - 1, fill: OKABE_ITO.blue, stroke: undefined, what: 'new top-level themes' },
      { v: p.newSubThemes, x: cx(i) + 1, fill: 'url(#chart-growth-sub)', stroke: OKABE_ITO.vermillion, what: 'new sub-themes' },
    ];
    for (const b of bars) {
      parts.push(rect(b.x, yB(b.v), bw, yB(0) - yB(b.v), { fill: b.fill, stroke: b.v ? b.stroke : undefined, strokeWidth: b.stroke ? 0.8 : undefined, title: `${p.transcript}: ${b.v} ${b.what}` }));
      if (barLabels) parts.push(text(b.x + bw / 2, yB(b.v) - 4, String(b.v), { size: 11, anchor: 'middle', fill: b.v ? INK : MUTED }));
    }
  });
  parts.push(line(left, topB + hB, gridR, topB + hB, { stroke: RULE }));
  const nameEvery = labelEvery(rotate ? 16 : 0);
  labels.forEach((l, i) => {
    if (!shown(i, nameEvery)) return;
    const yL = topB + hB + 14;
    if (rotate) parts.push(text(cx(i) + 4, yL - 4, l, { size: 12, fill: MUTED, anchor: 'end', transform: `rotate(-45 ${n(cx(i) + 4)} ${n(yL - 4)})`, title: pts[i]!.transcript }));
    else parts.push(text(cx(i), yL, l, { size: 12, fill: MUTED, anchor: 'middle', title: pts[i]!.transcript }));
  });
  parts.push(text(left, topB + hB + labelH + 10, 'transcripts in the order they were coded', { size: 12, fill: MUTED }));

  // Legend: marker shape and line style for each series, and the two bar fills; wraps as needed.
  const items: { w: number; draw: (x: number, y: number) => string }[] = [];
  for (const s of [...series].reverse()) {
    const t = `cumulative ${s.label}`;
    items.push({
      w: 32 + textWidth(t, 12),
      draw: (x, y) => line(x, y, x + 26, y, { stroke: s.color, strokeWidth: 2, dash: s.dash }) + marker(s.shape, x + 13, y, 4, { fill: s.color }) + text(x + 32, y, t, { size: 12, baseline: 'middle' }),
    });
  }
  items.push({ w: 19 + textWidth('new themes', 12), draw: (x, y) => rect(x, y - 6, 14, 12, { fill: OKABE_ITO.blue }) + text(x + 19, y, 'new themes', { size: 12, baseline: 'middle' }) });
  items.push({
    w: 19 + textWidth('new sub-themes', 12),
    draw: (x, y) => rect(x, y - 6, 14, 12, { fill: 'url(#chart-growth-sub)', stroke: OKABE_ITO.vermillion, strokeWidth: 0.8 }) + text(x + 19, y, 'new sub-themes', { size: 12, baseline: 'middle' }),
  });
  let lx = left;
  let ly = legendY;
  for (const it of items) {
    if (lx > left && lx + it.w > WIDTH - right) {
      lx = left;
      ly += 20;
    }
    parts.push(it.draw(lx, ly));
    lx += it.w + 20;
  }
  const height = ly + 14;

  const desc =
    'Template growth: the themes and sub-themes first coded or added in each transcript, in coding order, and the running totals. A flattening curve is not proof that the template is complete. ' +
    pts.map((p) => `${p.transcript}: ${p.newThemes} new themes, ${p.newSubThemes} new sub-themes, ${p.cumulative} in all so far.`).join(' ');
  return chart({
    id: 'chart-growth',
    width: WIDTH,
    height,
    title: 'Template growth by transcript',
    desc,
    defs: hatch('chart-growth-sub', OKABE_ITO.vermillion, '#ffffff'),
    body: parts.join(''),
  });
}

// ---------------------------------------------------------------------------------------------
// Unclaimed share: one bar split into claimed and unclaimed passages

export function unclaimedChart(data: ReportData): string | null {
  const u = data.unclaimed;
  if (u.share === null || u.passages === 0) return null;
  const left = 4;
  const w = WIDTH - 8;
  const height = 74;
  const claimed = u.passages - u.unclaimed;
  const xu = left + w * (1 - u.share);
  const parts: string[] = [];
  parts.push(rect(left, 10, xu - left, 28, { fill: OKABE_ITO.blue, title: `claimed by a theme: ${claimed} passages (${pct(1 - u.share)})` }));
  parts.push(rect(xu, 10, left + w - xu, 28, { fill: 'url(#chart-unclaimed-u)', stroke: OKABE_ITO.vermillion, strokeWidth: 1, title: `unclaimed: ${u.unclaimed} passages (${pct(u.share)})` }));
  parts.push(text(left, 58, `claimed by a theme: ${pct(1 - u.share)} (${claimed} passages)`, { size: 12, weight: 'bold' }));
  parts.push(text(left + w, 58, `unclaimed: ${pct(u.share)} (${u.unclaimed} passages)`, { size: 12, weight: 'bold', anchor: 'end', fill: '#9a3a00' }));
  const desc = `Of the study's ${u.passages} participant passages, ${u.unclaimed} (${pct(u.share)}) are unclaimed: neither coded, nor judged to need no code, nor claimed by any theme when last scored; the other ${claimed} are.`;
  return chart({
    id: 'chart-unclaimed',
    width: WIDTH,
    height,
    title: 'Claimed and unclaimed passages',
    desc,
    defs: hatch('chart-unclaimed-u', OKABE_ITO.orange, '#ffffff'),
    body: parts.join(''),
  });
}

/** Rows of the per-theme acceptance that could not be drawn (no decisions yet), for a note. */
export function undecidedThemes(rows: readonly AcceptanceRow[]): number {
  return rows.filter((r) => r.decided === 0).length;
}
