/**
 * Small SVG building blocks for the report figures: text escaping, "nice" axis ticks, linear scales,
 * axes with titles and units, legends and the pick-marker shapes. Strings only (no DOM).
 */

export const COLOURS = {
  S: '#0f766e',
  P: '#b45309',
  ink: '#1f2933',
  rim: '#111827',
  muted: '#9aa5b1',
  grid: '#e4e7eb',
  water: '#2563eb',
} as const;

/** System font stack: nothing is loaded from anywhere. */
export const FONT_STACK = 'system-ui, -apple-system, "Segoe UI", Roboto, "Helvetica Neue", Arial, sans-serif';

export function esc(s: string): string {
  return s.replace(/&/g, '&amp;').replace(/</g, '&lt;').replace(/>/g, '&gt;').replace(/"/g, '&quot;');
}

/** Coordinates to 0.1 user unit (figures are 1600 units wide: 0.1 unit is far below a printer dot). */
export function c(x: number): string {
  return String(Math.round(x * 10) / 10);
}

/** Tick values at 1, 2 or 5 x 10^k steps covering [min, max], about `count` of them. */
export function niceTicks(min: number, max: number, count = 6): number[] {
  if (!(max > min)) return [min];
  const raw = (max - min) / Math.max(1, count);
  const mag = 10 ** Math.floor(Math.log10(raw));
  const step = [1, 2, 5, 10].map((k) => k * mag).find((s) => s >= raw) ?? 10 * mag;
  const out: number[] = [];
  for (let v = Math.ceil(min / step - 1e-9) * step; v <= max + step * 1e-9; v += step)
    out.push(Math.round(v / step) * step);
  return out;
}

/** Range widened to whole tick steps, so the axis starts and ends on a tick. */
export function niceRange(min: number, max: number, count = 6): [number, number] {
  if (!Number.isFinite(min) || !Number.isFinite(max)) return [0, 1];
  if (max <= min) return [min - 1, min + 1];
  const t = niceTicks(min, max, count);
  const step = t.length > 1 ? t[1] - t[0] : max - min;
  return [Math.floor(min / step + 1e-9) * step, Math.ceil(max / step - 1e-9) * step];
}

export function tickText(v: number, ticks: number[]): string {
  const step = ticks.length > 1 ? Math.abs(ticks[1] - ticks[0]) : 1;
  const decimals = Math.max(0, -Math.floor(Math.log10(step) + 1e-9));
  return (Math.abs(v) < step * 1e-9 ? 0 : v).toFixed(decimals);
}

export interface Panel {
  x: number;
  y: number;
  w: number;
  h: number;
  xRange: [number, number];
  yRange: [number, number];
  /** Depth panels: y grows downward (the range's first value at the top). */
}

export function sx(p: Panel, v: number): number {
  return p.x + ((v - p.xRange[0]) / (p.xRange[1] - p.xRange[0])) * p.w;
}

export function sy(p: Panel, v: number): number {
  return p.y + ((v - p.yRange[0]) / (p.yRange[1] - p.yRange[0])) * p.h;
}

/** Frame, grid, ticks and axis titles (x title below, y title rotated on the left). */
export function axes(p: Panel, xTitle: string, yTitle: string, opts: { yTicks?: boolean } = {}): string {
  const xt = niceTicks(p.xRange[0], p.xRange[1]);
  const yt = niceTicks(Math.min(...p.yRange), Math.max(...p.yRange));
  const parts: string[] = [];
  for (const v of xt) {
    const X = c(sx(p, v));
    parts.push(`<line x1="${X}" y1="${c(p.y)}" x2="${X}" y2="${c(p.y + p.h)}" stroke="${COLOURS.grid}"/>`);
    parts.push(`<text x="${X}" y="${c(p.y + p.h + 30)}" text-anchor="middle" font-size="22">${tickText(v, xt)}</text>`);
  }
  for (const v of yt) {
    const Y = c(sy(p, v));
    parts.push(`<line x1="${c(p.x)}" y1="${Y}" x2="${c(p.x + p.w)}" y2="${Y}" stroke="${COLOURS.grid}"/>`);
    if (opts.yTicks !== false)
      parts.push(
        `<text x="${c(p.x - 10)}" y="${c(sy(p, v) + 8)}" text-anchor="end" font-size="22">${tickText(v, yt)}</text>`,
      );
  }
  parts.push(
    `<rect x="${c(p.x)}" y="${c(p.y)}" width="${c(p.w)}" height="${c(p.h)}" fill="none" stroke="${COLOURS.ink}" stroke-width="1.5"/>`,
  );
  parts.push(
    `<text x="${c(p.x + p.w / 2)}" y="${c(p.y + p.h + 68)}" text-anchor="middle" font-size="24">${esc(xTitle)}</text>`,
  );
  if (yTitle)
    parts.push(
      `<text transform="translate(${c(p.x - 78)} ${c(p.y + p.h / 2)}) rotate(-90)" text-anchor="middle" font-size="24">${esc(yTitle)}</text>`,
    );
  return parts.join('');
}

/** A clip path for a panel (so lines leaving the axes are cut at the frame). */
export function clipFor(id: string, p: Panel): string {
  return `<clipPath id="${id}"><rect x="${c(p.x)}" y="${c(p.y)}" width="${c(p.w)}" height="${c(p.h)}"/></clipPath>`;
}

export type MarkerKind = 'auto' | 'edited' | 'excluded';

/**
 * Pick symbol centred at (x, y): automatic hollow, edited filled with a dark rim, excluded a small grey
 * cross. Shape differs by wave (S circle, P diamond; a second receiver: S square, P triangle) so grey
 * print keeps them apart.
 */
export function marker(kind: MarkerKind, wave: 'S' | 'P', x: number, y: number, r = 9, alt = false): string {
  if (kind === 'excluded') {
    const k = r * 0.6;
    return `<path d="M${c(x - k)} ${c(y - k)}L${c(x + k)} ${c(y + k)}M${c(x - k)} ${c(y + k)}L${c(x + k)} ${c(y - k)}" stroke="${COLOURS.muted}" stroke-width="3" fill="none"/>`;
  }
  const colour = COLOURS[wave];
  const fill = kind === 'edited' ? colour : '#ffffff';
  const stroke = kind === 'edited' ? COLOURS.rim : colour;
  const width = kind === 'edited' ? 2.5 : 3;
  if (alt && wave === 'S')
    return `<rect x="${c(x - r)}" y="${c(y - r)}" width="${c(2 * r)}" height="${c(2 * r)}" fill="${fill}" stroke="${stroke}" stroke-width="${width}"/>`;
  if (alt)
    return `<path d="M${c(x)} ${c(y - r * 1.2)}L${c(x + r * 1.1)} ${c(y + r * 0.8)}L${c(x - r * 1.1)} ${c(y + r * 0.8)}Z" fill="${fill}" stroke="${stroke}" stroke-width="${width}"/>`;
  if (wave === 'S')
    return `<circle cx="${c(x)}" cy="${c(y)}" r="${c(r)}" fill="${fill}" stroke="${stroke}" stroke-width="${width}"/>`;
  const q = r * 1.25;
  return `<path d="M${c(x)} ${c(y - q)}L${c(x + q)} ${c(y)}L${c(x)} ${c(y + q)}L${c(x - q)} ${c(y)}Z" fill="${fill}" stroke="${stroke}" stroke-width="${width}"/>`;
}

export interface LegendItem {
  label: string;
  /** SVG drawn in a 44 x 24 box centred at (22, 12). */
  swatch: string;
}

export function lineSwatch(colour: string, dash = '', width = 3): string {
  return `<line x1="2" y1="12" x2="42" y2="12" stroke="${colour}" stroke-width="${width}"${dash ? ` stroke-dasharray="${dash}"` : ''}/>`;
}

/** Legend in rows across the given width, starting at (x, y); returns the SVG and its height. */
export function legend(items: LegendItem[], x: number, y: number, width: number): { svg: string; height: number } {
  const parts: string[] = [];
  let cx = x;
  let cy = y;
  for (const it of items) {
    const w = 60 + it.label.length * 11.5;
    if (cx + w > x + width && cx > x) {
      cx = x;
      cy += 34;
    }
    parts.push(
      `<g transform="translate(${c(cx)} ${c(cy)})">${it.swatch}<text x="52" y="20" font-size="21">${esc(it.label)}</text></g>`,
    );
    cx += w + 18;
  }
  return { svg: parts.join(''), height: cy - y + 34 };
}

/** Horizontal error bar with end caps. */
export function errorBar(x0: number, x1: number, y: number, colour: string, cap = 7): string {
  return `<path d="M${c(x0)} ${c(y)}H${c(x1)}M${c(x0)} ${c(y - cap)}V${c(y + cap)}M${c(x1)} ${c(y - cap)}V${c(y + cap)}" stroke="${colour}" stroke-width="2" fill="none"/>`;
}

/** Figure root (inline in HTML: no namespace needed); standaloneSvg() adds it for a file. */
export function figureRoot(id: string, width: number, height: number, body: string, title: string): string {
  return `<svg viewBox="0 0 ${width} ${height}" width="${width}" height="${height}" data-figure="${esc(id)}" role="img" aria-label="${esc(title)}" font-family="${esc(FONT_STACK)}" fill="${COLOURS.ink}"><rect width="${width}" height="${height}" fill="#ffffff"/>${body}</svg>`;
}

/** An SVG file of its own: the XML namespace the standard requires. */
export function standaloneSvg(inline: string): string {
  return `<?xml version="1.0" encoding="UTF-8"?>\n${inline.replace('<svg ', `<svg xmlns="${SVG_NS}" `)}\n`;
}

/** The SVG namespace name (an identifier, never fetched; only in stand-alone SVG files). */
const SVG_NS = 'http://www.w3.org/2000/svg';
