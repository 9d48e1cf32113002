/**
 * A small kit for inline SVG charts: scales, axes, bars, lines, markers, heat cells. Strings in,
 * strings out. Inline SVG in an HTML document needs no namespace declaration, so none is written:
 * the report holds no addresses of any kind.
 */

import { esc } from './escape.js';
import { GRID, INK, MUTED, RULE } from './palette.js';

/** Coordinates to one decimal: sub-pixel precision is invisible and bloats the file. */
export function n(v: number): string {
  const r = Math.round(v * 10) / 10;
  return Object.is(r, -0) ? '0' : String(r);
}

export interface LinearScale {
  (v: number): number;
  domain: [number, number];
  range: [number, number];
}

export function linear(domain: [number, number], range: [number, number]): LinearScale {
  const [d0, d1] = domain;
  const [r0, r1] = range;
  const span = d1 - d0 || 1;
  const f = ((v: number) => r0 + ((v - d0) / span) * (r1 - r0)) as LinearScale;
  f.domain = domain;
  f.range = range;
  return f;
}

/** Round numbers for ticks: steps of 1, 2 or 5 times a power of ten, about `count` of them. */
export function ticks(min: number, max: number, count = 5): number[] {
  if (!(max > min)) return [min];
  const raw = (max - min) / Math.max(1, count);
  const power = 10 ** Math.floor(Math.log10(raw));
  const step = [1, 2, 5, 10].map((m) => m * power).find((s) => s >= raw) ?? raw;
  const out: number[] = [];
  for (let v = Math.ceil(min / step) * step; v <= max + step * 1e-9; v += step) out.push(Number(v.toFixed(10)));
  return out;
}

/** The smallest round number at or above `v` on which integer ticks land (at least 1). */
export function niceMax(v: number, count = 5): number {
  if (!(v > 0)) return 1;
  const t = ticks(0, v, count);
  const step = t.length > 1 ? t[1]! - t[0]! : 1;
  const top = Math.ceil(v / step) * step;
  return Math.max(1, Number(top.toFixed(10)));
}

/**
 * Estimated width of a line of text in a sans-serif face, in pixels. The report carries no
 * fonts, so the reader's own sans-serif is used; the per-character widths are generous
 * (close to the wide faces) so that labels laid out with them do not overlap in narrower ones.
 */
