'use client';
/**
 * PNG and SVG of the drawing: the xyflow viewport element rendered by html-to-image, framed on
 * the bounds of every block (xyflow's `getNodesBounds` + `getViewportForBounds`, the approach of
 * the xyflow docs' "download image" example), on the canvas's own dark ground.
 */
import { getViewportForBounds, type Rect } from '@xyflow/react';
import { toPng, toSvg } from 'html-to-image';

/** Ground colour of the exported picture (ink-900). */
const BACKGROUND = '#141a1f';

/**
 * Renders the drawing inside `container` (the canvas wrapper), framed on `bounds` (the flow's
 * `getNodesBounds` of every node), to a data URL. The picture is at most 2400 px on its long side
 * and never magnifies more than 2×.
 */
export async function drawingDataUrl(container: HTMLElement, bounds: Rect | null, format: 'png' | 'svg'): Promise<{ ok: true; url: string } | { ok: false; reason: string }> {
  const viewport = container.querySelector<HTMLElement>('.react-flow__viewport');
  if (!viewport || !bounds) return { ok: false, reason: 'There is nothing on the canvas to export.' };
  const long = 2400;
  const aspect = (bounds.width + 80) / Math.max(bounds.height + 80, 1);
  const width = Math.round(aspect >= 1 ? long : long * aspect);
  const height = Math.round(aspect >= 1 ? long / aspect : long);
  const vp = getViewportForBounds(bounds, width, height, 0.1, 2, 0.05);
  const options = {
    backgroundColor: BACKGROUND,
    width,
    height,
    style: { width: `${width}px`, height: `${height}px`, transform: `translate(${vp.x}px, ${vp.y}px) scale(${vp.zoom})` },
    // Leave xyflow's overlay chrome (handles stay: they are the ports) out of the picture.
    filter: (el: HTMLElement) => !(el.classList?.contains('react-flow__minimap') || el.classList?.contains('react-flow__controls')),
  };
  try {
    const url = format === 'png' ? await toPng(viewport, options) : await toSvg(viewport, options);
    return { ok: true, url };
  } catch (e) {
    return { ok: false, reason: `The drawing could not be rendered to ${format.toUpperCase()}: ${e instanceof Error ? e.message : String(e)}` };
  }
}

/** Offers a data URL as a file download. */
export function downloadDataUrl(fileName: string, url: string): void {
  const a = document.createElement('a');
  a.href = url;
  a.download = fileName;
  document.body.appendChild(a);
  a.click();
  a.remove();
}
