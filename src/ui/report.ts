/**
 * The report and its figures from the app: the same core module the command line uses
 * (core/report: data -> SVG figures and one HTML document). "Report…" opens the document in a new tab
 * (printable to PDF, A4 or Letter); each figure downloads as SVG, or as PNG rasterised in the browser
 * through an offscreen canvas at print resolution.
 */
import { reportDataFrom, softwareVersion } from '../core';
import type { ReportData } from '../core';
import { reportFigures, type Figure } from '../core';
import { reportHtml, type Paper } from '../core';
import { standaloneSvg } from '../core';
import { settledDerived } from '../state/derived';
import { useApp, useResults } from '../state/store';

/** Width of an exported figure PNG, px: 2400 px over a 180 mm print width is about 340 dots per inch. */
export const FIGURE_PNG_WIDTH_PX = 2400;

/** The report's data for the current state (the Vs30 spread computed now), or null before the first result. */
export function currentReportData(): ReportData | null {
  const derived = settledDerived();
  const prepared = useResults.getState().prepared;
  if (!derived || !prepared) return null;
  const a = useApp.getState();
  return reportDataFrom({
    survey: a.survey,
    settings: a.settings,
    edits: a.edits,
    prepared,
    derived,
    units: a.unitSystem,
    softwareVersion: softwareVersion(),
    madeAt: new Date().toISOString(),
  });
}

export function currentReportHtml(paper: Paper): string | null {
  const data = currentReportData();
  return data ? reportHtml(data, { paper }) : null;
}

/** Opens the report in a new tab; the caller reports a null (no result yet, or a blocked window). */
export function openReport(paper: Paper): Window | null {
  const html = currentReportHtml(paper);
  if (!html) return null;
  const url = URL.createObjectURL(new Blob([html], { type: 'text/html' }));
  const w = window.open(url, '_blank');
  setTimeout(() => URL.revokeObjectURL(url), 60_000);
  return w;
}

export function currentFigure(id: Figure['id']): Figure | null {
  const data = currentReportData();
  return data ? (reportFigures(data).find((f) => f.id === id) ?? null) : null;
}

/** The figure as a PNG of the given width (title, legend and units are inside the SVG). */
export async function figurePng(fig: Figure, widthPx = FIGURE_PNG_WIDTH_PX): Promise<Blob> {
  const url = URL.createObjectURL(new Blob([standaloneSvg(fig.svg)], { type: 'image/svg+xml' }));
  try {
    const img = new Image();
    img.src = url;
    await img.decode();
    const w = Math.round(widthPx);
    const h = Math.round((fig.height * widthPx) / fig.width);
    if (typeof OffscreenCanvas !== 'undefined') {
      const canvas = new OffscreenCanvas(w, h);
      const ctx = canvas.getContext('2d');
      if (!ctx) throw new Error('This browser cannot draw the figure (no 2-D canvas).');
      ctx.fillStyle = '#ffffff';
      ctx.fillRect(0, 0, w, h);
      ctx.drawImage(img, 0, 0, w, h);
      return await canvas.convertToBlob({ type: 'image/png' });
    }
    const canvas = document.createElement('canvas');
    canvas.width = w;
    canvas.height = h;
    const ctx = canvas.getContext('2d');
    if (!ctx) throw new Error('This browser cannot draw the figure (no 2-D canvas).');
    ctx.fillStyle = '#ffffff';
    ctx.fillRect(0, 0, w, h);
    ctx.drawImage(img, 0, 0, w, h);
    return await new Promise<Blob>((resolve, reject) =>
      canvas.toBlob((b) => (b ? resolve(b) : reject(new Error('The PNG could not be made.'))), 'image/png'),
    );
  } finally {
    URL.revokeObjectURL(url);
  }
}

export function figureSvgFile(fig: Figure): string {
  return standaloneSvg(fig.svg);
}