export function textWidth(text: string, size: number): number {
  let w = 0;
  for (const ch of text) {
    if (/[iljtfI.,:;'|!()[\]\s]/.test(ch)) w += 0.34;
    else if (/[mwMW@%]/.test(ch)) w += 0.92;
    else if (/[A-Z0-9#&]/.test(ch)) w += 0.7;
    else if (/[\u0300-\u036f]/.test(ch)) w += 0;
    else w += 0.6;
  }
  return w * size;
}

/** `text` shortened with an ellipsis to fit `maxWidth`; the whole text goes into a title. */
export function fit(text: string, maxWidth: number, size: number): string {
  if (textWidth(text, size) <= maxWidth) return text;
  const chars = [...text];
  while (chars.length > 1 && textWidth(chars.join('') + '…', size) > maxWidth) chars.pop();
  return chars.join('').trimEnd() + '…';
}

export interface TextOptions {
  anchor?: 'start' | 'middle' | 'end';
  size?: number;
  weight?: 'normal' | 'bold';
  fill?: string;
  /** Vertical alignment of the text to y. */
  baseline?: 'middle' | 'hanging' | 'auto';
  transform?: string;
  /** A tooltip (and accessible name) for the text, e.g. the untruncated label. */
  title?: string;
  italic?: boolean;
  /** A white outline behind the glyphs, so the text stays legible where it crosses a line. */
  halo?: boolean;
}

export function text(x: number, y: number, content: string, o: TextOptions = {}): string {
  const attrs = [`x="${n(x)}"`, `y="${n(y)}"`];
  if (o.anchor && o.anchor !== 'start') attrs.push(`text-anchor="${o.anchor}"`);
  if (o.size) attrs.push(`font-size="${o.size}"`);
  if (o.weight === 'bold') attrs.push('font-weight="bold"');
  if (o.italic) attrs.push('font-style="italic"');
  if (o.fill && o.fill !== INK) attrs.push(`fill="${o.fill}"`);
  // dominant-baseline is not honoured everywhere in print; a dy offset is.
  if (o.baseline === 'middle') attrs.push('dy="0.35em"');
  else if (o.baseline === 'hanging') attrs.push('dy="0.8em"');
  if (o.transform) attrs.push(`transform="${o.transform}"`);
  if (o.halo) attrs.push('stroke="#ffffff" stroke-width="3" stroke-linejoin="round" paint-order="stroke"');
  const title = o.title && o.title !== content ? `<title>${esc(o.title)}</title>` : '';
  return `<text ${attrs.join(' ')}>${title}${esc(content)}</text>`;
}

export interface ShapeOptions {
  fill?: string;
  stroke?: string;
  strokeWidth?: number;
  dash?: string;
  title?: string;
  opacity?: number;
}

function shapeAttrs(o: ShapeOptions): string {
  const a: string[] = [];
  if (o.fill !== undefined) a.push(`fill="${o.fill}"`);
  if (o.stroke) a.push(`stroke="${o.stroke}"`);
  if (o.strokeWidth !== undefined) a.push(`stroke-width="${o.strokeWidth}"`);
  if (o.dash) a.push(`stroke-dasharray="${o.dash}"`);
  if (o.opacity !== undefined) a.push(`opacity="${o.opacity}"`);
  return a.join(' ');
}

function wrapTitle(tag: string, attrs: string, title?: string): string {
  return title ? `<${tag} ${attrs}><title>${esc(title)}</title></${tag}>` : `<${tag} ${attrs}/>`;
}

export function rect(x: number, y: number, w: number, h: number, o: ShapeOptions = {}): string {
  return wrapTitle('rect', `x="${n(x)}" y="${n(y)}" width="${n(Math.max(0, w))}" height="${n(Math.max(0, h))}" ${shapeAttrs(o)}`, o.title);
}

export function line(x1: number, y1: number, x2: number, y2: number, o: ShapeOptions = {}): string {
  return wrapTitle('line', `x1="${n(x1)}" y1="${n(y1)}" x2="${n(x2)}" y2="${n(y2)}" ${shapeAttrs({ stroke: INK, ...o })}`, o.title);
}

export function polyline(points: [number, number][], o: ShapeOptions = {}): string {
  const pts = points.map(([x, y]) => `${n(x)},${n(y)}`).join(' ');
  return wrapTitle('polyline', `points="${pts}" ${shapeAttrs({ fill: 'none', stroke: INK, strokeWidth: 2, ...o })}`, o.title);
}

export type MarkerShape = 'circle' | 'square' | 'diamond' | 'triangle';

/** A point marker; shapes, not colours alone, tell series apart. */
export function marker(shape: MarkerShape, x: number, y: number, size: number, o: ShapeOptions = {}): string {
  const s = size;
  const attrs = shapeAttrs({ stroke: '#ffffff', strokeWidth: 1.2, ...o });
  switch (shape) {
    case 'circle':
      return wrapTitle('circle', `cx="${n(x)}" cy="${n(y)}" r="${n(s)}" ${attrs}`, o.title);
    case 'square':
      return wrapTitle('rect', `x="${n(x - s)}" y="${n(y - s)}" width="${n(2 * s)}" height="${n(2 * s)}" ${attrs}`, o.title);
    case 'diamond': {
      const d = s * 1.3;
      return wrapTitle('polygon', `points="${n(x)},${n(y - d)} ${n(x + d)},${n(y)} ${n(x)},${n(y + d)} ${n(x - d)},${n(y)}" ${attrs}`, o.title);
    }
    case 'triangle': {
      const d = s * 1.3;
      return wrapTitle('polygon', `points="${n(x)},${n(y - d)} ${n(x + d)},${n(y + d * 0.8)} ${n(x - d)},${n(y + d * 0.8)}" ${attrs}`, o.title);
    }
  }
}

/** Diagonal hatching, for a second series that must read without colour (and in greyscale). */
export function hatch(id: string, color: string, background = '#ffffff'): string {
  return (
    `<pattern id="${id}" width="6" height="6" patternUnits="userSpaceOnUse" patternTransform="rotate(45)">` +
    `<rect width="6" height="6" fill="${background}"/><rect width="2.4" height="6" fill="${color}"/></pattern>`
  );
}

export interface AxisOptions {
  ticks: number[];
  format?: (v: number) => string;
  /** Axis title. */
  label?: string;
  /** Draw grid lines across the plot to this coordinate. */
  gridTo?: number;
  size?: number;
}

/** A vertical axis at x, for a scale mapping values to y. */
export function axisLeft(scale: LinearScale, x: number, o: AxisOptions): string {
  const size = o.size ?? 12;
  const fmt = o.format ?? String;
  const parts: string[] = [];
  const [y0, y1] = scale.range;
  for (const t of o.ticks) {
    const y = scale(t);
    if (o.gridTo !== undefined) parts.push(line(x, y, o.gridTo, y, { stroke: GRID, strokeWidth: 1 }));
    parts.push(line(x - 5, y, x, y, { stroke: MUTED, strokeWidth: 1 }));
    parts.push(text(x - 8, y, fmt(t), { anchor: 'end', size, fill: MUTED, baseline: 'middle' }));
  }
  parts.push(line(x, y0, x, y1, { stroke: RULE, strokeWidth: 1 }));
  if (o.label) {
    // Rotated a quarter turn, the title's glyphs rise to the left of its x: keep a text height clear.
    const mid = (y0 + y1) / 2;
    const lx = x - 10 - Math.max(...o.ticks.map((t) => textWidth(fmt(t), size)), 0) - 6;
    parts.push(text(lx, mid, o.label, { anchor: 'middle', size, fill: MUTED, transform: `rotate(-90 ${n(lx)} ${n(mid)})` }));
  }
  return `<g class="axis">${parts.join('')}</g>`;
}

/** A horizontal axis at y, for a scale mapping values to x. */
export function axisBottom(scale: LinearScale, y: number, o: AxisOptions): string {
  const size = o.size ?? 12;
  const fmt = o.format ?? String;
  const parts: string[] = [];
  const [x0, x1] = scale.range;
  for (const t of o.ticks) {
    const x = scale(t);
    if (o.gridTo !== undefined) parts.push(line(x, y, x, o.gridTo, { stroke: GRID, strokeWidth: 1 }));
    parts.push(line(x, y, x, y + 5, { stroke: MUTED, strokeWidth: 1 }));
    parts.push(text(x, y + 8, fmt(t), { anchor: 'middle', size, fill: MUTED, baseline: 'hanging' }));
  }
  parts.push(line(x0, y, x1, y, { stroke: RULE, strokeWidth: 1 }));
  if (o.label) parts.push(text((x0 + x1) / 2, y + 36, o.label, { anchor: 'middle', size, fill: MUTED }));
  return `<g class="axis">${parts.join('')}</g>`;
}

export interface ChartFrame {
  /** Unique within the document: prefixes the ids of the title, description and patterns. */
  id: string;
  width: number;
  height: number;
  /** Short accessible name. */
  title: string;
  /** The chart's content in words: every value a reader would take from it. */
  desc: string;
  defs?: string;
  body: string;
}

/**
 * The chart element. role="img" with aria-labelledby makes the title and description the
 * chart's text alternative for screen readers; the title also shows as a tooltip.
 */
export function chart(c: ChartFrame): string {
  return (
    `<svg class="chart" id="${c.id}" role="img" aria-labelledby="${c.id}-t ${c.id}-d" viewBox="0 0 ${n(c.width)} ${n(c.height)}" ` +
    `width="${n(c.width)}" height="${n(c.height)}" font-family="inherit" font-size="12" fill="${INK}">` +
    `<title id="${c.id}-t">${esc(c.title)}</title><desc id="${c.id}-d">${esc(c.desc)}</desc>` +
    (c.defs ? `<defs>${c.defs}</defs>` : '') +
    c.body +
    `</svg>`
  );
}

/** A heat-map cell: a filled square with its count written in it. */
export function heatCell(x: number, y: number, w: number, h: number, value: number, fill: string, ink: string, title: string): string {
  return (
    `<g>${rect(x, y, w, h, { fill, stroke: '#ffffff', strokeWidth: 1, title })}` +
    text(x + w / 2, y + h / 2, String(value), { anchor: 'middle', baseline: 'middle', size: 12, fill: ink }) +
    `</g>`
  );
}
