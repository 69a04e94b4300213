import { createRequire } from 'node:module';
import type { TopLevelSpec } from 'vega-lite';

// vega, vega-lite and resvg take about a second to load: load them only when a plot is drawn, so
// every other command (and each batch job) starts fast.
const requireCjs = createRequire(import.meta.url);

/** Font every plot asks for; DejaVu Sans ships with most Linux systems, else resvg falls back. */
export const PLOT_FONT = 'DejaVu Sans';

/** Render a vega-lite spec to an SVG string (vega-lite → vega → headless vega View). */
export async function renderSvg(spec: TopLevelSpec): Promise<string> {
  const [{ parse, View }, { compile }] = await Promise.all([import('vega'), import('vega-lite')]);
  const view = new View(parse(compile(spec).spec), { renderer: 'none' });
  let svg: string;
  try {
    svg = await view.toSVG();
  } finally {
    view.finalize();
  }
  // vega numbers clip paths with a process-wide counter; renumber them so the same chart always
  // gives the same bytes.
  const ids = new Map<string, number>();
  return svg.replace(/\bclip(\d+)\b/g, (_, id: string) => {
    if (!ids.has(id)) ids.set(id, ids.size + 1);
    return `clip${ids.get(id)}`;
  });
}

/** Rasterise an SVG to PNG with resvg at `scale`× on a white background, using system fonts. */
export function svgToPng(svg: string, scale = 2): Uint8Array {
  const { Resvg } = requireCjs('@resvg/resvg-js') as typeof import('@resvg/resvg-js');
  const resvg = new Resvg(svg, {
    fitTo: { mode: 'zoom', value: scale },
    background: 'white',
    font: { loadSystemFonts: true, defaultFontFamily: PLOT_FONT },
  });
  return resvg.render().asPng();
}

/** Render a spec as SVG text or PNG bytes, by format. */
export async function renderPlot(spec: TopLevelSpec, format: 'svg' | 'png'): Promise<string | Uint8Array> {
  const svg = await renderSvg(spec);
  return format === 'svg' ? svg : svgToPng(svg);
}
